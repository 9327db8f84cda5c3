// SPDX-License-Identifier: MIT
// The fingerprint of a counting convention.
#include "tollgate/core/convention.hpp"

namespace tollgate::core {

std::string fingerprint(const Convention& convention) {
    std::string result = k_convention_name;
    if (convention.function_name_as_operand) {
        result += "+name-operand";
    }
    if (convention.body_only) {
        result += "+body-only";
    }
    if (convention.merge_unary_binary) {
        result += "+merged-forms";
    }
    return result;
}

} // namespace tollgate::core
