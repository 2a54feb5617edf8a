// A folder of a test's own under the system temporary folder, removed with everything in it.
#pragma once

#include <filesystem>
#include <string>
#include <system_error>
#include <unistd.h>

namespace heatbead::testing {

struct TempFolder {
    std::filesystem::path path;
    explicit TempFolder(const std::string& tag)
        : path(std::filesystem::temp_directory_path() / ("heatbead_test_" + tag + "_" + std::to_string(::getpid()))) {
        std::filesystem::remove_all(path);
        std::filesystem::create_directories(path);
    }
    ~TempFolder() {
        std::error_code ignored;
        std::filesystem::remove_all(path, ignored);
    }
    TempFolder(const TempFolder&) = delete;
    TempFolder& operator=(const TempFolder&) = delete;
};

}  // namespace heatbead::testing
