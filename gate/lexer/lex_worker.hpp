// SPDX-License-Identifier: MIT
// The parser process: the tollgate executable run with a hidden subcommand, lexing the files its
// parent sends under limits and with its file access confined.
#pragma once

namespace tollgate::lexer {

// The hidden subcommand that makes tollgate a parser process (left out of --help on purpose).
inline constexpr const char* k_worker_command = "__lex-worker";

// Run as a parser process on the socket at isolate::k_worker_socket_fd, with `argv` =
// {program, k_worker_command, "--memory-mib", N, ["--verbose"]}: limit the address space to N MiB,
// stop core files, move to "/", confine file access to the system include folders (plus, per
// job, the context's cache and trusted folders), then answer context and job messages until the
// parent closes the socket. Return the exit status: 0 at the end of input,
// isolate::k_exit_cannot_start when the limits or the confinement cannot be set up. An allocation
// that fails ends the process with isolate::k_exit_out_of_memory.
int run_lex_worker(int argc, char** argv);

} // namespace tollgate::lexer
