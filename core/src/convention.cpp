// SPDX-License-Identifier: MIT
// The fingerprint of a counting convention.
#include "tollgate/core/convention.hpp"

namespace tollgate::core {

namespace {

std::string with_switches(std::string name, const Convention& convention) {
    if (convention.function_name_as_operand) {
        name += "+name-operand";
    }
    if (convention.body_only) {
        name += "+body-only";
    }
    if (convention.merge_unary_binary) {
        name += "+merged-forms";
    }
    return name;
}

} // namespace

std::string fingerprint(const Convention& convention) {
    return with_switches(k_convention_name, convention);
}

std::string java_fingerprint(const Convention& convention) {
    return with_switches(k_java_convention_name, convention);
}

std::string combined_fingerprint(const Convention& convention, bool with_java) {
    std::string result = fingerprint(convention);
    if (with_java) {
        result += ", " + java_fingerprint(convention);
    }
    return result;
}

} // namespace tollgate::core
