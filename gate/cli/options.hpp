// SPDX-License-Identifier: MIT
// Command-line options that several commands share.
#pragma once

#include "gate/cli/sources.hpp"

#include <CLI/CLI.hpp>
#include <string>
#include <vector>

namespace tollgate {

// The options that pick sources (`--rev`, paths, `--compile-commands`, cache, `--lang`).
struct SourceOptions {
    std::string revision;                  // --rev
    std::vector<std::string> paths;        // positional
    std::string compile_commands;          // --compile-commands
    std::string cache_dir;                 // --cache-dir
    bool no_cache = false;                 // --no-pch-cache
    std::string language;                  // --lang c|c++ (empty: by extension)
    std::vector<std::string> include_dirs; // --include-dir, repeatable
};

// Add the source options to `sub`; `paths_help` describes the positional paths.
void add_source_options(CLI::App& sub, SourceOptions& options, const std::string& paths_help);

// Add `--include-dir DIR` (repeatable) bound to `folders`.
void add_include_dir_option(CLI::App& sub, std::vector<std::string>& folders);

// Add `--stroud S` (the Stroud number for T = E / S, 1 to 100) bound to `stroud`.
void add_stroud_option(CLI::App& sub, double& stroud);

// Add `-j,--jobs N` (parser threads, 0 = all cores) bound to `jobs`.
void add_jobs_option(CLI::App& sub, unsigned& jobs);

// Turn parsed source options into a request for load_sources.
SourceRequest to_request(const SourceOptions& options);

} // namespace tollgate
