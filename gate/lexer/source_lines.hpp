// SPDX-License-Identifier: MIT
// Line arithmetic and directive words shared by libclang's tokenizer pass and the raw lexer.
#pragma once

#include "gate/lexer/source_token.hpp"

#include <string>
#include <vector>

namespace tollgate::lexer {

// Return the offset at which each line of `content` starts (the first is 0).
std::vector<unsigned> line_starts(const std::string& content);

// Return the 1-based line holding byte `offset`, given `starts` from line_starts.
unsigned line_of(const std::vector<unsigned>& starts, unsigned offset);

// Return true when line `line` (1-based) of `content` ends with a backslash continuation.
bool continues(const std::string& content, const std::vector<unsigned>& starts, unsigned line);

// Return what the directive named `word` ("if", "else", "endif", "define", ...) does to a brace
// count.
DirectiveKind directive_kind(const std::string& word);

} // namespace tollgate::lexer
