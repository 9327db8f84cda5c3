// SPDX-License-Identifier: MIT
// Precompiled standard headers: built once per libclang version, language and flags, reused.
#pragma once

#include <string>
#include <vector>

namespace tollgate::lexer {

// Return the path of a precompiled header of the common standard headers for `language_flags`
// (e.g. {"-x", "c++", "-std=c++17"}) in `cache_dir`, building it on first use in this process
// (thread-safe; parser processes sharing `cache_dir` take turns through a lock file) or reusing
// a file an earlier run left there. Return an empty string when `cache_dir` is empty or the
// header cannot be built; the reason is logged at debug level.
std::string precompiled_header(const std::vector<std::string>& language_flags,
                               const std::string& cache_dir);

// Forget `path` for the rest of this process and remove it, after libclang refused to load it.
void discard_precompiled_header(const std::string& path);

// Return how many precompiled headers this process has built (not reused).
unsigned precompiled_header_builds();

} // namespace tollgate::lexer
