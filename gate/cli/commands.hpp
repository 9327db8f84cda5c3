// SPDX-License-Identifier: MIT
// The table of commands: each command attaches its options and its handler to a CLI11 subcommand.
#pragma once

#include <CLI/CLI.hpp>
#include <functional>
#include <string>
#include <vector>

namespace tollgate {

// Options every command shares.
struct GlobalOptions {
    bool verbose = false;                 // log stage by stage on stderr
    std::vector<std::string> directories; // -C DIR, in order: run as if started there
};

// One command of the table.
struct CommandEntry {
    const char* name;    // e.g. "measure"
    const char* summary; // one line for "tollgate --help"
    // Add options to `sub` and, when the command is chosen, set `selected` to its handler.
    void (*attach)(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected);
};

// Return every command, in the order "tollgate --help" lists them.
const std::vector<CommandEntry>& command_table();

// Attach functions, one per command file.
void attach_check(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected);
void attach_measure(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected);
void attach_explain(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected);
void attach_policy(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected);
void attach_snapshot(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected);
void attach_calibrate(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected);
void attach_annotate(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected);
void attach_hook(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected);

} // namespace tollgate
