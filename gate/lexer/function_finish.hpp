// SPDX-License-Identifier: MIT
// The last step of lexing a file, shared by the parser's path and the lexical fallback: classify
// each function's tokens, number same-named functions and order them.
#pragma once

#include "gate/lexer/function_span.hpp"
#include "gate/lexer/token_classifier.hpp"

#include <vector>

namespace tollgate::lexer {

// A function found in a file whose tokens are not classified yet.
struct PendingFunction {
    FunctionSpan span;     // names, lines, mode and n2* filled in; tokens and keys not yet
    ClassifyRange range;   // its tokens in the file's token list
    bool lexical = false;  // classify from neighbouring tokens only (no syntax tree)
    std::size_t first = 0; // index of its first token, for source order
};

// Return the index of the `{` that opens the body ending at token `last`, or `first` when the
// braces do not match.
std::size_t body_open(const std::vector<SourceToken>& tokens, std::size_t first, std::size_t last);

// Finish `pending`, the functions of the file `path` whose tokens are `tokens` (annotated by
// `cursors`, or null when there is no syntax tree): number same-named functions in source order
// (the fallback key's ordinal), classify each function's tokens under `convention` (from its body
// only when the convention says so), hash them, and return the spans ordered by start line, then
// fallback key.
std::vector<FunctionSpan> finish_functions(std::vector<PendingFunction> pending,
                                           const std::string& path,
                                           const std::vector<SourceToken>& tokens,
                                           const std::vector<CXCursor>* cursors,
                                           const core::Convention& convention);

} // namespace tollgate::lexer
