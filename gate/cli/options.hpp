// SPDX-License-Identifier: MIT
// Command-line options that several commands share.
#pragma once

#include "gate/cli/sources.hpp"

#include <CLI/CLI.hpp>
#include <cstddef>
#include <cstdint>
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

// The limits of the parser processes (`--parse-timeout`, `--parse-memory`).
struct IsolationOptions {
    unsigned parse_timeout = 60;       // --parse-timeout: processor seconds per file
    std::uint64_t parse_memory = 4096; // --parse-memory: MiB of address space per parser process
};

// Add `--parse-timeout SECONDS` and `--parse-memory MIB` to `sub`, bound to `options`.
void add_isolation_options(CLI::App& sub, IsolationOptions& options);

// Use `options` for the parser processes of this run.
void apply_isolation_options(const IsolationOptions& options);

// Add `--stroud S` (the Stroud number for T = E / S, a finite number from 1 to 100) bound to
// `stroud`.
void add_stroud_option(CLI::App& sub, double& stroud);

// Add `--progress auto|always|never` (progress on stderr, see ProgressMode) bound to `mode`.
void add_progress_option(CLI::App& sub, std::string& mode);

// Add `-j,--jobs N` (parser processes, 0 = all cores, at most k_max_jobs) bound to `jobs`.
void add_jobs_option(CLI::App& sub, unsigned& jobs);

// Add `--max-file-size SIZE` (bytes, or a number with K, M or G; 0 = no limit; default
// k_default_max_file_size) bound to `bytes`: files larger than this are listed, never read.
void add_max_file_size_option(CLI::App& sub, std::uint64_t& bytes);

// Add `--rename-limit N` (candidates compared per added file, 0 to 100000) bound to `limit`.
void add_rename_limit_option(CLI::App& sub, std::size_t& limit);

// Turn parsed source options into a request for load_sources.
SourceRequest to_request(const SourceOptions& options);

} // namespace tollgate
