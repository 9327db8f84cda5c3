// SPDX-License-Identifier: MIT
// The counting convention java/1: from a Java token's syntactic facts to a counted Token.
#pragma once

#include "tollgate/core/classify.hpp"
#include "tollgate/core/convention.hpp"
#include "tollgate/core/token.hpp"

#include <optional>
#include <string>

namespace tollgate::core {

// Classify the Java token `raw` under convention java/1 with the switches of `convention`
// (core/README.md, "The counting convention java/1"). Return nothing for tokens the convention
// does not count (closing halves of pairs).
std::optional<Token> classify_java_token(const RawToken& raw, const Convention& convention = {});

// Return true when `spelling` is a Java keyword counted as an operand (this, super, null, true,
// false).
bool is_java_operand_keyword(const std::string& spelling);

// Return true when `spelling` is a Java keyword: the reserved words (Java Language
// Specification, SE 17, section 3.9), true, false, null, and the contextual var, yield and
// non-sealed.
bool is_java_keyword(const std::string& spelling);

} // namespace tollgate::core
