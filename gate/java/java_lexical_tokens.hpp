// SPDX-License-Identifier: MIT
// Token predicates shared by the two halves of the Java lexical path (definition scan and
// classification). Internal to gate/java.
#pragma once

#include "gate/java/java_scan.hpp"

#include <algorithm>
#include <cstddef>
#include <iterator>
#include <vector>

namespace tollgate::java::lexical {

// No index.
inline constexpr std::size_t k_npos = static_cast<std::size_t>(-1);

// Return true when `token` is punctuation spelled `text`.
inline bool punct(const JavaToken& token, const char* text) {
    return token.kind == core::LexKind::punctuation && token.spelling == text;
}

// Return true when `token` is the keyword `text`.
inline bool keyword(const JavaToken& token, const char* text) {
    return token.kind == core::LexKind::keyword && token.spelling == text;
}

// Return true when `token` is an identifier.
inline bool identifier(const JavaToken& token) {
    return token.kind == core::LexKind::identifier;
}

// Return true when `token` names a primitive type, void or var.
inline bool is_primitive(const JavaToken& token) {
    static const char* const k_primitives[] = {"boolean", "byte",  "char",   "short", "int",
                                               "long",    "float", "double", "void",  "var"};
    return token.kind == core::LexKind::keyword &&
           std::any_of(std::begin(k_primitives), std::end(k_primitives),
                       [&](const char* p) { return token.spelling == p; });
}

// Return true when `token` is a modifier keyword (public, static, final, default ...).
inline bool is_modifier(const JavaToken& token) {
    static const char* const k_modifiers[] = {
        "public", "protected", "private",   "static",   "final",   "abstract",  "synchronized",
        "native", "strictfp",  "transient", "volatile", "default", "non-sealed"};
    return token.kind == core::LexKind::keyword &&
           std::any_of(std::begin(k_modifiers), std::end(k_modifiers),
                       [&](const char* m) { return token.spelling == m; });
}

// Return the index of the token closing the bracket opened at `open`, or tokens.size().
inline std::size_t match(const std::vector<JavaToken>& tokens, std::size_t open) {
    int depth = 0;
    for (std::size_t i = open; i < tokens.size(); ++i) {
        const JavaToken& t = tokens[i];
        if (punct(t, "(") || punct(t, "[") || punct(t, "{")) {
            ++depth;
        } else if (punct(t, ")") || punct(t, "]") || punct(t, "}")) {
            if (--depth == 0) {
                return i;
            }
        }
    }
    return tokens.size();
}

// Return the index after an annotation starting at `at` (`@` Name(.Name)* [(...)]), or `at`
// when none starts there (`@interface` is no annotation).
inline std::size_t skip_annotation(const std::vector<JavaToken>& tokens, std::size_t at) {
    if (at + 1 >= tokens.size() || !punct(tokens[at], "@") || !identifier(tokens[at + 1])) {
        return at;
    }
    std::size_t k = at + 2;
    while (k + 1 < tokens.size() && punct(tokens[k], ".") && identifier(tokens[k + 1])) {
        k += 2;
    }
    if (k < tokens.size() && punct(tokens[k], "(")) {
        k = std::min(match(tokens, k), tokens.size() - 1) + 1;
    }
    return k;
}

} // namespace tollgate::java::lexical
