// SPDX-License-Identifier: MIT
// Lex many files in parallel, in parser processes with limits (see isolation.hpp), with
// deterministic results.
#pragma once

#include "gate/common/source.hpp"
#include "gate/lexer/lexer.hpp"

#include <functional>
#include <vector>

namespace tollgate::lexer {

// One file to lex with the context of its revision.
struct LexJob {
    const SourceFile* file = nullptr;      // the file (not owned)
    const ParseContext* context = nullptr; // its revision's headers and flags (not owned)
};

// Lex every job of `jobs_list` on `jobs` parser processes (0 = all cores) and return one
// FileFunctions per job, in the order of `jobs_list`: the same result for any `jobs`. A file the
// parser stops on (crash, memory, time) is measured lexically with a warning (see lex_pool.hpp).
// With isolation switched off (current_isolation().in_process) the files are parsed on threads
// of this process instead. Throws Failure when no parser process can be started.
std::vector<FileFunctions> lex_jobs(const std::vector<LexJob>& jobs_list, unsigned jobs = 0,
                                    const std::function<void(const FileFunctions&)>& on_done = {});

// Lex every file of `files` with the shared `context` on `jobs` threads (0 = all cores) and
// return one FileFunctions per file, in the order of `files`: the same result for any `jobs`.
// `on_done`, when set, is called (from worker threads, serialised) after each file.
std::vector<FileFunctions> lex_files(const std::vector<SourceFile>& files,
                                     const ParseContext& context, unsigned jobs = 0,
                                     const std::function<void(const FileFunctions&)>& on_done = {});

// Return the number of threads `jobs` stands for (0 = the machine's cores, at least 1).
unsigned effective_jobs(unsigned jobs);

} // namespace tollgate::lexer
