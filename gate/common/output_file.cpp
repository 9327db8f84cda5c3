// SPDX-License-Identifier: MIT
// Writing output files atomically, with failures that name the path and the reason.
#include "gate/common/output_file.hpp"

#include "gate/common/errors.hpp"

#include <cctype>
#include <cerrno>
#include <chrono>
#include <csignal>
#include <cstdlib>
#include <cstring>
#include <fcntl.h>
#include <filesystem>
#include <sys/stat.h>
#include <thread>
#include <unistd.h>

namespace fs = std::filesystem;

namespace tollgate {

namespace {

constexpr const char* k_temp_marker = ".tollgate-tmp-";

std::string lowercase_reason(int error) {
    std::string text = std::strerror(error);
    if (!text.empty()) {
        text[0] = static_cast<char>(std::tolower(static_cast<unsigned char>(text[0])));
    }
    return text;
}

// The remedy for the errors whose remedy is plain, in parentheses; empty for the others.
std::string remedy_for(int error) {
    switch (error) {
    case EACCES:
    case EPERM:
    case EROFS:
        return " (choose a folder you can write to)";
    case ENOSPC:
    case EDQUOT:
        return " (free some space, or choose another folder)";
    default:
        return {};
    }
}

[[noreturn]] void fail(const std::string& what, const std::string& path, int error,
                       const std::string& step = {}) {
    throw Failure("cannot write " + what + " \"" + path + "\": " + step + lowercase_reason(error) +
                  remedy_for(error));
}

// Where the file finally goes: beside the file the path names after symlinks, so the rename
// stays on one file system. Throws Failure for a folder at `path` or a folder that cannot be
// made.
fs::path prepare_target(const std::string& what, const std::string& path) {
    std::error_code ec;
    if (fs::is_directory(path, ec)) {
        throw Failure("cannot write " + what + " \"" + path +
                      "\": it is a folder (give a file path)");
    }
    const fs::path target = fs::weakly_canonical(fs::absolute(path), ec);
    if (ec) {
        fail(what, path, ec.value());
    }
    const fs::path folder = target.parent_path();
    fs::create_directories(folder, ec);
    if (ec) {
        fail(what, path, ec.value(), "cannot create folder \"" + folder.string() + "\": ");
    }
    return target;
}

// Make a temporary file beside `target` with mkstemp; return its descriptor, its path in
// `temporary`, or -1 with errno set.
int make_temporary(const fs::path& target, std::string& temporary) {
    temporary = (target.parent_path() / ("." + target.filename().string() + k_temp_marker +
                                         std::to_string(::getpid()) + "-XXXXXX"))
                    .string();
    return ::mkstemp(temporary.data());
}

// Remove temporary files of `target`'s pattern whose writer no longer runs.
void remove_stale_temporaries(const fs::path& target) {
    const std::string prefix = "." + target.filename().string() + k_temp_marker;
    std::error_code ec;
    for (fs::directory_iterator it(target.parent_path(), ec), end; !ec && it != end;
         it.increment(ec)) {
        const std::string entry = it->path().filename().string();
        if (entry.rfind(prefix, 0) != 0) {
            continue;
        }
        const std::string rest = entry.substr(prefix.size());
        const std::size_t dash = rest.find('-');
        if (dash == 0 || dash == std::string::npos ||
            rest.find_first_not_of("0123456789") != dash) {
            continue;
        }
        const long pid = std::strtol(rest.substr(0, dash).c_str(), nullptr, 10);
        if (pid == static_cast<long>(::getpid())) {
            continue;
        }
        if (::kill(static_cast<pid_t>(pid), 0) == -1 && errno == ESRCH) {
            std::error_code remove_error;
            fs::remove(it->path(), remove_error);
        }
    }
}

// Sleep when the test hook asks for it (see k_pause_before_rename_variable).
void pause_for_tests() {
    const char* seconds = std::getenv(k_pause_before_rename_variable);
    if (seconds != nullptr && *seconds != '\0') {
        std::this_thread::sleep_for(std::chrono::duration<double>(std::strtod(seconds, nullptr)));
    }
}

} // namespace

void check_writable(const std::string& what, const std::string& path) {
    const fs::path target = prepare_target(what, path);
    std::string temporary;
    const int fd = make_temporary(target, temporary);
    if (fd == -1) {
        fail(what, path, errno);
    }
    ::close(fd);
    ::unlink(temporary.c_str());
}

void write_output_file(const std::string& what, const std::string& path, const std::string& content,
                       unsigned mode) {
    const fs::path target = prepare_target(what, path);
    remove_stale_temporaries(target);
    std::string temporary;
    const int fd = make_temporary(target, temporary);
    if (fd == -1) {
        fail(what, path, errno);
    }
    auto give_up = [&](int error) {
        ::close(fd);
        ::unlink(temporary.c_str());
        fail(what, path, error);
    };
    for (std::size_t written = 0; written < content.size();) {
        const ssize_t n = ::write(fd, content.data() + written, content.size() - written);
        if (n < 0) {
            if (errno == EINTR) {
                continue;
            }
            give_up(errno);
        }
        written += static_cast<std::size_t>(n);
    }
    const mode_t mask = ::umask(0);
    ::umask(mask);
    if (::fchmod(fd, static_cast<mode_t>(mode) & ~mask) != 0 || ::fsync(fd) != 0) {
        give_up(errno);
    }
    if (::close(fd) != 0) {
        const int error = errno;
        ::unlink(temporary.c_str());
        fail(what, path, error);
    }
    pause_for_tests();
    if (std::rename(temporary.c_str(), target.c_str()) != 0) {
        const int error = errno;
        ::unlink(temporary.c_str());
        fail(what, path, error);
    }
    // Make the rename itself durable.
    const int folder_fd = ::open(target.parent_path().c_str(), O_RDONLY | O_DIRECTORY);
    if (folder_fd != -1) {
        ::fsync(folder_fd);
        ::close(folder_fd);
    }
}

} // namespace tollgate
