// SPDX-License-Identifier: MIT
// The command line: parse arguments, run one command, map errors to exit codes.
#pragma once

namespace tollgate {

// Exit codes of every command.
enum class ExitCode : int {
    pass = 0,    // the change passes (or the command succeeded)
    blocked = 1, // the policy blocks the change
    usage = 2,   // usage, policy or baseline error: nothing was judged
    failure = 3, // repository or parsing failure, or a bug
};

// Run the tollgate command line and return the process exit code.
int run_cli(int argc, char** argv);

} // namespace tollgate
