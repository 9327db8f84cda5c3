// SPDX-License-Identifier: MIT
// How files are parsed: in parser processes with limits (the default), or in this process.
#pragma once

#include <cstdint>
#include <string>

namespace tollgate::lexer {

// The limits of the parser processes, shared by every command that lexes.
struct IsolationSettings {
    bool in_process = false;         // parse in this process with no limits and no file
                                     // confinement (unsafe: a hostile file can crash the run or
                                     // read host files); only for benchmarks and debugging
    unsigned cpu_seconds = 60;       // processor time a file may take; the wall-clock limit is
                                     // twice this
    std::uint64_t memory_mib = 4096; // address space of each parser process, in MiB
    std::string worker_program;      // the executable run as parser process; empty: this one
    bool show_worker_errors = false; // parser processes write their errors to our stderr
    unsigned preamble_units = 0;     // translation units each parser process keeps alive to
                                     // reparse a later version of the same file with its
                                     // precompiled preamble (least recently used dropped
                                     // first); 0 parses every file from scratch
    bool shared_headers = false;     // precompile each file's leading #include lines (but its
                                     // own header) with the standard headers, once per set of
                                     // their contents, in a private folder of the run
                                     // (shared_headers.hpp); the results are the same
    unsigned preamble_homes = 0;     // with preamble_units: how many parser processes the paths
                                     // are spread over; each path is parsed only in its home
                                     // process, the one holding its preamble (a call waits for
                                     // it); 0: any idle process, preferring recent paths
};

// Use `settings` for every later lex_jobs and lex_files call of this process.
void set_isolation(const IsolationSettings& settings);

// Return the settings in use: the last ones set, with in_process forced on when the environment
// variable TOLLGATE_UNSAFE_PARSE_IN_PROCESS is "1".
IsolationSettings current_isolation();

} // namespace tollgate::lexer
