// SPDX-License-Identifier: MIT
// Child processes for the pre-push hook: git queries and the tollgate binary itself.
#pragma once

#include <string>
#include <vector>

namespace tollgate::hook {

// What a child process left behind.
struct ProcessResult {
    int exit_code = -1; // its exit status; 128 + signal number when a signal ended it
    std::string out;    // its standard output, when captured
};

// Where a child's standard output goes.
enum class Output {
    capture,   // read into ProcessResult::out; standard error is discarded
    inherit,   // shared with our standard output
    to_stderr, // sent to our standard error
};

// Run `argv` (argv[0] searched on PATH) in the current folder with standard input from /dev/null
// and standard error shared with ours (discarded when capturing: a failed query is an answer).
// Throws Failure when the program cannot be started.
ProcessResult run_process(const std::vector<std::string>& argv, Output output);

// Return the absolute path of the running executable (from /proc/self/exe). Throws Failure when
// the link cannot be read.
std::string self_executable();

} // namespace tollgate::hook
