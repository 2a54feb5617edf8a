// What the HTML page tests share: counting occurrences, reading a written file back, and where
// the hidden "[.sample]" tests write a page for the browser check (tests/render_report.sh).
#pragma once

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace heatbead::testing {

inline std::size_t count(const std::string& text, const std::string& what) {
    std::size_t n = 0;
    for (auto at = text.find(what); at != std::string::npos; at = text.find(what, at + what.size())) ++n;
    return n;
}

inline std::string read_file(const std::filesystem::path& path) {
    std::ifstream file(path, std::ios::binary);
    std::stringstream content;
    content << file.rdbuf();
    return content.str();
}

// The path in environment variable `variable`, else `fallback` in the temporary folder.
inline std::filesystem::path sample_path(const char* variable, const char* fallback) {
    const char* env = std::getenv(variable);
    return env && *env ? std::filesystem::path(env) : std::filesystem::temp_directory_path() / fallback;
}

}  // namespace heatbead::testing
