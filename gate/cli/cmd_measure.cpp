// SPDX-License-Identifier: MIT
// Placeholder for tollgate measure.
#include "gate/cli/commands.hpp"
namespace tollgate {
void attach_measure(CLI::App&, const GlobalOptions&, std::function<int()>&) {}
void attach_explain(CLI::App&, const GlobalOptions&, std::function<int()>&) {}
}
