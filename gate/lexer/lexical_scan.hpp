// SPDX-License-Identifier: MIT
// The lexical cross-check: function definitions found from balanced braces after a parameter list.
#pragma once

#include "gate/lexer/source_token.hpp"

#include <cstdint>
#include <string>
#include <vector>

namespace tollgate::lexer {

// One function definition found without the parser.
struct LexicalDefinition {
    std::size_t first = 0;      // first token of the declaration (template header included)
    std::size_t name = 0;       // the name token (`operator` for operator functions)
    std::size_t body_open = 0;  // the body's `{`
    std::size_t body_close = 0; // the body's matching `}`
    std::string qualified_name; // enclosing namespaces and classes, then the written name
    std::string signature;      // parameter types as written, names and defaults left out
    std::uint64_t potential_operands = 0; // parameters plus one for a non-void result
};

// Return every function definition at namespace or class scope of `tokens`: a name or operator
// name, a balanced parameter list, optional qualifiers, trailing return type, attribute macros or
// constructor initializers, then a balanced `{...}`. `directives` lets an #else restore the brace
// count of its #if. Definitions inside function bodies (lambdas, local classes) are not listed.
// An unterminated body yields no definition.
std::vector<LexicalDefinition> scan_definitions(const std::vector<SourceToken>& tokens,
                                                const std::vector<DirectiveMark>& directives);

// Return true when the statement whose first token is `first` and whose `name` is followed by a
// parenthesised list and a `{...}` declares a type, not a function: a typedef, an enumeration
// whose base or attributes come from a macro (`enum Kind MACRO(unsigned char) { k_one, k_two }`),
// or a class with a macro right after its key (`struct ALIGNED(8) S { ... }`).
bool declares_type_at(const std::vector<SourceToken>& tokens, std::size_t first, std::size_t name);

// Return the index of the token that closes the bracket opened at `open` (`(`, `[`, `{` or `<`
// for `<` the list ends at the matching `>`), or `tokens.size()` when it is never closed.
std::size_t match_bracket(const std::vector<SourceToken>& tokens, std::size_t open);

} // namespace tollgate::lexer
