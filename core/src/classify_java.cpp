// SPDX-License-Identifier: MIT
// The counting convention java/1, rule by rule (see core/README.md).
#include "tollgate/core/classify_java.hpp"

#include <algorithm>
#include <array>
#include <string_view>

namespace tollgate::core {

namespace {

// Reserved keywords (Java Language Specification, SE 17, section 3.9), the literal words and the
// contextual keywords that act inside method bodies (var, yield) or in a signature
// (non-sealed), sorted for lookup. Module words (module, to, with ...) are ordinary names here.
constexpr std::array<std::string_view, 56> k_java_keywords = {
    "abstract",  "assert",    "boolean",      "break",      "byte",       "case",       "catch",
    "char",      "class",     "const",        "continue",   "default",    "do",         "double",
    "else",      "enum",      "extends",      "false",      "final",      "finally",    "float",
    "for",       "goto",      "if",           "implements", "import",     "instanceof", "int",
    "interface", "long",      "native",       "new",        "non-sealed", "null",       "package",
    "private",   "protected", "public",       "return",     "short",      "static",     "strictfp",
    "super",     "switch",    "synchronized", "this",       "throw",      "throws",     "transient",
    "true",      "try",       "var",          "void",       "volatile",   "while",      "yield",
};

Token operator_token(const RawToken& raw, std::string key, std::string form = {}) {
    Token token;
    token.key = std::move(key);
    token.spelling = raw.spelling;
    token.role = Role::operator_token;
    token.form = std::move(form);
    token.basis = raw.basis;
    token.line = raw.line;
    return token;
}

Token operand_token(const RawToken& raw) {
    Token token;
    token.key = raw.spelling;
    token.spelling = raw.spelling;
    token.role = Role::operand_token;
    token.basis = raw.basis;
    token.line = raw.line;
    return token;
}

std::optional<Token> classify_punctuation(const RawToken& raw, const Convention& convention) {
    const std::string& s = raw.spelling;
    if (s == ")" || s == "]" || s == "}") {
        return std::nullopt;
    }
    RawToken plain = raw;
    plain.basis = Basis::spelling;
    if (s == "(") {
        return operator_token(plain, "()");
    }
    if (s == "[") {
        return operator_token(plain, "[]");
    }
    if (s == "{") {
        return operator_token(plain, "{}");
    }
    switch (raw.form) {
    case Form::template_open:
        return operator_token(raw, "<>", "type argument list");
    case Form::wildcard:
        return operator_token(raw, "? (wildcard)", "wildcard");
    case Form::type_bound:
        return operator_token(raw, "& (bound)", "intersection bound");
    case Form::case_arrow:
        return operator_token(raw, "-> (case)", "switch rule");
    case Form::multi_catch:
        return operator_token(raw, "| (catch)", "multi-catch");
    default:
        break;
    }
    if (s == "?") {
        return operator_token(plain, "?:");
    }
    if (s == "++" || s == "--") {
        const bool postfix = raw.form == Form::postfix;
        return operator_token(raw, s + (postfix ? " (postfix)" : " (prefix)"),
                              std::string(postfix ? "postfix " : "prefix ") +
                                  (s == "++" ? "increment" : "decrement"));
    }
    if (s == "+" || s == "-") {
        const bool unary = raw.form == Form::unary;
        const std::string key = unary && !convention.merge_unary_binary ? s + " (unary)" : s;
        const char* form = unary ? (s == "+" ? "unary plus" : "unary minus")
                                 : (s == "+" ? "addition" : "subtraction");
        return operator_token(raw, key, form);
    }
    return operator_token(plain, s);
}

std::optional<Token> classify_identifier(const RawToken& raw, const Convention& convention) {
    switch (raw.name) {
    case NameKind::function:
    case NameKind::macro_function:
        return operator_token(raw, raw.spelling, "call");
    case NameKind::type:
        return operator_token(raw, raw.spelling, "type name");
    case NameKind::namespace_name:
        return operator_token(raw, raw.spelling, "package name");
    case NameKind::annotation:
        return operator_token(raw, raw.spelling, "annotation");
    case NameKind::defined:
        if (convention.function_name_as_operand) {
            Token token = operand_token(raw);
            token.form = "defined function";
            return token;
        }
        return operator_token(raw, raw.spelling, "defined function");
    case NameKind::value:
    case NameKind::unknown:
        break;
    }
    return operand_token(raw);
}

} // namespace

bool is_java_operand_keyword(const std::string& spelling) {
    return spelling == "this" || spelling == "super" || spelling == "null" || spelling == "true" ||
           spelling == "false";
}

bool is_java_keyword(const std::string& spelling) {
    return std::binary_search(k_java_keywords.begin(), k_java_keywords.end(),
                              std::string_view(spelling));
}

std::optional<Token> classify_java_token(const RawToken& raw, const Convention& convention) {
    if (raw.form == Form::pair_close) {
        return std::nullopt;
    }
    switch (raw.kind) {
    case LexKind::punctuation:
        return classify_punctuation(raw, convention);
    case LexKind::literal:
        return operand_token(raw);
    case LexKind::keyword:
        if (is_java_operand_keyword(raw.spelling)) {
            return operand_token(raw);
        }
        return operator_token(raw, raw.spelling);
    case LexKind::identifier:
        return classify_identifier(raw, convention);
    }
    return std::nullopt;
}

} // namespace tollgate::core
