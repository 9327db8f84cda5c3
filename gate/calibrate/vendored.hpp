// SPDX-License-Identifier: MIT
// Folders of bundled third-party code, found from a tree's file names alone.
#pragma once

#include <string>
#include <vector>

namespace tollgate::calibrate {

// Why a folder looks like bundled third-party code.
enum class VendoredSign {
    licensed_bundle, // its own licence file and build file, below a holding folder
    test_framework,  // named like a commonly bundled unit-test framework, with its own licence
                     // or build file, not at the top level
};

// One folder of bundled code.
struct VendoredFolder {
    std::string path;        // repository-relative, '/' separated, no trailing slash
    VendoredSign sign{};     // why it was taken for bundled code
    std::size_t files = 0;   // changed files of the replayed history inside it (not parsed)
    std::size_t commits = 0; // replayed commits that changed a file inside it

    bool operator==(const VendoredFolder& other) const {
        return path == other.path && sign == other.sign && files == other.files &&
               commits == other.commits;
    }
};

// Return the folders of `paths` (every file of a tree, repository-relative) that look like
// bundled third-party code, outermost only, sorted by path. A folder qualifies when either
//  - it holds its own licence file (LICENSE, LICENCE, COPYING, with or without an extension)
//    and its own build file (CMakeLists.txt, Makefile, meson.build, configure, BUILD, ...), and
//    one of the folders above it is a holding folder (tests, test, third_party, vendor, extern,
//    external, deps, 3rdparty, contrib and their spellings), or
//  - its name is one of the folder names under which the commonly bundled unit-test frameworks
//    ship their sources (see k_test_framework_folders), it holds its own licence or build file,
//    and it is not at the top level of the repository (where it is the project itself).
// The repository's root is never taken. Names compare case-insensitively. Never fails.
std::vector<VendoredFolder> find_vendored(const std::vector<std::string>& paths);

// Return whether `path` lies inside one of `folders`.
bool inside_any(const std::vector<VendoredFolder>& folders, const std::string& path);

// Return the reason `sign` as a phrase for reports, e.g. "named like a bundled unit-test
// framework".
const char* vendored_sign_text(VendoredSign sign);

} // namespace tollgate::calibrate
