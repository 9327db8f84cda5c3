// SPDX-License-Identifier: MIT
// The tollgate executable: everything happens in run_cli.
#include "gate/cli/run_cli.hpp"

int main(int argc, char** argv) {
    return tollgate::run_cli(argc, argv);
}
