// SPDX-License-Identifier: MIT
// From annotated source tokens to counted tokens under the counting convention.
#pragma once

#include "gate/lexer/source_token.hpp"
#include "tollgate/core/classify.hpp"
#include "tollgate/core/token.hpp"

#include <clang-c/Index.h>
#include <cstddef>
#include <vector>

namespace tollgate::lexer {

// The function whose tokens are classified.
struct ClassifyRange {
    std::size_t begin = 0;                                   // first token index (inclusive)
    std::size_t end = 0;                                     // last token index (inclusive)
    std::size_t defined_name = static_cast<std::size_t>(-1); // the defined function's name token
};

// Classify tokens `range.begin`..`range.end` of `tokens`. With `cursors` (libclang's annotation of
// each token), the syntax tree decides where it can and the neighbouring tokens decide where the
// annotation is only a container; without `cursors` (a lexically recovered function) every
// decision is made from neighbouring tokens and marked Basis::lexical. Closing halves of pairs
// are left out. An empty range yields no tokens.
core::TokenList classify_tokens(const std::vector<SourceToken>& tokens,
                                const std::vector<CXCursor>* cursors, const ClassifyRange& range,
                                const core::Convention& convention);

// Return the syntactic facts of tokens `range.begin`..`range.end` (one RawToken per token, closing
// halves marked Form::pair_close), as classify_tokens sees them.
std::vector<core::RawToken> describe_tokens(const std::vector<SourceToken>& tokens,
                                            const std::vector<CXCursor>* cursors,
                                            const ClassifyRange& range);

} // namespace tollgate::lexer
