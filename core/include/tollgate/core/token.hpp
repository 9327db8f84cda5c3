// SPDX-License-Identifier: MIT
// The classified token: the single input of the metrics core.
#pragma once

#include <string>
#include <vector>

namespace tollgate::core {

// Which side of Halstead's split a token falls on.
enum class Role { operator_token, operand_token };

// How the form of an ambiguous token was decided.
enum class Basis {
    spelling,       // the spelling alone decides (most tokens)
    syntax_tree,    // libclang's annotated cursor decided the form
    previous_token, // the annotation was only a container; the previous token decided
    next_token,     // the annotation was only a container; the next token decided (a name
                    // followed by `(` is called, one followed by `::` or a name is a type)
    lexical,        // the function was measured from lexical extents; previous token decided
};

// One counted token of a function. Closing halves of pairs are never emitted.
struct Token {
    std::string key;      // distinct-counting key, e.g. "-" or "- (unary)"; equal keys are one
                          // distinct operator or operand
    std::string spelling; // the source spelling, e.g. "-", "(" or "count"
    Role role = Role::operator_token; // operator or operand
    std::string form;              // human description of the form counted, empty when unambiguous,
                                   // e.g. "unary minus", "pointer declarator", "call"
    Basis basis = Basis::spelling; // what decided the form
    unsigned line = 0;             // 1-based source line of the token

    bool operator==(const Token& other) const {
        return key == other.key && spelling == other.spelling && role == other.role &&
               form == other.form && basis == other.basis && line == other.line;
    }
};

using TokenList = std::vector<Token>;

// Return a readable name for `basis` ("spelling", "syntax tree", "previous token", "next token",
// "lexical").
const char* to_string(Basis basis);

} // namespace tollgate::core
