// SPDX-License-Identifier: MIT
// A glob matcher written for policy paths and names (fnmatch has no `**`).
#include "gate/policy/glob.hpp"

#include <vector>

namespace tollgate::policy {

namespace {

// Match a `[...]` class starting at `pattern[at]` against `c`. Return the index after the class,
// or 0 when the class is unterminated (then "[" is a literal).
std::size_t match_class(std::string_view pattern, std::size_t at, char c, bool& matched) {
    std::size_t i = at + 1;
    bool negate = false;
    if (i < pattern.size() && (pattern[i] == '!' || pattern[i] == '^')) {
        negate = true;
        ++i;
    }
    bool found = false;
    bool first = true;
    while (i < pattern.size() && (first || pattern[i] != ']')) {
        first = false;
        const char low = pattern[i];
        if (i + 2 < pattern.size() && pattern[i + 1] == '-' && pattern[i + 2] != ']') {
            const char high = pattern[i + 2];
            if (low <= c && c <= high) {
                found = true;
            }
            i += 3;
        } else {
            if (low == c) {
                found = true;
            }
            ++i;
        }
    }
    if (i >= pattern.size()) {
        return 0;
    }
    matched = found != negate;
    return i + 1;
}

} // namespace

bool glob_match(std::string_view pattern, std::string_view text, GlobSubject subject) {
    const std::size_t pn = pattern.size();
    const std::size_t tn = text.size();
    // reach[p * (tn + 1) + t]: pattern[p..] can still be tried against text[t..]. Filled forward
    // from (0, 0), so each state is visited once: no exponential backtracking on many stars.
    std::vector<char> reach((pn + 1) * (tn + 1), 0);
    const auto at = [&](std::size_t p, std::size_t t) -> char& { return reach[p * (tn + 1) + t]; };
    at(0, 0) = 1;
    for (std::size_t p = 0; p <= pn; ++p) {
        for (std::size_t t = 0; t <= tn; ++t) {
            if (!at(p, t)) {
                continue;
            }
            if (p == pn) {
                continue;
            }
            const char pc = pattern[p];
            if (pc == '*') {
                const bool double_star = p + 1 < pn && pattern[p + 1] == '*';
                const std::size_t after = double_star ? p + 2 : p + 1;
                const bool crosses = double_star || subject == GlobSubject::name;
                at(after, t) = 1; // the star matches nothing
                if (double_star && subject == GlobSubject::path && after < pn &&
                    pattern[after] == '/' && (p == 0 || pattern[p - 1] == '/') &&
                    (t == 0 || text[t - 1] == '/')) {
                    at(after + 1, t) = 1; // "**/" matches no folder at all
                }
                if (t < tn && (crosses || text[t] != '/')) {
                    at(p, t + 1) = 1; // the star takes one more character
                }
                continue;
            }
            if (t == tn) {
                continue;
            }
            const char tc = text[t];
            if (pc == '?') {
                if (subject == GlobSubject::name || tc != '/') {
                    at(p + 1, t + 1) = 1;
                }
                continue;
            }
            if (pc == '[') {
                bool matched = false;
                const std::size_t next = match_class(pattern, p, tc, matched);
                if (next != 0) {
                    if (matched && (subject == GlobSubject::name || tc != '/')) {
                        at(next, t + 1) = 1;
                    }
                    continue;
                }
            }
            if (pc == tc) {
                at(p + 1, t + 1) = 1;
            }
        }
    }
    return at(pn, tn) != 0;
}

} // namespace tollgate::policy
