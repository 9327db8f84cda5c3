// SPDX-License-Identifier: MIT
// Helpers shared by the lexer tests: lex a snippet, find a function, read its keys.
#pragma once

#include "gate/lexer/lexer.hpp"
#include "tollgate/core/counts.hpp"

#include <algorithm>
#include <stdexcept>
#include <string>
#include <vector>

namespace tollgate::test {

// Lex `code` as the file `path` with an otherwise default context.
inline lexer::FileFunctions lex_snippet(const std::string& path, const std::string& code,
                                        lexer::ParseContext context = {}) {
    lexer::Lexer lexer;
    return lexer.lex_functions({path, code}, context);
}

// Return the function whose qualified name is `name`; throw when there is none.
inline const lexer::FunctionSpan& function_named(const lexer::FileFunctions& file,
                                                 const std::string& name) {
    for (const auto& function : file.functions) {
        if (function.qualified_name == name) {
            return function;
        }
    }
    throw std::runtime_error("no function named " + name);
}

// Return the keys of `tokens` in order.
inline std::vector<std::string> keys_of(const core::TokenList& tokens) {
    std::vector<std::string> keys;
    for (const auto& token : tokens) {
        keys.push_back(token.key);
    }
    return keys;
}

// Return how many tokens of `tokens` have key `key` and role `role`.
inline std::size_t count_key(const core::TokenList& tokens, const std::string& key,
                             core::Role role) {
    return static_cast<std::size_t>(
        std::count_if(tokens.begin(), tokens.end(), [&](const core::Token& token) {
            return token.key == key && token.role == role;
        }));
}

// Return the first token spelled `spelling`; throw when there is none.
inline const core::Token& token_spelled(const core::TokenList& tokens, const std::string& spelling,
                                        std::size_t skip = 0) {
    for (const auto& token : tokens) {
        if (token.spelling == spelling && skip-- == 0) {
            return token;
        }
    }
    throw std::runtime_error("no token spelled " + spelling);
}

} // namespace tollgate::test
