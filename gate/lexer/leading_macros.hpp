// SPDX-License-Identifier: MIT
// A declaration's first token: leading specifier macros belong to the function they precede.
#pragma once

#include "gate/lexer/source_token.hpp"

#include <clang-c/Index.h>
#include <cstddef>
#include <vector>

namespace tollgate::lexer {

// Return the first token of the declaration whose parsed extent starts at token `first`: earlier
// than `first` when macro invocations stand right before it whose definitions hold no `;`, `{` or
// `}` (specifier macros such as `SOMELIB_API` or `SOMELIB_CONSTEXPR`, which may expand to
// nothing, so libclang's extent leaves them out). `cursors` are libclang's annotations of
// `tokens`. A macro whose definition holds `;`, `{` or `}` ends an earlier declaration and stops
// the walk back, and so does a preprocessor directive line or any other token.
std::size_t leading_macro_start(const std::vector<SourceToken>& tokens,
                                const std::vector<CXCursor>& cursors,
                                const std::vector<DirectiveMark>& directives, std::size_t first);

} // namespace tollgate::lexer
