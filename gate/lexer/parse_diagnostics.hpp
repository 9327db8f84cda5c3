// SPDX-License-Identifier: MIT
// libclang's diagnostics as warnings a report may show: the change's own text where the error is
// in the revision's files, Tollgate's own sentence where it is in a header outside them.
#pragma once

#include "gate/lexer/function_span.hpp"

#include <clang-c/Index.h>
#include <string>
#include <vector>

namespace tollgate::lexer {

// Return `text` with every occurrence of the virtual root removed (paths become repository-
// relative).
std::string strip_virtual_root(std::string text);

// Return the errors of `unit` as warnings of `path` (the main file `main_file`), at most 20 and a
// count of the rest. An error in the main file keeps clang's message and line, except that a
// missing include reads `include "NAME" not found (...)`; an error in a revision header reads
// `in "HEADER": MESSAGE` at the main-file line that includes it; an error in any other header
// (system, compile database) is described in Tollgate's own words at that line, never with
// clang's message, which may quote the header's text.
std::vector<LexWarning> diagnostics_as_warnings(CXTranslationUnit unit, CXFile main_file,
                                                const std::string& path);

// Return true when `unit` has an error (or fatal error) outside the main file `main_file`, or on
// a main-file line that is a preprocessor directive (`content` is the main file's text): the
// errors a precompiled preamble would hold. A preamble is a separate compilation whose scopes
// close at its end, so after such an error the rest of the file can parse differently with a
// preamble than without one (seen on googletest sources whose headers fail without their build
// flags): a unit with such errors is not reparsed from a preamble.
bool errors_before_main_code(CXTranslationUnit unit, CXFile main_file, const std::string& content);

} // namespace tollgate::lexer
