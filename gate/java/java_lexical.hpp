// SPDX-License-Identifier: MIT
// The lexical path of the Java front end: functions found from braces and classified from
// neighbouring tokens, for files the parser cannot take (or regions it lost).
#pragma once

#include "gate/java/java_names.hpp"
#include "gate/java/java_scan.hpp"
#include "tollgate/core/convention.hpp"

#include <cstdint>
#include <string>
#include <vector>

namespace tollgate::java {

// One function found without a syntax tree.
struct LexicalFunction {
    std::size_t first = 0;      // its first token (modifiers and annotations included)
    std::size_t name = 0;       // its name token; `first` - 1 wraps for initializers (none)
    bool has_name = false;      // false for initializer blocks
    std::size_t body_open = 0;  // the body's `{`
    std::size_t body_close = 0; // the body's matching `}`
    std::string qualified_name; // package, enclosing types, name
    std::string signature;      // parameter types as written, names left out
    std::uint64_t potential_operands = 0; // parameters plus one for a non-void result
};

// Return the methods, constructors, compact constructors and initializer blocks of `tokens` that
// sit in a type body (or at the top level of a broken file), in source order. Bodies of
// functions are not searched (lambdas, local and anonymous classes belong to their function);
// an unterminated body yields no function.
std::vector<LexicalFunction> scan_java_definitions(const std::vector<JavaToken>& tokens);

// Return the names `tokens` declare or use as types and values, as far as neighbours tell.
NameTable lexical_names(const std::vector<JavaToken>& tokens);

// Classify tokens `first`..`last` of `tokens` under java/1 and `convention` from neighbouring
// tokens alone (every token's basis is lexical). `defined` is the defined function's name token,
// or `tokens.size()` when it has none. Closing halves of pairs are left out.
core::TokenList classify_java_lexically(const std::vector<JavaToken>& tokens, std::size_t first,
                                        std::size_t last, std::size_t defined,
                                        const NameTable& names, const core::Convention& convention);

// Measure every function of `scan` lexically: the whole lexical path for one file.
std::vector<FoundFunction> measure_lexically(const JavaScan& scan,
                                             const core::Convention& convention);

} // namespace tollgate::java
