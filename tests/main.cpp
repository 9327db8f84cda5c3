// SPDX-License-Identifier: MIT
// Catch2's main for the whole test suite. Commands lex in parser processes, which are the real
// tollgate executable run with its hidden worker subcommand: point the pool at it.
#define CATCH_CONFIG_RUNNER
#include "gate/lexer/isolation.hpp"

#include <catch2/catch.hpp>

int main(int argc, char** argv) {
    tollgate::lexer::IsolationSettings settings = tollgate::lexer::current_isolation();
    settings.worker_program = TOLLGATE_BINARY;
    tollgate::lexer::set_isolation(settings);
    return Catch::Session().run(argc, argv);
}
