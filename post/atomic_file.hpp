// Files that are either complete or absent: written to a temporary name beside the target,
// flushed, then renamed over it (rename is atomic within one file system, POSIX).
#pragma once

#include <filesystem>
#include <string_view>

namespace heatbead::post {

// Writes `content` to `path` atomically; creates missing parent folders. Throws
// std::runtime_error naming the path on failure, leaving no partial file behind.
void write_file_atomically(const std::filesystem::path& path, std::string_view content);

}  // namespace heatbead::post
