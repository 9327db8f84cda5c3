// SPDX-License-Identifier: MIT
// The Java front end: one .java file in, its functions with classified tokens out (the same
// FileFunctions the C/C++ front end gives). tree-sitter parses; a lexical scan recovers what the
// tree lost and measures what the parser must not take.
#pragma once

#include "gate/common/source.hpp"
#include "gate/lexer/function_span.hpp"
#include "tollgate/core/convention.hpp"

#include <cstddef>
#include <string>

namespace tollgate::java {

// Files larger than this are measured lexically, without a syntax tree.
inline constexpr std::size_t k_max_tree_bytes = 4u * 1024u * 1024u;

// The time the parser may take for one file before the file is measured lexically.
inline constexpr unsigned k_parse_timeout_ms = 5000;

// Return true when this build has the Java front end (CMake option TOLLGATE_JAVA).
bool java_available();

// Return one line on the Java front end for --version: "java: on (...)" or "java: off (...)".
std::string java_status();

// Return the fingerprint of every convention this build counts under: "c-family/2" alone, or
// "c-family/2, java/1" when the Java front end is built in (each with `convention`'s switches).
// Snapshots and reports record it, so numbers of builds that measure different files are never
// compared.
std::string build_fingerprint(const core::Convention& convention);

// Measure `file` (a .java file) under java/1 and `convention`'s switches. A file with NUL bytes
// is skipped; one larger than k_max_tree_bytes, not valid UTF-8, or that the parser gives up on
// is measured lexically; each case leaves a warning. Syntax errors become warnings and what can
// be measured is measured: functions the tree lost are recovered lexically and flagged. In a
// build without the Java front end, return no functions and a warning that says so. Never throws
// for bad source.
lexer::FileFunctions lex_java_file(const SourceFile& file, const core::Convention& convention);

} // namespace tollgate::java
