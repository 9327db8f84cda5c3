// SPDX-License-Identifier: MIT
// Precompiled standard headers: built once per libclang version, language and flags, reused.
#pragma once

#include "gate/lexer/shared_headers.hpp"

#include <clang-c/Index.h>
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

// Return the path of a precompiled header of the common standard headers and then the lines of
// `shared` (shared_headers.hpp), for a parse with `language_flags` and then `other_args` (the
// include folders) over the in-memory `unsaved` headers, kept in `folder` under a name from all
// of them and `shared.digest`: reused when there, else built (parser processes sharing `folder`
// take turns through a lock file). Return an empty string when `folder` is empty or the header
// cannot be built (an error in those headers: the file is parsed with the standard headers
// only); either answer is remembered for the rest of this process.
std::string shared_header_pch(const std::vector<std::string>& language_flags,
                              const std::vector<std::string>& other_args,
                              const SharedIncludes& shared,
                              const std::vector<CXUnsavedFile>& unsaved, const std::string& folder);

// True when libclang refused the precompiled header `unit` was parsed with (a fatal error
// about it), or gave no unit at all.
bool pch_refused(CXTranslationUnit unit);

// Forget `path` for the rest of this process and remove it, after libclang refused to load it.
void discard_precompiled_header(const std::string& path);

// Return how many precompiled headers (standard and shared) this process has built (not
// reused).
unsigned precompiled_header_builds();

} // namespace tollgate::lexer
