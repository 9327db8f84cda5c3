// SPDX-License-Identifier: MIT
// Path confinement of a parser process: which files it may read or write, decided on resolved
// paths, and whether the C library calls of the parser are routed through the check.
#pragma once

#include <string>
#include <vector>

namespace tollgate::isolate {

// The folders a confined process may use on disk.
struct PathPolicy {
    std::vector<std::string> read_roots;  // absolute folders (or single files) whose regular files
                                          // and folders may be read, listed and probed
    std::vector<std::string> write_roots; // absolute folders in which files may be created,
                                          // replaced or removed (also readable)
};

// Return the folders that hold the compiler's and the system's headers on this machine and
// exist: /usr/include (with its multiarch and C++ library folders), /usr/local/include, GCC's
// installation folder /usr/lib/gcc (libclang finds the C++ library through it) and libclang 14's
// resource folder. Never fails; folders that do not exist are left out.
std::vector<std::string> system_include_roots();

// Confine every later path operation of this process that goes through the interposed C library
// calls (see interpose.cpp) to `policy`; a later call replaces the policy. Roots are resolved
// (symlinks followed) now, and roots that do not exist are left out. Not undone for the life of
// the process: call it only in a process made for parsing.
void confine_paths(const PathPolicy& policy);

// Return true once confine_paths was called in this process.
bool paths_confined();

// What a path operation wants.
enum class PathUse {
    inspect, // metadata only (stat, access, realpath, readlink)
    read,    // open for reading, list a folder
    write,   // create, replace, remove
};

// Return 0 when this process may use `path` for `use`, else the errno value to fail with
// (ENOENT for a refused read, EACCES for a refused write). A read is allowed when `path` resolves
// (symlinks and ".." followed as the kernel does) under a root and names a regular file or a
// folder: devices, FIFOs and sockets are never allowed. An inspection is also allowed for the
// folders above a root ("/usr" above "/usr/include"), which the compiler driver probes to find
// its installation. A write is allowed when the folder holding `path` resolves under a write
// root. When `resolved` is not null (PATH_MAX bytes) an
// allowed read stores the resolved path there. An unconfined process may use every path and gets
// `path` copied to `resolved`.
int check_path(const char* path, PathUse use, char* resolved);

// Return true when the interposing wrappers are linked into this executable and the dynamic
// linker binds the C library names to them (so libLLVM's calls reach check_path).
bool interposer_bound();

} // namespace tollgate::isolate
