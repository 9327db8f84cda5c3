// SPDX-License-Identifier: MIT
// Small helpers shared by the walker tests: git's own answers, trimmed, for cross-checks.
#pragma once

#include "support/temp_repo.hpp"

#include <string>

namespace tollgate::test {

// Return `text` without trailing newlines.
inline std::string trimmed(std::string text) {
    while (!text.empty() && (text.back() == '\n' || text.back() == '\r')) {
        text.pop_back();
    }
    return text;
}

// Return git's own full id for `revision` in `dir` (git rev-parse --verify).
inline std::string rev_parse(const std::string& dir, const std::string& revision) {
    return trimmed(git("rev-parse --verify -q " + shell_quote(revision), dir));
}

// Return a file of `lines` numbered lines "int vN = N;" (N from `first`), newline-terminated.
inline std::string numbered_lines(int lines, int first = 1) {
    std::string text;
    for (int n = first; n < first + lines; ++n) {
        text += "int v" + std::to_string(n) + " = " + std::to_string(n) + ";\n";
    }
    return text;
}

} // namespace tollgate::test
