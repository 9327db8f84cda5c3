// SPDX-License-Identifier: MIT
// What libclang's cursors tell about a function: its kind, qualified name, parameters, result.
#pragma once

#include <clang-c/Index.h>
#include <string>
#include <vector>

namespace tollgate::lexer {

// Return true for the cursor kinds of function definitions Tollgate measures.
bool is_function_cursor(CXCursorKind kind);

// Return true for the cursor kinds that can hold functions (namespaces, classes, linkage specs).
bool is_container_cursor(CXCursorKind kind);

// Return the enclosing namespaces and classes of `cursor` joined with "::", then its name.
std::string qualified_name(CXCursor cursor);

// Return the parameter type spellings of `cursor`.
std::vector<std::string> parameter_types(CXCursor cursor);

// Return true when the function of `cursor` returns a value (not a constructor, destructor or
// void function).
bool has_result(CXCursor cursor);

} // namespace tollgate::lexer
