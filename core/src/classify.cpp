// SPDX-License-Identifier: MIT
// The counting convention c-family/2, rule by rule (see core/README.md).
#include "tollgate/core/classify.hpp"

#include <array>
#include <string_view>

namespace tollgate::core {

const char* to_string(Basis basis) {
    switch (basis) {
    case Basis::spelling:
        return "spelling";
    case Basis::syntax_tree:
        return "syntax tree";
    case Basis::previous_token:
        return "previous token";
    case Basis::next_token:
        return "next token";
    case Basis::lexical:
        return "lexical";
    }
    return "spelling";
}

bool is_operand_keyword(const std::string& spelling) {
    return spelling == "true" || spelling == "false" || spelling == "nullptr" || spelling == "this";
}

bool is_unary_binary_ambiguous(const std::string& spelling) {
    return spelling == "+" || spelling == "-" || spelling == "*" || spelling == "&";
}

namespace {

// The opening halves of pairs and the key they are counted under.
std::optional<std::string_view> pair_key(const std::string& spelling) {
    if (spelling == "(") {
        return std::string_view("()");
    }
    if (spelling == "[") {
        return std::string_view("[]");
    }
    if (spelling == "{") {
        return std::string_view("{}");
    }
    if (spelling == "?") {
        return std::string_view("?:");
    }
    return std::nullopt;
}

bool is_closing(const std::string& spelling) {
    return spelling == ")" || spelling == "]" || spelling == "}";
}

// Describe the unary form of + - * &.
std::string unary_form_name(const std::string& spelling) {
    if (spelling == "+") {
        return "unary plus";
    }
    if (spelling == "-") {
        return "unary minus";
    }
    if (spelling == "*") {
        return "dereference";
    }
    return "address-of";
}

// Describe the binary form of + - * &.
std::string binary_form_name(const std::string& spelling) {
    if (spelling == "+") {
        return "addition";
    }
    if (spelling == "-") {
        return "subtraction";
    }
    if (spelling == "*") {
        return "multiplication";
    }
    return "bitwise and";
}

std::string declarator_form_name(const std::string& spelling) {
    if (spelling == "*") {
        return "pointer declarator";
    }
    if (spelling == "&") {
        return "reference declarator";
    }
    if (spelling == "&&") {
        return "rvalue reference declarator";
    }
    if (spelling == "^") {
        return "block pointer declarator";
    }
    return "declarator";
}

Token classify_punctuation(const RawToken& raw, const Convention& convention) {
    Token token;
    token.spelling = raw.spelling;
    token.role = Role::operator_token;
    token.line = raw.line;
    token.basis = raw.basis;
    token.key = raw.spelling;
    if (auto pair = pair_key(raw.spelling)) {
        token.key = std::string(*pair);
        token.basis = Basis::spelling;
        return token;
    }
    if (raw.form == Form::template_open) {
        token.key = "<>";
        token.form = "template argument list";
        return token;
    }
    if (raw.form == Form::declarator) {
        token.key = raw.spelling + " (declarator)";
        token.form = declarator_form_name(raw.spelling);
        return token;
    }
    if (raw.spelling == "++" || raw.spelling == "--") {
        const bool postfix = raw.form == Form::postfix;
        token.key = raw.spelling + (postfix ? " (postfix)" : " (prefix)");
        token.form = std::string(postfix ? "postfix " : "prefix ") +
                     (raw.spelling == "++" ? "increment" : "decrement");
        return token;
    }
    if (is_unary_binary_ambiguous(raw.spelling)) {
        const bool unary = raw.form == Form::unary;
        if (convention.merge_unary_binary) {
            token.key = raw.spelling;
        } else {
            token.key = unary ? raw.spelling + " (unary)" : raw.spelling;
        }
        token.form = unary ? unary_form_name(raw.spelling) : binary_form_name(raw.spelling);
        return token;
    }
    if (raw.spelling == "&&" && raw.form == Form::unary) {
        // GNU label address `&&label`.
        token.key = "&& (unary)";
        token.form = "label address";
        return token;
    }
    token.basis = Basis::spelling;
    return token;
}

} // namespace

std::optional<Token> classify_token(const RawToken& raw, const Convention& convention) {
    if (raw.form == Form::pair_close) {
        return std::nullopt;
    }
    switch (raw.kind) {
    case LexKind::punctuation:
        if (is_closing(raw.spelling)) {
            return std::nullopt;
        }
        return classify_punctuation(raw, convention);
    case LexKind::literal: {
        Token token;
        token.key = raw.spelling;
        token.spelling = raw.spelling;
        token.role = Role::operand_token;
        token.line = raw.line;
        return token;
    }
    case LexKind::keyword: {
        Token token;
        token.key = raw.spelling;
        token.spelling = raw.spelling;
        token.role = is_operand_keyword(raw.spelling) ? Role::operand_token : Role::operator_token;
        token.line = raw.line;
        return token;
    }
    case LexKind::identifier: {
        Token token;
        token.key = raw.spelling;
        token.spelling = raw.spelling;
        token.line = raw.line;
        token.basis = raw.basis;
        switch (raw.name) {
        case NameKind::function:
            token.role = Role::operator_token;
            token.form = "call";
            break;
        case NameKind::macro_function:
            token.role = Role::operator_token;
            token.form = "macro call";
            break;
        case NameKind::type:
            token.role = Role::operator_token;
            token.form = "type name";
            break;
        case NameKind::namespace_name:
            token.role = Role::operator_token;
            token.form = "namespace name";
            break;
        case NameKind::annotation:
            token.role = Role::operator_token;
            token.form = "annotation";
            break;
        case NameKind::defined:
            token.role =
                convention.function_name_as_operand ? Role::operand_token : Role::operator_token;
            token.form = "defined function";
            break;
        case NameKind::value:
        case NameKind::unknown:
            token.role = Role::operand_token;
            break;
        }
        return token;
    }
    }
    return std::nullopt;
}

} // namespace tollgate::core
