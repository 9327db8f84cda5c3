// SPDX-License-Identifier: MIT
// Reading a file of a working tree that the change under review may have planted: only a regular
// file is ever opened; a symlink is never followed, a FIFO or device never opened.
#pragma once

#include <cstdint>
#include <optional>
#include <string>

namespace tollgate {

// What was found at a path.
enum class DiskEntry {
    regular,    // a regular file (read)
    missing,    // nothing there
    symlink,    // a symbolic link (not followed)
    special,    // a FIFO, device, socket or folder (not opened)
    unreadable, // a regular file that could not be opened or read
    oversized,  // a regular file over the size bound (not read)
};

// Return the name of `entry` for a skip reason ("symlink", "not a regular file", ...).
const char* disk_entry_text(DiskEntry entry);

// The result of read_regular_file.
struct DiskFile {
    DiskEntry entry = DiskEntry::missing; // what was found
    std::string content;                  // the bytes, when `entry` is regular
    std::uint64_t size = 0;               // its size, when `entry` is regular or oversized
};

// Read the file at `path` when it is a regular file: the path is examined with lstat first, then
// opened without following a symlink and without blocking, and checked again on the open file,
// so a FIFO or device put there in between is never read. A file larger than `max_bytes` (0: no
// bound) by the open file's own size is not read (DiskEntry::oversized). Never throws.
DiskFile read_regular_file(const std::string& path, std::uint64_t max_bytes = 0);

} // namespace tollgate
