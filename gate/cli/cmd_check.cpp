// SPDX-License-Identifier: MIT
// `tollgate check`: the gate. Measure the functions a change touched, before and after.
#include "gate/baseline/snapshot_file.hpp"
#include "gate/cli/baseline_source.hpp"
#include "gate/cli/commands.hpp"
#include "gate/cli/number_options.hpp"
#include "gate/cli/options.hpp"
#include "gate/cli/policy_source.hpp"
#include "gate/cli/report_targets.hpp"
#include "gate/cli/run_cli.hpp"
#include "gate/cli/snapshot_revision.hpp"
#include "gate/cli/sources.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/progress.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/delta/measure_change.hpp"
#include "gate/java/java_front_end.hpp"
#include "gate/policy/calendar_date.hpp"
#include "gate/policy/judge.hpp"
#include "gate/walker/change_set.hpp"
#include "gate/walker/repository.hpp"
#include "gate/walker/revision_range.hpp"

#include <cstdio>
#include <filesystem>
#include <iostream>
#include <memory>
#include <optional>
#include <spdlog/spdlog.h>
#include <sstream>

namespace tollgate {

namespace {

struct CheckOptions {
    walker::RevisionRange range;      // --base, --head, --worktree, --default-branch
    std::string policy_path;          // --policy
    std::string baseline_path;        // --baseline
    bool update_baseline = false;     // --update-baseline
    std::vector<std::string> reports; // --report FORMAT:PATH
    bool no_colour = false;           // --no-color
    bool wide = false;                // -w, --wide
    bool verbose = false;             // the global --verbose: diagnostics listed on stderr
    std::string link_template;        // --link-template
    std::size_t markdown_rows = 10;   // --markdown-rows
    unsigned jobs = 0;                // --jobs
    IsolationOptions isolation;       // --parse-timeout, --parse-memory
    std::string compile_commands;     // --compile-commands
    std::string cache_dir;            // --cache-dir
    bool no_cache = false;            // --no-pch-cache
    double stroud = 18.0;             // --stroud
    std::size_t rename_limit = 400;   // --rename-limit
    std::string progress = "auto";    // --progress
    std::uint64_t max_file_size = k_default_max_file_size; // --max-file-size
    std::vector<std::string> include_dirs;                 // --include-dir
};

// After a passing run, write the head's snapshot where the baseline lives: --baseline, else the
// policy's baseline.path in the working tree (the pipeline on the main branch keeps it from
// there). A check reads the policy's path from the base commit, never from the working tree.
void update_baseline(const CheckOptions& options, const policy::Verdict& verdict,
                     const walker::ResolvedRange& range, const policy::Policy& judging,
                     const walker::Repository& repository) {
    if (verdict.outcome != policy::Outcome::pass) {
        std::fprintf(stderr, "tollgate: the baseline was not updated: the change is blocked\n");
        return;
    }
    if (range.head_source == walker::HeadSource::worktree) {
        throw UsageError("--update-baseline needs a head commit (the working tree is not one)");
    }
    std::string path = options.baseline_path;
    if (path.empty()) {
        if (repository.is_bare()) {
            throw UsageError("a bare repository has no working tree for the baseline (give "
                             "--baseline PATH)");
        }
        path = baseline::confine_to_repository(judging.baseline.path.empty()
                                                   ? baseline::k_default_snapshot_path
                                                   : judging.baseline.path,
                                               repository.workdir());
    }
    SnapshotRequest request;
    request.commit = range.head.hex;
    request.compile_commands = options.compile_commands;
    request.cache_dir = options.cache_dir;
    request.no_cache = options.no_cache;
    request.include_dirs = options.include_dirs;
    request.jobs = options.jobs;
    request.stroud = options.stroud;
    request.max_file_size = options.max_file_size;
    const SnapshotResult result = snapshot_revision(request);
    baseline::save_snapshot(result.snapshot, path);
    std::fprintf(stderr, "tollgate: baseline updated: %s (%zu functions of %s)\n",
                 text::terminal_text(path).c_str(), result.snapshot.functions.size(),
                 range.head.short_hex().c_str());
}

int run_check(const CheckOptions& options) {
    apply_isolation_options(options.isolation);
    const auto targets = parse_report_targets(options.reports);
    const auto repository = walker::Repository::open(std::filesystem::current_path().string());

    walker::ChangeOptions change_options;
    change_options.rename_limit = options.rename_limit;
    change_options.max_file_size = options.max_file_size;
    delta::MeasureChangeSettings settings;
    settings.measures.stroud = options.stroud;
    settings.jobs = options.jobs;
    settings.compile_commands_json =
        read_compile_commands(options.compile_commands, repository.workdir());
    settings.compile_commands_root = repository.workdir();
    settings.compile_commands_origin = options.compile_commands.empty()
                                           ? lexer::DatabaseOrigin::found
                                           : lexer::DatabaseOrigin::given;
    settings.cache_dir = resolve_cache_dir(options.no_cache, options.cache_dir);
    settings.include_dirs = resolve_include_dirs(options.include_dirs, repository.workdir());

    const walker::ResolvedRange range = walker::resolve_range(repository, options.range);
    const SelectedPolicy selected = select_policy(repository, range, options.policy_path);
    policy::JudgeOptions judge_options;
    judge_options.today = policy::current_date();
    judge_options.policy_origin = selected.origin;

    CheckBaseline baseline(options.baseline_path, selected.policy, repository, range, settings);

    // A report that cannot be written fails now, not after the parsing.
    check_report_targets(targets);
    const walker::ChangeSet changes = walker::collect_changes(repository, range, change_options);
    const ProgressMode progress_mode = parse_progress_mode(options.progress);
    ProgressMeter progress("check", "file sides", progress_mode,
                           progress_style(progress_mode, stderr_is_terminal()), std::cerr,
                           progress_interval_seconds());
    settings.on_progress = [&progress](std::size_t done, std::size_t total) {
        progress.update(done, total);
    };
    delta::ChangeReport report = delta::measure_change(repository, changes, settings);
    progress.finish();
    baseline.apply(range, report, judge_options);
    policy::Verdict verdict = policy::judge(selected.policy, report, judge_options);
    verdict.policy_changes = selected.changes;
    verdict.policy_change_summary = selected.change_summary;

    report::RenderOptions render;
    render.link_template = options.link_template;
    render.markdown_rows = options.markdown_rows;
    render.fit = options.wide ? report::Fit::wide : report::Fit::to_width;
    if (options.verbose) {
        report::write_diagnostics_text(std::cerr, report); // never after the verdict on stdout
    }
    write_reports(report, verdict, selected.policy, targets, render, options.no_colour);
    if (options.update_baseline) {
        update_baseline(options, verdict, range, selected.policy, repository);
    }
    return verdict.outcome == policy::Outcome::blocked ? static_cast<int>(ExitCode::blocked)
                                                       : static_cast<int>(ExitCode::pass);
}

} // namespace

void attach_check(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected) {
    auto options = std::make_shared<CheckOptions>();
    sub.description(
        "Gate a change: find the C/C++ functions touched between a base and a head commit, "
        "measure each on both sides, report the deltas (largest growth first) and judge them "
        "with the team's policy. Exit 0 pass, 1 blocked, 2 usage or policy error, 3 failure.");
    sub.add_option("--base", options->range.base,
                   "Base revision (default: the merge base of head and the default branch)");
    sub.add_option("--head", options->range.head, "Head revision")->capture_default_str();
    sub.add_flag("--worktree", options->range.worktree,
                 "Compare the working tree (staged, unstaged and untracked files) with HEAD, or "
                 "with --base");
    sub.add_option("--default-branch", options->range.default_branch,
                   "Branch whose merge base with head is the default base (default: the remote's "
                   "HEAD, else main, else master)");
    sub.add_option("--policy", options->policy_path,
                   "Policy file that judges the change (default: .tollgate.yaml of the base "
                   "commit, else the built-in policy; see \"tollgate policy --default\")");
    sub.add_option("--baseline", options->baseline_path,
                   "Baseline snapshot kept by the pipeline (default: the policy's baseline.path "
                   "as the base commit has it); functions already above a ceiling in it are "
                   "grandfathered, and one of the base commit is checked against the parsed "
                   "base");
    sub.add_flag("--update-baseline", options->update_baseline,
                 "After a passing run, write the head commit's snapshot to the baseline path");
    sub.add_option("--report", options->reports,
                   "FORMAT:PATH, repeatable; FORMAT is text, markdown, json or sarif; PATH \"-\" "
                   "is stdout (default: the terminal table on stdout)");
    sub.add_flag("--no-color", options->no_colour,
                 "Never colour the terminal table (colour is used on a terminal unless NO_COLOR "
                 "is set)");
    sub.add_flag("-w,--wide", options->wide,
                 "Show every column and whole names in the terminal table (default: fit the "
                 "terminal's width, or 100 columns when not a terminal)");
    sub.add_option("--link-template", options->link_template,
                   "Link file:line cells of the Markdown table, e.g. "
                   "\"https://git.example/team/repo/blob/{commit}/{path}#L{line}\"");
    sub.add_option("--markdown-rows", options->markdown_rows,
                   "Rows of the Markdown table shown before the rest is folded")
        ->check(whole_number(0, 100000))
        ->capture_default_str();
    add_jobs_option(sub, options->jobs);
    add_isolation_options(sub, options->isolation);
    sub.add_option("--compile-commands", options->compile_commands,
                   "compile_commands.json to take -D/-I/-std flags from (default: the "
                   "repository's own, at its root or in build/)");
    sub.add_option("--cache-dir", options->cache_dir,
                   "Folder for the precompiled standard-library headers");
    sub.add_flag("--no-pch-cache", options->no_cache,
                 "Parse without the precompiled standard-library headers");
    add_include_dir_option(sub, options->include_dirs);
    add_stroud_option(sub, options->stroud);
    add_progress_option(sub, options->progress);
    add_rename_limit_option(sub, options->rename_limit);
    add_max_file_size_option(sub, options->max_file_size);
    sub.footer("Examples:\n"
               "  tollgate check                                  this branch against its merge "
               "base with main\n"
               "  tollgate check --base origin/main --head HEAD --report markdown:delta.md\n"
               "  tollgate check --worktree                       uncommitted edits against "
               "HEAD\n"
               "  tollgate check --base v1.4 --report json:check.json --report text:-");
    sub.callback([options, &global, &selected] {
        selected = [options, &global] {
            options->verbose = global.verbose;
            return run_check(*options);
        };
    });
}

} // namespace tollgate
