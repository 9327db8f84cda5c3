// SPDX-License-Identifier: MIT
// A raw C/C++ lexer of our own, for files the parser stopped on: it never runs libclang, never
// opens an include and takes time and memory linear in the file's size.
#pragma once

#include "gate/lexer/lexer.hpp"
#include "gate/lexer/source_token.hpp"

#include <string>
#include <vector>

namespace tollgate::lexer {

// The code tokens of one file and the directives between them.
struct RawTokens {
    std::vector<SourceToken> tokens;       // code tokens: no comments, no directive lines
    std::vector<DirectiveMark> directives; // each directive line, before the token that follows
    bool complete = true;                  // false when the token limit stopped the lexer
};

// Return the tokens of `content` as a raw lexer of `language` reads them (the keyword set of C11
// with GNU extensions for C, of C++17 for C++): identifiers, keywords, literals (with encoding
// prefixes, raw strings and user-defined suffixes) and punctuators by longest match, digraphs
// included. Comments are dropped; a line whose first token is `#` is a directive and is left out
// with its continuation lines, recorded as a DirectiveMark. An unterminated literal runs to the
// end of its line as one punctuation token, as clang's lexer makes an unknown token of it. The
// lexer stops after `max_tokens` code tokens (then `complete` is false).
RawTokens tokenize_raw(const std::string& content, Language language,
                       std::size_t max_tokens = static_cast<std::size_t>(-1));

} // namespace tollgate::lexer
