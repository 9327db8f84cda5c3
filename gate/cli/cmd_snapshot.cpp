// SPDX-License-Identifier: MIT
// `tollgate snapshot`: write a baseline snapshot of a revision, or compare two snapshots.
#include "gate/baseline/snapshot.hpp"
#include "gate/baseline/snapshot_file.hpp"
#include "gate/baseline/snapshot_shard.hpp"
#include "gate/baseline/snapshot_trend.hpp"
#include "gate/cli/commands.hpp"
#include "gate/cli/number_options.hpp"
#include "gate/cli/options.hpp"
#include "gate/cli/snapshot_revision.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/output_file.hpp"
#include "gate/common/progress.hpp"
#include "gate/common/shard_spec.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/policy/policy.hpp"
#include "gate/walker/repository.hpp"
#include "tollgate/core/convention.hpp"

#include <filesystem>
#include <fmt/format.h>
#include <iostream>
#include <map>
#include <memory>
#include <optional>
#include <spdlog/spdlog.h>

namespace fs = std::filesystem;

namespace tollgate {

namespace {

struct SnapshotOptions {
    std::string revision = "HEAD";    // --rev
    std::string out;                  // --out, as given on the command line
    bool force = false;               // --force: replace a file that is not a snapshot
    unsigned jobs = 0;                // parser threads, 0 = all cores
    IsolationOptions isolation;       // --parse-timeout, --parse-memory
    double stroud = 18.0;             // Stroud number for T
    std::string compile_commands;     // --compile-commands
    std::string cache_dir;            // --cache-dir
    bool no_cache = false;            // --no-pch-cache
    std::vector<std::string> compare; // --compare BASE HEAD
    std::string format = "text";      // text or json, for --compare
    std::size_t top = 10;             // grown functions listed by --compare
    std::string shard;                // --shard K/N
    std::vector<std::string> merge;   // --merge PART...
    std::string progress = "auto";    // --progress
    std::uint64_t max_file_size = k_default_max_file_size; // --max-file-size
    std::vector<std::string> include_dirs;                 // --include-dir
    // Where the snapshot goes without --out and without a baseline.path in the revision's
    // policy, relative to the repository root. Always confined to the repository.
    std::string configured_path = baseline::k_default_snapshot_path;
};

// Return `absolute` relative to the current folder when it lies under it, else as it is.
std::string display_path(const fs::path& absolute) {
    const fs::path relative = absolute.lexically_relative(fs::current_path());
    if (relative.empty() || *relative.begin() == "..") {
        return absolute.string();
    }
    return relative.string();
}

// The options besides commit, convention and Stroud number that decide a snapshot's functions;
// every shard of one run must agree on them.
std::map<std::string, std::string> snapshot_identity(const SnapshotOptions& options) {
    std::string include_dirs;
    for (const auto& folder : options.include_dirs) {
        include_dirs += (include_dirs.empty() ? "" : "\n") + folder;
    }
    return {{"compile-commands", options.compile_commands},
            {"include-dir", include_dirs},
            {"max-file-size", std::to_string(options.max_file_size)}};
}

// snapshot --merge: the parts joined into the snapshot one run writes.
int run_snapshot_merge(const SnapshotOptions& options) {
    if (options.out.empty()) {
        throw UsageError("--merge writes the joined snapshot to a file: give it with --out PATH");
    }
    const baseline::Overwrite overwrite =
        options.force ? baseline::Overwrite::anything : baseline::Overwrite::snapshots_only;
    check_writable("snapshot", options.out);
    baseline::check_replaceable(options.out, overwrite);
    std::vector<baseline::SnapshotPart> parts;
    std::size_t files = 0;
    for (const auto& path : options.merge) {
        parts.push_back(baseline::load_snapshot_part(path));
        files += parts.back().files;
    }
    const baseline::Snapshot snapshot = baseline::merge_snapshot_parts(
        std::move(parts), options.merge, baseline::current_utc_time());
    baseline::save_snapshot(snapshot, options.out, overwrite);
    std::cerr << fmt::format("tollgate: wrote {}: {} functions in {} files of commit {}, from {} "
                             "parts\n",
                             text::terminal_text(options.out), snapshot.functions.size(), files,
                             snapshot.commit.substr(0, 7), options.merge.size());
    return 0;
}

int run_snapshot(const SnapshotOptions& options) {
    apply_isolation_options(options.isolation);
    if (!options.merge.empty()) {
        return run_snapshot_merge(options);
    }
    std::optional<ShardSpec> shard;
    if (!options.shard.empty()) {
        shard = parse_shard_spec(options.shard, "--shard");
        if (options.out.empty()) {
            throw UsageError("--shard writes a part, not a snapshot: give its file with --out "
                             "PATH");
        }
    }
    const walker::Repository repository = walker::Repository::open(fs::current_path().string());
    const walker::ObjectId commit = repository.resolve_commit(options.revision);
    // The measured revision's policy may say where its baseline lives.
    std::string configured_path = options.configured_path;
    if (const auto file = repository.read_file(commit, policy::k_default_policy_path)) {
        const auto team_policy =
            policy::load_policy(file->content, std::string(policy::k_default_policy_path) + " at " +
                                                   commit.short_hex());
        if (!team_policy.baseline.path.empty()) {
            configured_path = team_policy.baseline.path;
        }
    }

    std::string out_path = options.out;
    if (out_path.empty()) {
        if (repository.is_bare()) {
            throw UsageError("a bare repository has no working tree to hold \"" + configured_path +
                             "\" (give the file with --out PATH)");
        }
        out_path =
            display_path(baseline::confine_to_repository(configured_path, repository.workdir()));
    }
    const baseline::Overwrite overwrite =
        options.force ? baseline::Overwrite::anything : baseline::Overwrite::snapshots_only;
    // Refuse before the expensive part, not after (a part replaces whatever is there).
    check_writable("snapshot", out_path);
    if (!shard) {
        baseline::check_replaceable(out_path, overwrite);
    }

    SnapshotRequest request;
    request.commit = commit.hex;
    request.compile_commands = options.compile_commands;
    request.cache_dir = options.cache_dir;
    request.no_cache = options.no_cache;
    request.include_dirs = options.include_dirs;
    request.jobs = options.jobs;
    request.stroud = options.stroud;
    request.shard = shard;
    const ProgressMode progress_mode = parse_progress_mode(options.progress);
    ProgressMeter progress("snapshot", "files", progress_mode,
                           progress_style(progress_mode, stderr_is_terminal()), std::cerr,
                           progress_interval_seconds());
    request.on_progress = [&progress](std::size_t done, std::size_t total) {
        progress.update(done, total);
    };

    request.max_file_size = options.max_file_size;
    const SnapshotResult measured = snapshot_revision(request);
    progress.finish();
    const baseline::Snapshot& snapshot = measured.snapshot;
    if (shard) {
        baseline::save_snapshot_part({*shard, measured.files, snapshot, snapshot_identity(options)},
                                     out_path);
        std::cerr << fmt::format("tollgate: wrote part {} of commit {} to {}: {} functions in {} "
                                 "files\n",
                                 shard->text(), commit.short_hex(), text::terminal_text(out_path),
                                 snapshot.functions.size(), measured.files);
        return 0;
    }
    baseline::save_snapshot(snapshot, out_path, overwrite);

    const std::size_t warnings = measured.warnings;
    std::cerr << fmt::format("tollgate: wrote {}: {} functions in {} files of commit {}{}\n",
                             text::terminal_text(out_path), snapshot.functions.size(),
                             measured.files, commit.short_hex(),
                             warnings == 0 ? std::string()
                                           : fmt::format(" ({} parse warnings: tollgate measure "
                                                         "--rev {} shows them)",
                                                         warnings, commit.short_hex()));
    for (const auto& file : measured.oversized) {
        std::cerr << fmt::format("tollgate: skipped {} ({})\n", file.path,
                                 oversized_reason(file.size, options.max_file_size));
    }
    return 0;
}

int run_compare(const SnapshotOptions& options) {
    // The two snapshots must share one convention, whichever: a build that measures Java can
    // still compare two snapshots made before it did.
    baseline::SnapshotExpectations expectations;
    expectations.stroud = options.stroud;
    const baseline::Snapshot base = baseline::load_snapshot(options.compare.at(0), expectations);
    expectations.convention = base.convention;
    const baseline::Snapshot head = baseline::load_snapshot(options.compare.at(1), expectations);
    const baseline::SnapshotTrend trend = baseline::compare_snapshots(base, head);
    if (options.format == "json") {
        baseline::write_trend_json(std::cout, trend, options.top);
    } else {
        baseline::write_trend_text(std::cout, trend, options.top);
    }
    return 0;
}

} // namespace

void attach_snapshot(CLI::App& sub, const GlobalOptions& /*global*/,
                     std::function<int()>& selected) {
    auto options = std::make_shared<SnapshotOptions>();
    sub.description(
        "Measure every function of every C, C++ and Java file of a revision and write a "
        "baseline snapshot, or compare two snapshots.");
    auto* rev = sub.add_option("--rev", options->revision,
                               "Revision to measure, read from the object database")
                    ->capture_default_str();
    auto* out = sub.add_option(
        "--out", options->out,
        "Snapshot file to write (default: " + std::string(baseline::k_default_snapshot_path) +
            " in the repository)");
    auto* force = sub.add_flag("--force", options->force,
                               "Replace the output file even when it is not a Tollgate snapshot");
    add_jobs_option(sub, options->jobs);
    add_isolation_options(sub, options->isolation);
    add_stroud_option(sub, options->stroud);
    add_progress_option(sub, options->progress);
    sub.add_option("--compile-commands", options->compile_commands,
                   "compile_commands.json to take -D/-I/-std flags from (default: the "
                   "repository's own, if any, at its root or in build/)");
    sub.add_option("--cache-dir", options->cache_dir,
                   "Folder for the precompiled standard-library headers (default: "
                   "$XDG_CACHE_HOME/tollgate or ~/.cache/tollgate)");
    sub.add_flag("--no-pch-cache", options->no_cache,
                 "Parse without the precompiled standard-library headers");
    add_include_dir_option(sub, options->include_dirs);
    auto* compare = sub.add_option("--compare", options->compare,
                                   "Compare two snapshot files, BASE then HEAD, instead of "
                                   "writing one")
                        ->expected(2)
                        ->type_name("BASE HEAD");
    compare->excludes(rev)->excludes(out)->excludes(force);
    auto* shard = sub.add_option("--shard", options->shard,
                                 "Measure only the files of the K-th of N shards (by a digest of "
                                 "the path) and write a part to --out for --merge")
                      ->type_name("K/N")
                      ->excludes(compare);
    sub.add_option("--merge", options->merge,
                   "Join the parts of every shard into the snapshot one whole run writes, to "
                   "--out (no repository needed)")
        ->type_name("PART...")
        ->excludes(shard)
        ->excludes(compare)
        ->excludes(rev)
        // The parts' own values decide these; a merge that took them would only seem to.
        ->excludes(sub.get_option("--stroud"))
        ->excludes(sub.get_option("--compile-commands"))
        ->excludes(sub.get_option("--include-dir"));
    sub.add_option("--format", options->format, "Output format of --compare")
        ->check(CLI::IsMember({"text", "json"}))
        ->capture_default_str();
    sub.add_option("--top", options->top, "Grown functions --compare lists")
        ->check(whole_number(0, 100000))
        ->capture_default_str();
    add_max_file_size_option(sub, options->max_file_size);
    sub.footer("Examples:\n"
               "  tollgate snapshot                          HEAD into baselines/snapshot.json\n"
               "  tollgate snapshot --rev v1.2 --out v1.2.json\n"
               "  tollgate snapshot --compare v1.2.json baselines/snapshot.json\n"
               "  tollgate snapshot --shard 1/3 --out part-1.json   one of three CI jobs\n"
               "  tollgate snapshot --merge part-*.json --out baselines/snapshot.json");
    sub.callback([options, &selected] {
        selected = [options] {
            return options->compare.empty() ? run_snapshot(*options) : run_compare(*options);
        };
    });
}

} // namespace tollgate
