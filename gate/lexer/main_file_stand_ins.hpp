// SPDX-License-Identifier: MIT
// Stand-ins on disk for in-memory main files, so that libclang keeps their precompiled preambles.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::lexer {

// libclang 14 reuses a translation unit's precompiled preamble on reparse only when the main
// file's path exists on disk: it finds the in-memory contents of the main file by the file's
// identity (device and inode), so for a path that does not exist (every path under
// k_virtual_root) it finds none, builds no preamble and parses everything again on every reparse.
// Measured with libclang 14 on a file including a 15,000-line header library: reparse 1.0-1.3 s
// without a file on disk, 0.21-0.30 s with an empty file at the path, plain parse 1.0-1.1 s.
//
// MainFileStandIns gives each main path such a file without creating anything at the path
// itself: one empty file in a private folder, and per main path a virtual file system overlay
// (clang's -ivfsoverlay, a JSON document) that shows the empty file at the main path under the
// main path's own name. The contents still come from the in-memory buffer; no other path is
// mapped, so includes resolve exactly as without the overlay.
//
// One more flag comes with the overlay. libclang finds GCC's headers through its own folder,
// which it does not know, so it names them "/../lib/gcc/..."; clang's overlay file system
// cannot look such a path up ("'vector' file not found", and a precompiled header that names
// them is refused as malformed). A parse with a stand-in therefore names the GCC installation
// (k_stand_in_toolchain: the same headers under "/usr/lib/gcc/..."), and the precompiled
// standard headers it uses are built with that flag too.
inline constexpr const char* k_stand_in_toolchain = "--gcc-toolchain=/usr";

// For C++, a parse that keeps its preamble also instantiates the preamble's pending templates
// while building it, once, instead of at the end of every reparse: on the generated header
// library of tests/bench (explicit instantiations in its headers) a reparse took 150-160 ms
// without this flag and 37-41 ms with it (libclang 14, the same machine and file).
inline constexpr const char* k_preamble_instantiates = "-fpch-instantiate-templates";

// Return true when `flags` (a compile database's) choose a toolchain, target or system root
// themselves: such a file is parsed without reuse rather than with a second toolchain flag.
bool chooses_toolchain(const std::vector<std::string>& flags);

class MainFileStandIns {
public:
    MainFileStandIns() = default;
    ~MainFileStandIns(); // removes the private folder
    MainFileStandIns(const MainFileStandIns&) = delete;
    MainFileStandIns& operator=(const MainFileStandIns&) = delete;

    // Return the overlay file for `main_path`, written on first use, or nothing when the path is
    // not plain printable ASCII (it is then parsed without reuse), GCC is not installed under
    // /usr (k_stand_in_toolchain), or the folder or a file cannot be written (logged at debug
    // level). The private folder is made in the system's temporary
    // folder (TMPDIR: the parser process's own private folder).
    std::optional<std::string> overlay_for(const std::string& main_path);

private:
    std::string m_folder;                          // empty until first use
    bool m_failed = false;                         // the folder could not be made
    std::map<std::string, std::string> m_overlays; // main path -> overlay file
};

} // namespace tollgate::lexer
