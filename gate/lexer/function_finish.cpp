// SPDX-License-Identifier: MIT
// Fallback keys, classification, digests and order of a file's functions.
#include "gate/lexer/function_finish.hpp"

#include "tollgate/core/token_digest.hpp"

#include <algorithm>
#include <map>

namespace tollgate::lexer {

std::size_t body_open(const std::vector<SourceToken>& tokens, std::size_t first, std::size_t last) {
    if (!is_punct(tokens[last], "}")) {
        return first;
    }
    int depth = 0;
    for (std::size_t i = last + 1; i-- > first;) {
        if (is_punct(tokens[i], "}")) {
            ++depth;
        } else if (is_punct(tokens[i], "{") && --depth == 0) {
            return i;
        }
    }
    return first;
}

std::vector<FunctionSpan> finish_functions(std::vector<PendingFunction> pending,
                                           const std::string& path,
                                           const std::vector<SourceToken>& tokens,
                                           const std::vector<CXCursor>* cursors,
                                           const core::Convention& convention) {
    std::sort(pending.begin(), pending.end(),
              [](const PendingFunction& a, const PendingFunction& b) { return a.first < b.first; });
    std::map<std::string, unsigned> ordinals;
    std::vector<FunctionSpan> functions;
    functions.reserve(pending.size());
    for (PendingFunction& item : pending) {
        FunctionSpan& span = item.span;
        span.path = path;
        const std::string base = span.qualified_name + "(" + span.signature + ")";
        span.fallback_key = base + "#" + std::to_string(ordinals[base]++);
        ClassifyRange range = item.range;
        if (convention.body_only) {
            range.begin = body_open(tokens, range.begin, range.end);
        }
        span.tokens = classify_tokens(tokens, item.lexical ? nullptr : cursors, range, convention);
        span.token_hash = core::token_digest(span.tokens);
        functions.push_back(std::move(span));
    }
    std::stable_sort(functions.begin(), functions.end(),
                     [](const FunctionSpan& a, const FunctionSpan& b) {
                         return a.start_line != b.start_line ? a.start_line < b.start_line
                                                             : a.fallback_key < b.fallback_key;
                     });
    return functions;
}

} // namespace tollgate::lexer
