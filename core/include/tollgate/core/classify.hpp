// SPDX-License-Identifier: MIT
// The counting convention's tables: from a token's syntactic facts to a counted Token.
#pragma once

#include "tollgate/core/convention.hpp"
#include "tollgate/core/token.hpp"

#include <optional>
#include <string>

namespace tollgate::core {

// The lexical kind of a source token, as any C/C++ lexer reports it.
enum class LexKind { keyword, punctuation, identifier, literal };

// What an identifier names, as far as the parser could tell.
enum class NameKind {
    value,          // variable, parameter, field, enumerator, constant, label
    function,       // a called function or method, or a function whose address is taken
    macro_function, // a function-like macro that is invoked
    type,           // a type, class, typedef or template name
    namespace_name, // a namespace
    defined,        // the defined function's own name in its declarator
    unknown,        // the parser could not tell; counted as a value
    annotation,     // a Java annotation, spelled with its `@` and full name ("@Override")
};

// The syntactic form of a token whose spelling has several.
enum class Form {
    plain,         // no ambiguity (or not known)
    unary,         // unary + - * & (and unary ! ~ which are never ambiguous)
    binary,        // binary + - * &
    declarator,    // pointer/reference declarator * & &&
    prefix,        // prefix ++ --
    postfix,       // postfix ++ --
    template_open, // < opening a template argument or parameter list
    pair_close,    // the closing half of a pair: ) ] } > of a template list, : of ?:
    wildcard,      // Java: the `?` of a wildcard type argument
    type_bound,    // Java: the `&` joining the bounds of an intersection type
    case_arrow,    // Java: the `->` of a switch rule (a lambda's `->` is plain)
    multi_catch,   // Java: the `|` joining the types of a multi-catch
};

// The facts the lexer hands over for one source token.
struct RawToken {
    std::string spelling;                // source spelling
    LexKind kind = LexKind::punctuation; // lexical kind
    NameKind name = NameKind::unknown;   // for identifiers: what the name denotes
    Form form = Form::plain;             // for ambiguous punctuators: which form
    Basis basis = Basis::spelling;       // what decided `name` or `form`
    unsigned line = 0;                   // 1-based line
};

// Classify `raw` under `convention`. Return nothing for tokens the convention does not count
// (closing halves of pairs).
std::optional<Token> classify_token(const RawToken& raw, const Convention& convention = {});

// Return true when `spelling` is a keyword counted as an operand (true, false, nullptr, this).
bool is_operand_keyword(const std::string& spelling);

// Return true when `spelling` may be unary or binary (+ - * &) in C/C++.
bool is_unary_binary_ambiguous(const std::string& spelling);

} // namespace tollgate::core
