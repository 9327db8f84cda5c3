// SPDX-License-Identifier: MIT
// Glob patterns for policy paths and function names: `*`, `**`, `?` and `[...]`.
#pragma once

#include <string_view>

namespace tollgate::policy {

// What a glob is matched against.
enum class GlobSubject {
    path, // `*` and `?` stop at "/"; `**` crosses folders; "**/" also matches no folder
    name, // a qualified function name: `*` and `**` match any characters
};

// Return whether `text` matches the whole of `pattern`. Supports `*`, `**`, `?`, `[abc]`,
// `[a-z]` and `[!abc]`; any other character matches itself. An unterminated `[` matches a
// literal "[". Runs in time proportional to the pattern length times the text length.
bool glob_match(std::string_view pattern, std::string_view text, GlobSubject subject);

} // namespace tollgate::policy
