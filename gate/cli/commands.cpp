// SPDX-License-Identifier: MIT
// The table of commands.
#include "gate/cli/commands.hpp"

namespace tollgate {

const std::vector<CommandEntry>& command_table() {
    static const std::vector<CommandEntry> table = {
        {"check", "Gate a change: measure the functions it touched, before and after",
         &attach_check},
        {"measure", "Per-function Halstead measures of files or a whole tree at a revision",
         &attach_measure},
        {"explain", "Operator and operand tables of one function, and its measures",
         &attach_explain},
        {"snapshot", "Write a baseline snapshot of a revision, or compare two snapshots",
         &attach_snapshot},
        {"calibrate", "Replay history: delta distributions, what-if a policy, suggest limits",
         &attach_calibrate},
        {"annotate", "Keep one comment with the report on the pull/merge request",
         &attach_annotate},
        {"hook", "Install or remove the pre-push hook, or run it", &attach_hook},
        {"policy", "Validate a policy file and print the effective policy", &attach_policy},
    };
    return table;
}

} // namespace tollgate
