// SPDX-License-Identifier: MIT
// The dispatch by extension: .java files go to the Java front end, the rest to the C/C++ one.
#pragma once

#include "gate/lexer/lex_files.hpp"

#include <functional>
#include <vector>

namespace tollgate::java {

// The C/C++ lexing function jobs without Java files are handed to (lexer::lex_jobs).
using CFamilyLexing =
    std::vector<lexer::FileFunctions> (*)(const std::vector<lexer::LexJob>&, unsigned,
                                          const std::function<void(const lexer::FileFunctions&)>&);

// Return true when any job of `jobs_list` is a .java file.
bool has_java_jobs(const std::vector<lexer::LexJob>& jobs_list);

// Lex the .java files of `jobs_list` with the Java front end on `jobs` threads (0 = all cores)
// and hand the rest to `c_family`; return one FileFunctions per job, in the order of
// `jobs_list`, the same for any `jobs`. `on_done`, when set, is called after each file
// (serialised). Rethrows the first failure.
std::vector<lexer::FileFunctions>
lex_mixed_jobs(const std::vector<lexer::LexJob>& jobs_list, unsigned jobs,
               const std::function<void(const lexer::FileFunctions&)>& on_done,
               CFamilyLexing c_family);

} // namespace tollgate::java
