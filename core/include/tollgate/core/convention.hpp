// SPDX-License-Identifier: MIT
// The counting convention: which tokens are operators or operands, and its fingerprint.
#pragma once

#include <string>

namespace tollgate::core {

// The name and version of the default counting convention.
inline constexpr const char* k_convention_name = "c-family/2";

// The name and version of the counting convention for Java (core/README.md, "java/1").
inline constexpr const char* k_java_convention_name = "java/1";

// Switches of the convention. Each switch that differs from the default changes the fingerprint.
struct Convention {
    bool function_name_as_operand = false; // count the defined function's own name as an operand
    bool body_only = false;                // leave the signature out (count from the opening brace)
    bool merge_unary_binary = false;       // count unary and binary + - * & as one operator each

    bool operator==(const Convention& other) const {
        return function_name_as_operand == other.function_name_as_operand &&
               body_only == other.body_only && merge_unary_binary == other.merge_unary_binary;
    }
};

// Return the fingerprint of `convention`: "c-family/2" for the default, followed by
// "+name-operand", "+body-only", "+merged-forms" for each switch that is on.
std::string fingerprint(const Convention& convention);

// Return the fingerprint of `convention` applied to Java: "java/1" for the default, with the same
// suffixes as fingerprint().
std::string java_fingerprint(const Convention& convention);

// Return the fingerprint of a run that counts C/C++ and, when `with_java`, Java under
// `convention`: "c-family/2" alone, or "c-family/2, java/1" (each with its switch suffixes).
std::string combined_fingerprint(const Convention& convention, bool with_java);

} // namespace tollgate::core
