// SPDX-License-Identifier: MIT
// What both Java paths share: identity texts, the name table that decides what a qualifier
// names, and the last steps that turn found functions into a FileFunctions.
#pragma once

#include "gate/lexer/function_span.hpp"
#include "tollgate/core/classify.hpp"

#include <set>
#include <string>
#include <vector>

namespace tollgate::java {

// Join the spellings of a type's tokens as it is usually written: "Map<String, int[]>",
// "List<? extends Number>", "String...". Words are separated by one space; a comma is followed
// by one.
std::string join_type_text(const std::vector<std::string>& spellings);

// Names one file declares or uses, for the qualifier rule.
struct NameTable {
    std::set<std::string> types;  // declared types, type parameters, imported and used type names
    std::set<std::string> values; // declared variables, parameters, fields and enum constants
};

// Return true when `name` is spelled like a type under Java's naming convention: an upper-case
// first letter and at least one lower-case letter ("Math", "TelemetryFrame", not "MAX_LEN").
bool looks_like_type_name(const std::string& name);

// Decide what the identifier `name` before a `.` or `::` names (java/1, rule "qualifiers"): a
// value when `table` declares it as one, a type when `table` knows it as one or, failing both,
// when it looks like a type name; else a value. `basis` receives what decided.
core::NameKind qualifier_kind(const NameTable& table, const std::string& name, core::Basis& basis);

// A function found by either path, before its fallback key is numbered.
struct FoundFunction {
    lexer::FunctionSpan span;  // everything but fallback_key and token_hash
    unsigned first_offset = 0; // byte offset of its first token, for ordering
    unsigned last_offset = 0;  // byte offset of its last token
};

// Number same-named functions in source order (fallback keys), hash their tokens and order
// them by start line, then fallback key, into `out.functions`.
void finish_functions(std::vector<FoundFunction> found, const std::string& path,
                      lexer::FileFunctions& out);

// Return the qualified name of a function: `package` (may be empty), the enclosing `types`, then
// `name`, joined with ".".
std::string qualified_java_name(const std::string& package, const std::vector<std::string>& types,
                                const std::string& name);

// The names given to initializer blocks, which have none in the source.
inline constexpr const char* k_static_initializer_name = "(static initializer)";
inline constexpr const char* k_instance_initializer_name = "(initializer)";

} // namespace tollgate::java
