// SPDX-License-Identifier: MIT
// The lexer's own view of one source token and of the preprocessor lines between tokens.
#pragma once

#include "tollgate/core/classify.hpp"

#include <cstddef>
#include <string>
#include <vector>

namespace tollgate::lexer {

// One token of the main file that is neither a comment nor on a preprocessor directive line.
struct SourceToken {
    core::LexKind kind = core::LexKind::punctuation; // lexical kind
    std::string spelling;                            // source spelling
    unsigned offset = 0;                             // byte offset in the file
    unsigned line = 0;                               // 1-based line
};

// The conditional directives that matter to a brace count.
enum class DirectiveKind { open_condition, alternative, close_condition, other };

// A preprocessor directive met before the token at `before` in a SourceToken list.
struct DirectiveMark {
    std::size_t before = 0;                    // index of the first token after the directive
    DirectiveKind kind = DirectiveKind::other; // what it does to a brace count
};

// Return true when `token` is punctuation spelled `text`.
inline bool is_punct(const SourceToken& token, const char* text) {
    return token.kind == core::LexKind::punctuation && token.spelling == text;
}

// Return true when `token` is a keyword spelled `text`.
inline bool is_keyword(const SourceToken& token, const char* text) {
    return token.kind == core::LexKind::keyword && token.spelling == text;
}

} // namespace tollgate::lexer
