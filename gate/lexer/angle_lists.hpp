// SPDX-License-Identifier: MIT
// Which `<` of a function open a template argument list, answered for every `<` in linear time
// (a file of 20,000 nested `A<` would otherwise take quadratic time to classify).
#pragma once

#include "gate/lexer/source_token.hpp"

#include <cstddef>
#include <vector>

namespace tollgate::lexer {

// The angle brackets of tokens `begin`..`end` (inclusive) of a token list.
class AngleLists {
public:
    // Match every `<` of `tokens[begin..end]` as match_bracket does (nested lists, `>>` closing
    // two, parentheses skipped, `;` `{` `}` ending the attempt), without looking past `end`.
    AngleLists(const std::vector<SourceToken>& tokens, std::size_t begin, std::size_t end);

    // Return true when the `<` at `open` has a matching `>` at or before `end` and no `&&`, `||`,
    // `=`, `?`, `<=` or `>=` lies between them. False for an index that is not a `<` in range.
    bool looks_like_template_list(std::size_t open) const;

private:
    static constexpr std::size_t k_none = static_cast<std::size_t>(-1);
    std::size_t m_begin = 0;
    std::vector<std::size_t> m_close;      // per token of the range: the matching `>`, or k_none
    std::vector<std::size_t> m_disqualify; // prefix counts of tokens that rule a list out
};

} // namespace tollgate::lexer
