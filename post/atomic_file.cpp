#include "post/atomic_file.hpp"

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <stdexcept>
#include <string>
#include <unistd.h>

namespace heatbead::post {

void write_file_atomically(const std::filesystem::path& path, std::string_view content) {
    const auto fail = [&](const std::string& what) {
        throw std::runtime_error("cannot write " + path.string() + ": " + what + ": " + std::strerror(errno));
    };
    if (path.has_parent_path()) {
        std::error_code ec;
        std::filesystem::create_directories(path.parent_path(), ec);
        if (ec) throw std::runtime_error("cannot create folder " + path.parent_path().string() + ": " + ec.message());
    }
    // The process id keeps two runs writing into one folder from sharing a temporary name.
    const auto temporary = path.string() + ".partial." + std::to_string(::getpid());
    std::FILE* f = std::fopen(temporary.c_str(), "wb");
    if (!f) fail("open");
    const bool written = std::fwrite(content.data(), 1, content.size(), f) == content.size();
    const bool flushed = std::fflush(f) == 0 && ::fsync(fileno(f)) == 0;
    const bool closed = std::fclose(f) == 0;
    if (!written || !flushed || !closed) {
        std::remove(temporary.c_str());
        fail("write");
    }
    if (std::rename(temporary.c_str(), path.c_str()) != 0) {
        std::remove(temporary.c_str());
        fail("rename");
    }
}

}  // namespace heatbead::post
