// SPDX-License-Identifier: MIT
// Shared command-line options.
#include "gate/cli/options.hpp"

#include "gate/cli/number_options.hpp"
#include "gate/lexer/isolation.hpp"

namespace tollgate {

void add_source_options(CLI::App& sub, SourceOptions& options, const std::string& paths_help) {
    sub.add_option("--rev", options.revision,
                   "Read sources at this git revision from the object database (default: the "
                   "working tree)");
    if (!paths_help.empty()) {
        sub.add_option("paths", options.paths, paths_help);
    }
    sub.add_option("--compile-commands", options.compile_commands,
                   "compile_commands.json to take -D/-I/-std flags from (default: the "
                   "repository's own, if any, at its root or in build/)");
    sub.add_option("--cache-dir", options.cache_dir,
                   "Folder for the precompiled standard-library headers (default: "
                   "$XDG_CACHE_HOME/tollgate or ~/.cache/tollgate)");
    sub.add_flag("--no-pch-cache", options.no_cache,
                 "Parse without the precompiled standard-library headers");
    sub.add_option("--lang", options.language,
                   "Parse every file as this language instead of by extension")
        ->check(CLI::IsMember({"c", "c++"}));
    add_include_dir_option(sub, options.include_dirs);
}

void add_include_dir_option(CLI::App& sub, std::vector<std::string>& folders) {
    sub.add_option("--include-dir", folders,
                   "Include folder for files the compile database does not cover (repeatable; a "
                   "folder inside the repository is read at the measured revision)");
}

void add_isolation_options(CLI::App& sub, IsolationOptions& options) {
    sub.add_option("--parse-timeout", options.parse_timeout,
                   "Processor seconds the parser may spend on one file (twice that of wall-clock "
                   "time); past it the file is measured lexically")
        ->check(whole_number(1, 86400))
        ->capture_default_str();
    sub.add_option("--parse-memory", options.parse_memory,
                   "Address space of each parser process, in MiB; a file that needs more is "
                   "measured lexically")
        ->check(whole_number(512, std::uint64_t{1} << 20))
        ->capture_default_str();
}

void apply_isolation_options(const IsolationOptions& options) {
    lexer::IsolationSettings settings = lexer::current_isolation();
    settings.cpu_seconds = options.parse_timeout;
    settings.memory_mib = options.parse_memory;
    lexer::set_isolation(settings);
}

void add_stroud_option(CLI::App& sub, double& stroud) {
    sub.add_option("--stroud", stroud, "Stroud number S for the time T = E / S")
        ->check(real_number(1.0, 100.0))
        ->capture_default_str();
}

void add_progress_option(CLI::App& sub, std::string& mode) {
    sub.add_option("--progress", mode,
                   "Progress on stderr: auto (a live line on a terminal, else a line every 10 "
                   "seconds), always, never")
        ->capture_default_str();
}

void add_jobs_option(CLI::App& sub, unsigned& jobs) {
    sub.add_option("-j,--jobs", jobs, "Parser processes (0 = all cores)")
        ->check(whole_number(0, k_max_jobs))
        ->capture_default_str();
}

void add_max_file_size_option(CLI::App& sub, std::uint64_t& bytes) {
    sub.add_option(
           "--max-file-size", bytes,
           "Leave C, C++ and Java files larger than SIZE unread and list them as skipped (bytes, "
           "or a number with K, M or G; 0 = no limit)")
        ->transform(byte_size(std::uint64_t{1} << 40))
        ->type_name("SIZE")
        ->default_str(std::to_string(k_default_max_file_size >> 20) + "M");
}

void add_rename_limit_option(CLI::App& sub, std::size_t& limit) {
    sub.add_option("--rename-limit", limit,
                   "Candidates compared per added file when looking for renames")
        ->check(whole_number(0, 100000))
        ->capture_default_str();
}

SourceRequest to_request(const SourceOptions& options) {
    SourceRequest request;
    request.revision = options.revision;
    request.paths = options.paths;
    request.compile_commands = options.compile_commands;
    request.cache_dir = options.cache_dir;
    request.no_cache = options.no_cache;
    request.include_dirs = options.include_dirs;
    if (options.language == "c") {
        request.force_language = lexer::Language::c;
    } else if (options.language == "c++") {
        request.force_language = lexer::Language::cxx;
    }
    return request;
}

} // namespace tollgate
