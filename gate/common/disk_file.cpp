// SPDX-License-Identifier: MIT
// lstat, open with O_NOFOLLOW | O_NONBLOCK, fstat, read.
#include "gate/common/disk_file.hpp"

#include <cerrno>
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

namespace tollgate {

const char* disk_entry_text(DiskEntry entry) {
    switch (entry) {
    case DiskEntry::regular:
        return "regular file";
    case DiskEntry::missing:
        return "missing";
    case DiskEntry::symlink:
        return "symlink";
    case DiskEntry::special:
        return "not a regular file";
    case DiskEntry::unreadable:
        return "unreadable";
    case DiskEntry::oversized:
        return "too large";
    }
    return "unreadable";
}

DiskFile read_regular_file(const std::string& path, std::uint64_t max_bytes) {
    DiskFile file;
    struct stat before {};
    if (::lstat(path.c_str(), &before) != 0) {
        file.entry =
            errno == ENOENT || errno == ENOTDIR ? DiskEntry::missing : DiskEntry::unreadable;
        return file;
    }
    if (S_ISLNK(before.st_mode)) {
        file.entry = DiskEntry::symlink;
        return file;
    }
    if (!S_ISREG(before.st_mode)) {
        file.entry = DiskEntry::special;
        return file;
    }
    const int fd = ::open(path.c_str(), O_RDONLY | O_NOFOLLOW | O_NONBLOCK | O_CLOEXEC | O_NOCTTY);
    if (fd < 0) {
        file.entry = errno == ELOOP ? DiskEntry::symlink : DiskEntry::unreadable;
        return file;
    }
    struct stat after {};
    if (::fstat(fd, &after) != 0 || !S_ISREG(after.st_mode) || after.st_dev != before.st_dev ||
        after.st_ino != before.st_ino) {
        ::close(fd);
        file.entry = DiskEntry::special; // replaced between the two looks
        return file;
    }
    file.size = static_cast<std::uint64_t>(after.st_size);
    if (max_bytes != 0 && file.size > max_bytes) {
        ::close(fd);
        file.entry = DiskEntry::oversized;
        return file;
    }
    ::fcntl(fd, F_SETFL, ::fcntl(fd, F_GETFL) & ~O_NONBLOCK);
    std::string content;
    content.reserve(static_cast<std::size_t>(after.st_size));
    char buffer[65536];
    // Stop at the bound even when the file grows while it is read.
    while (max_bytes == 0 || content.size() <= max_bytes) {
        const ssize_t got = ::read(fd, buffer, sizeof buffer);
        if (got == 0) {
            break;
        }
        if (got < 0) {
            if (errno == EINTR) {
                continue;
            }
            ::close(fd);
            file.entry = DiskEntry::unreadable;
            return file;
        }
        content.append(buffer, static_cast<std::size_t>(got));
    }
    ::close(fd);
    if (max_bytes != 0 && content.size() > max_bytes) {
        file.entry = DiskEntry::oversized;
        file.size = content.size();
        return file;
    }
    file.entry = DiskEntry::regular;
    file.size = content.size();
    file.content = std::move(content);
    return file;
}

} // namespace tollgate
