// SPDX-License-Identifier: MIT
// The counting convention: which tokens are operators or operands, and its fingerprint.
#pragma once

#include <string>

namespace tollgate::core {

// The name and version of the default counting convention.
inline constexpr const char* k_convention_name = "c-family/2";

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

} // namespace tollgate::core
