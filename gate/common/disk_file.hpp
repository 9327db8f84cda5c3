// SPDX-License-Identifier: MIT
// Reading a file of a working tree that the change under review may have planted: only a regular
// file is ever opened; a symlink is never followed, a FIFO or device never opened.
#pragma once

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
};

// Return the name of `entry` for a skip reason ("symlink", "not a regular file", ...).
const char* disk_entry_text(DiskEntry entry);

// The result of read_regular_file.
struct DiskFile {
    DiskEntry entry = DiskEntry::missing; // what was found
    std::string content;                  // the bytes, when `entry` is regular
};

// Read the file at `path` when it is a regular file: the path is examined with lstat first, then
// opened without following a symlink and without blocking, and checked again on the open file,
// so a FIFO or device put there in between is never read. Never throws.
DiskFile read_regular_file(const std::string& path);

} // namespace tollgate
