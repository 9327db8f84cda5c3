// SPDX-License-Identifier: MIT
// Test support for the Java front end: lex a snippet, find a function, read its tables.
#pragma once

#include "gate/java/java_front_end.hpp"
#include "tollgate/core/counts.hpp"

#include <catch2/catch.hpp>
#include <map>
#include <string>

namespace tollgate::test {

// Lex `code` as the Java file `path` under `convention`.
inline lexer::FileFunctions lex_java(const std::string& code,
                                     const std::string& path = "src/Sample.java",
                                     const core::Convention& convention = {}) {
    return java::lex_java_file({path, code}, convention);
}

// Return the function of `file` whose qualified name ends with `suffix`; fails the test when
// there is none.
inline const lexer::FunctionSpan& java_function(const lexer::FileFunctions& file,
                                                const std::string& suffix) {
    for (const auto& function : file.functions) {
        const std::string& name = function.qualified_name;
        if (name.size() >= suffix.size() &&
            name.compare(name.size() - suffix.size(), suffix.size(), suffix) == 0) {
            return function;
        }
    }
    FAIL("no function ending in \"" << suffix << "\" among " << file.functions.size());
    throw std::logic_error("unreachable");
}

// Return key -> count of the operators (or operands) of `function`.
inline std::map<std::string, std::uint64_t> table(const lexer::FunctionSpan& function,
                                                  core::Role role) {
    const core::Counts counts = core::count_tokens(function.tokens);
    std::map<std::string, std::uint64_t> result;
    for (const auto& [key, entry] :
         role == core::Role::operator_token ? counts.operators : counts.operands) {
        result[key] = entry.count;
    }
    return result;
}

} // namespace tollgate::test
