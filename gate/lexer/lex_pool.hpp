// SPDX-License-Identifier: MIT
// Lexing in parser processes: a pool of persistent workers with limits; a file whose parser
// crashes, runs out of memory or time is measured by the lexical scanner here instead.
#pragma once

#include "gate/lexer/isolation.hpp"
#include "gate/lexer/lex_files.hpp"

#include <functional>
#include <vector>

namespace tollgate::lexer {

// Lex `jobs` in up to `threads` parser processes (started on first use, kept for later calls of
// this process with the same settings) under `settings`' limits, and return one FileFunctions
// per job in the order of `jobs`. A job whose process dies, passes a limit or reports that
// libclang failed is measured by lex_lexically in this process, with a warning that says why, and
// the process is replaced for the next job. `on_done`, when set, is called after each job
// (serialised). Throws Failure when a parser process cannot be started at all.
std::vector<FileFunctions> lex_in_workers(const std::vector<LexJob>& jobs, unsigned threads,
                                          const IsolationSettings& settings,
                                          const std::function<void(const FileFunctions&)>& on_done);

} // namespace tollgate::lexer
