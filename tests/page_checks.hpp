// What the HTML page tests share: counting occurrences, cutting out a part of the page, the strokes
// of its lines, checking that a page needs nothing from outside, reading a written file back, and
// where the hidden "[.sample]" tests write a page for the browser check (tests/render_report.sh).
#pragma once

#include <catch2/catch.hpp>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace heatbead::testing {

inline std::size_t count(const std::string& text, const std::string& what) {
    std::size_t n = 0;
    for (auto at = text.find(what); at != std::string::npos; at = text.find(what, at + what.size())) ++n;
    return n;
}

// The part of the page from the element that starts with `opening` to the first `closing` after it.
inline std::string part(const std::string& html, const std::string& opening, const std::string& closing) {
    const auto from = html.find(opening);
    REQUIRE(from != std::string::npos);
    return html.substr(from, html.find(closing, from) - from);
}

inline std::string figure_of(const std::string& html, const std::string& id) {
    return part(html, "<figure id=\"" + id + "\"", "</figure>");
}

// The stroke attributes of every polyline in `svg`: colour, width and dash, as one string each.
inline std::vector<std::string> polyline_strokes(const std::string& svg) {
    std::vector<std::string> strokes;
    for (auto at = svg.find("<polyline"); at != std::string::npos; at = svg.find("<polyline", at + 1)) {
        const auto from = svg.find(" stroke=", at);
        strokes.push_back(svg.substr(from, svg.find(" points=", from) - from));
    }
    return strokes;
}

// A complete page that a browser shows from the file alone: nothing to fetch, no script, no imported
// style, and url() only for references to clip paths on the page itself.
inline void check_self_contained(const std::string& html) {
    CHECK(html.starts_with("<!DOCTYPE html>"));
    CHECK(html.ends_with("</html>\n"));
    CHECK(count(html, "http://") == 0);
    CHECK(count(html, "https://") == 0);
    CHECK(count(html, "<script") == 0);
    CHECK(count(html, "src=") == 0);
    CHECK(count(html, "@import") == 0);
    CHECK(count(html, "url(") == count(html, "url(#"));  // only references to clip paths on the page
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
