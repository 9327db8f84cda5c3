// SPDX-License-Identifier: MIT
// `tollgate calibrate`: replay history, show delta distributions, what-if a policy, suggest one.
#include "gate/calibrate/block_rate.hpp"
#include "gate/calibrate/calibration_report.hpp"
#include "gate/calibrate/calibration_scope.hpp"
#include "gate/calibrate/distribution.hpp"
#include "gate/calibrate/lex_file_cache.hpp"
#include "gate/calibrate/replay.hpp"
#include "gate/calibrate/shard_replay.hpp"
#include "gate/calibrate/suggested_policy.hpp"
#include "gate/cli/commands.hpp"
#include "gate/cli/number_options.hpp"
#include "gate/cli/options.hpp"
#include "gate/cli/run_cli.hpp"
#include "gate/cli/sources.hpp"
#include "gate/common/byte_size.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/output_file.hpp"
#include "gate/common/progress.hpp"
#include "gate/common/shard_spec.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/java/java_front_end.hpp"
#include "gate/lexer/isolation.hpp"
#include "gate/lexer/lex_files.hpp"
#include "gate/policy/calendar_date.hpp"
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "gate/walker/history.hpp"
#include "gate/walker/repository.hpp"

#include <algorithm>
#include <atomic>
#include <chrono>
#include <csignal>
#include <cstdlib>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <iostream>
#include <memory>
#include <optional>
#include <spdlog/spdlog.h>
#include <sstream>
#include <unistd.h>

namespace tollgate {

namespace {

struct CalibrateOptions {
    std::string range;                                     // --range A..B
    std::string default_branch;                            // --default-branch
    std::size_t max_commits = 300;                         // --max-commits
    std::string since;                                     // --since YYYY-MM-DD
    std::vector<std::string> measures;                     // --measure, repeatable
    std::string policy_path;                               // --policy
    std::optional<double> suggest;                         // --suggest P
    std::optional<double> block_rate;                      // --suggest-block-rate P
    std::optional<double> warning_rate;                    // --suggest-warning-rate P
    bool keep_vendored = false;                            // --keep-vendored
    std::string progress = "auto";                         // --progress auto|always|never
    std::string out;                                       // --out PATH
    std::string format = "text";                           // --format text|json
    std::string html;                                      // --html PATH
    unsigned jobs = 0;                                     // --jobs
    IsolationOptions isolation;                            // --parse-timeout, --parse-memory
    std::string cache_dir;                                 // --cache-dir
    std::string compile_commands;                          // --compile-commands
    bool no_pch_cache = false;                             // --no-pch-cache
    double stroud = 18.0;                                  // --stroud
    std::size_t rename_limit = 400;                        // --rename-limit
    std::uint64_t max_file_size = k_default_max_file_size; // --max-file-size
    unsigned preamble_units = 0;                           // --preamble-units
    bool no_shared_headers = false;                        // --no-shared-headers
    std::string shard;                                     // --shard K/N
    std::vector<std::string> merge;                        // --merge PART...
    std::uint64_t cache_max_size = calibrate::k_default_cache_bytes; // --cache-max-size
    unsigned cache_max_age = calibrate::k_default_cache_days;        // --cache-max-age
};

// Raised by SIGINT; the replay's workers take no new commit once it is set.
std::atomic<bool> g_stop{false};
static_assert(std::atomic<bool>::is_always_lock_free, "the signal handler needs a lock-free flag");

extern "C" void on_interrupt(int /*signal*/) {
    g_stop.store(true);
}

// Installs the SIGINT handler for its lifetime and puts the previous one back.
class InterruptGuard {
public:
    InterruptGuard() {
        g_stop.store(false);
        m_previous = std::signal(SIGINT, on_interrupt);
    }
    ~InterruptGuard() { std::signal(SIGINT, m_previous == SIG_ERR ? SIG_DFL : m_previous); }
    InterruptGuard(const InterruptGuard&) = delete;
    InterruptGuard& operator=(const InterruptGuard&) = delete;

private:
    void (*m_previous)(int) = SIG_DFL;
};

// Days since 1970-01-01 of a proleptic Gregorian date (the civil-from-days inverse).
std::int64_t days_from_civil(int y, unsigned m, unsigned d) {
    y -= m <= 2 ? 1 : 0;
    const int era = (y >= 0 ? y : y - 399) / 400;
    const auto yoe = static_cast<unsigned>(y - era * 400);
    const unsigned doy = (153 * (m > 2 ? m - 3 : m + 9) + 2) / 5 + d - 1;
    const unsigned doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    return static_cast<std::int64_t>(era) * 146097 + static_cast<std::int64_t>(doe) - 719468;
}

std::int64_t parse_since(const std::string& text) {
    if (!policy::is_calendar_date(text)) {
        throw UsageError("--since \"" + text +
                         "\" is not a date (give YYYY-MM-DD, e.g. "
                         "\"2024-01-31\")");
    }
    const int year = std::stoi(text.substr(0, 4));
    const auto month = static_cast<unsigned>(std::stoi(text.substr(5, 2)));
    const auto day = static_cast<unsigned>(std::stoi(text.substr(8, 2)));
    return days_from_civil(year, month, day) * 86400;
}

std::vector<core::MeasureId> parse_measures(const std::vector<std::string>& names) {
    if (names.empty()) {
        return {core::MeasureId::volume, core::MeasureId::difficulty, core::MeasureId::effort};
    }
    std::vector<std::string> known;
    for (const auto id : core::k_all_measures) {
        known.emplace_back(core::measure_name(id));
    }
    std::vector<core::MeasureId> out;
    for (const auto& name : names) {
        const auto id = core::parse_measure_name(name);
        if (!id) {
            const std::string near = closest_match(name, known);
            throw UsageError("unknown measure \"" + name + "\"" +
                             (near.empty() ? std::string(" (see \"tollgate policy --default\")")
                                           : " (did you mean \"" + near + "\"?)"));
        }
        if (std::find(out.begin(), out.end(), *id) == out.end()) {
            out.push_back(*id);
        }
    }
    return out;
}

// Return the lexed-file cache in `dir`, or, when that folder cannot be made, a cache that keeps
// nothing, after a warning (as check runs without its precompiled headers then).
std::unique_ptr<calibrate::LexFileCache> open_cache(const std::string& dir) {
    try {
        return std::make_unique<calibrate::LexFileCache>(dir);
    } catch (const Failure& e) {
        spdlog::warn("{}; calibrate runs without its lexed-file cache (pass --cache-dir to "
                     "choose another folder)",
                     e.what());
        return std::make_unique<calibrate::LexFileCache>();
    }
}

int report_replay(const CalibrateOptions& options, const calibrate::Replay& replay,
                  calibrate::CalibrationScope scope, const calibrate::CacheCounts& cache_counts,
                  double seconds, unsigned threads);

// Return the paths of the vendored folders of `scope`, for replay_identity.
std::string vendored_folders(const calibrate::CalibrationScope& scope) {
    std::string text;
    for (const auto& folder : scope.vendored) {
        text += (text.empty() ? "" : " ") + folder.path;
    }
    return text;
}

// The options and settings that decide a replay's result; every shard of one run must agree.
std::map<std::string, std::string> replay_identity(const CalibrateOptions& options,
                                                   const calibrate::ReplaySettings& settings,
                                                   const calibrate::CalibrationScope& scope) {
    return {{"range", options.range},
            {"default-branch", options.default_branch},
            {"max-commits", std::to_string(options.max_commits)},
            {"since", options.since},
            {"convention", java::build_fingerprint(settings.measure.convention)},
            {"stroud", fmt::format("{}", options.stroud)},
            {"rename-limit", std::to_string(options.rename_limit)},
            {"max-file-size", std::to_string(options.max_file_size)},
            {"compile-commands", calibrate::content_key(settings.measure.compile_commands_json)},
            {"policy", calibrate::content_key(policy::describe_policy(scope.policy))},
            {"draft-policy", scope.draft ? "given" : "none"},
            {"keep-vendored", scope.handling == calibrate::VendoredHandling::keep ? "yes" : "no"},
            {"vendored-folders", vendored_folders(scope)}};
}

// calibrate --merge: the parts' replays joined, then reported as one run reports, under the
// scope the parts were measured with.
int run_calibrate_merge(const CalibrateOptions& options) {
    std::vector<calibrate::ReplayPart> parts;
    for (const auto& path : options.merge) {
        parts.push_back(calibrate::read_replay_part(path));
    }
    const calibrate::MergedReplay merged =
        calibrate::merge_replay_parts(std::move(parts), options.merge);
    calibrate::CalibrationScope scope = merged.scope;
    if (!options.policy_path.empty()) {
        // The draft decided which files the shards measured: it cannot change at the merge.
        calibrate::CalibrationScope given = scope;
        given.policy = policy::load_policy_file(options.policy_path);
        calibrate::exclude_vendored(given);
        if (!scope.draft ||
            policy::describe_policy(given.policy) != policy::describe_policy(scope.policy)) {
            throw UsageError("--policy \"" + text::terminal_text(options.policy_path) +
                             "\" is not the policy the parts were measured with (give the same "
                             "--policy to every shard)");
        }
        scope.origin = options.policy_path;
    }
    return report_replay(options, merged.replay, std::move(scope), merged.cache, merged.seconds,
                         merged.threads);
}

int run_calibrate(const CalibrateOptions& options) {
    apply_isolation_options(options.isolation);
    lexer::IsolationSettings isolation = lexer::current_isolation();
    isolation.preamble_units = options.preamble_units;
    isolation.shared_headers = !options.no_shared_headers;
    isolation.preamble_homes = lexer::effective_jobs(options.jobs);
    lexer::set_isolation(isolation);
    if (options.format != "text" && options.format != "json") {
        throw UsageError("unknown format \"" + options.format + "\" (give text or json)");
    }
    // Checked before the replay, so a mistake costs nothing.
    (void)parse_measures(options.measures);
    const ProgressMode progress_mode = parse_progress_mode(options.progress);
    if (!options.policy_path.empty()) {
        (void)policy::load_policy_file(options.policy_path);
    }
    // Outputs that cannot be written fail now, not after the replay.
    if ((options.suggest || options.block_rate) && !options.out.empty() && options.out != "-") {
        check_writable("policy", options.out);
    }
    if (!options.html.empty()) {
        check_writable("HTML page", options.html);
    }
    if (!options.merge.empty()) {
        return run_calibrate_merge(options);
    }
    std::optional<ShardSpec> shard;
    if (!options.shard.empty()) {
        shard = parse_shard_spec(options.shard, "--shard");
        if (options.suggest || options.block_rate || !options.html.empty()) {
            throw UsageError("--shard writes a partial result: give --suggest, "
                             "--suggest-block-rate and --html to \"tollgate calibrate --merge\" "
                             "instead");
        }
    }
    const std::string repository_path = std::filesystem::current_path().string();
    const auto repository = walker::Repository::open(repository_path);

    walker::HistoryQuery query;
    query.range = options.range;
    query.default_branch = options.default_branch;
    query.max_commits = options.max_commits;
    if (!options.since.empty()) {
        query.since = parse_since(options.since);
    }
    const walker::History full_history = walker::first_parent_history(repository, query);
    const walker::History history =
        shard ? calibrate::shard_history(full_history, *shard) : full_history;
    // Chosen for the whole history, so that every shard measures what one whole run measures.
    calibrate::CalibrationScope scope =
        calibrate::choose_scope(repository, full_history, options.policy_path,
                                options.keep_vendored ? calibrate::VendoredHandling::keep
                                                      : calibrate::VendoredHandling::exclude);

    // Without a cache folder ($HOME unset and no $TOLLGATE_CACHE_DIR) the system's temporary
    // folder still lets repeated runs share parses.
    const std::string cache_dir =
        !options.cache_dir.empty() ? options.cache_dir
        : !default_cache_dir().empty()
            ? default_cache_dir() + "/calibrate"
            : (std::filesystem::temp_directory_path() / "tollgate-calibrate").string();
    const std::unique_ptr<calibrate::LexFileCache> cache = open_cache(cache_dir);
    calibrate::ReplaySettings settings;
    settings.measure.measures.stroud = options.stroud;
    settings.measure.compile_commands_json =
        read_compile_commands(options.compile_commands, repository.workdir());
    settings.measure.compile_commands_root = repository.workdir();
    settings.measure.compile_commands_origin = options.compile_commands.empty()
                                                   ? lexer::DatabaseOrigin::found
                                                   : lexer::DatabaseOrigin::given;
    settings.measure.cache_dir = options.no_pch_cache ? std::string() : default_cache_dir();
    settings.measure.lex_cache = cache.get();
    settings.changes.rename_limit = options.rename_limit;
    settings.changes.max_file_size = options.max_file_size;
    settings.threads = lexer::effective_jobs(options.jobs);
    settings.stop = &g_stop;
    settings.keep_file = [&scope](const walker::ChangedFile& file) {
        return calibrate::keep_changed_file(scope, file);
    };
    ProgressMeter progress("calibrate", "commits", progress_mode,
                           progress_style(progress_mode, stderr_is_terminal()), std::cerr,
                           progress_interval_seconds());
    // Test hook: deliver a real SIGINT after this many commits, to test the partial result.
    const char* interrupt_after = std::getenv("TOLLGATE_TEST_SIGINT_AFTER_COMMITS");
    const std::size_t interrupt_at =
        interrupt_after == nullptr ? 0 : std::strtoull(interrupt_after, nullptr, 10);
    settings.on_progress = [&progress, interrupt_at](std::size_t done, std::size_t total) {
        progress.update(done, total);
        if (interrupt_at != 0 && done == interrupt_at) {
            std::raise(SIGINT);
        }
    };

    const auto start = std::chrono::steady_clock::now();
    calibrate::Replay replay;
    {
        InterruptGuard guard;
        replay = calibrate::replay_history(repository_path, history, settings);
    }
    progress.finish();
    const calibrate::Eviction evicted =
        cache->evict({options.cache_max_size, options.cache_max_age});
    spdlog::debug("lexed-file cache {}: {} entries ({}) kept, {} removed", cache->dir(),
                  evicted.kept_entries, format_byte_size(evicted.kept_bytes),
                  evicted.removed_entries);

    const double seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    if (shard) { // a partial result for calibrate --merge, on stdout
        calibrate::ReplayPart part;
        part.shard = *shard;
        part.tool_version = TOLLGATE_VERSION;
        part.settings = replay_identity(options, settings, scope);
        part.history = full_history;
        part.scope = std::move(scope);
        part.replay = std::move(replay);
        part.cache = cache->counts();
        part.blobs = cache->blob_keys();
        part.seconds = seconds;
        part.threads = settings.threads;
        std::cout << calibrate::replay_part_to_json(part);
        return part.replay.end == calibrate::ReplayEnd::interrupted
                   ? 130
                   : static_cast<int>(ExitCode::pass);
    }
    return report_replay(options, replay, std::move(scope), cache->counts(), seconds,
                         settings.threads);
}

// Judge, summarise and write a finished replay as `options` ask; shared by a whole run and
// calibrate --merge.
int report_replay(const CalibrateOptions& options, const calibrate::Replay& replay,
                  calibrate::CalibrationScope scope, const calibrate::CacheCounts& cache_counts,
                  double seconds, unsigned threads) {
    const auto measures = parse_measures(options.measures);
    calibrate::Calibration calibration;
    std::vector<std::vector<std::string>> dropped;
    for (const auto& commit : replay.commits) {
        dropped.push_back(commit.dropped);
    }
    calibrate::count_vendored(scope, dropped);
    calibration.replay = &replay;
    calibration.scope = &scope;
    calibration.distributions = calibrate::distribute(replay, measures, &scope.policy);
    calibration.cache = cache_counts;
    calibration.seconds = seconds;
    calibration.threads = threads;
    policy::JudgeOptions judge_options;
    judge_options.today = policy::current_date();
    judge_options.policy_origin = scope.origin;
    if (scope.draft) {
        calibration.what_if = calibrate::what_if(replay, scope.policy, judge_options);
    }
    std::string suggestion_text;
    if (options.block_rate) {
        const double warning_rate =
            options.warning_rate ? *options.warning_rate : std::min(100.0, 2 * *options.block_rate);
        calibration.suggestion = calibrate::suggest_for_block_rate(
            replay, scope.policy, *options.block_rate, warning_rate, judge_options);
        suggestion_text = calibrate::block_rate_policy_text(replay, *calibration.suggestion, scope);
        const std::string warning = calibrate::small_sample_warning(*calibration.suggestion);
        if (!warning.empty()) {
            std::cerr << "tollgate: warning: " << warning << "\n";
        }
    } else if (options.suggest) {
        suggestion_text = calibrate::percentile_policy_text(replay, calibration.distributions,
                                                            *options.suggest, scope);
    }

    bool stdout_taken = false;
    if (!suggestion_text.empty()) {
        const std::string& text = suggestion_text;
        if (options.out.empty() || options.out == "-") {
            std::cout << text;
            stdout_taken = true;
        } else {
            write_output_file("policy", options.out, text);
        }
    }
    if (!options.html.empty()) {
        std::ostringstream page;
        calibrate::write_calibration_html(page, calibration);
        write_output_file("HTML page", options.html, page.str());
    }
    if (!stdout_taken) {
        if (options.format == "json") {
            calibrate::write_calibration_json(std::cout, calibration);
        } else {
            calibrate::write_calibration_text(std::cout, calibration);
        }
    }
    if (replay.end == calibrate::ReplayEnd::interrupted) {
        std::cerr << "tollgate: interrupted: partial result of " << replay.commits.size()
                  << " commits\n";
        return 130; // the shell's code for a run stopped by SIGINT
    }
    return static_cast<int>(ExitCode::pass);
}

} // namespace

void attach_calibrate(CLI::App& sub, const GlobalOptions& /*global*/,
                      std::function<int()>& selected) {
    auto options = std::make_shared<CalibrateOptions>();
    sub.description(
        "Replay first-parent history: measure each commit against its first parent exactly as "
        "check does, show percentiles and histograms of the deltas, count what a draft policy "
        "would have blocked, and suggest a policy for a block rate or at a percentile of the "
        "history. The paths and noise floor of the draft (--policy), else of the newest "
        "commit's .tollgate.yaml, else of the built-in default, are honoured, and folders that "
        "look like bundled third-party code are left out unparsed. Progress goes to stderr; "
        "Ctrl-C stops and prints the partial result (exit 130).");
    auto* range =
        sub.add_option("--range", options->range,
                       "A..B: the first-parent commits of B not reachable from A (default: the "
                       "default branch)");
    auto* branch = sub.add_option(
        "--default-branch", options->default_branch,
        "Branch replayed when --range is not given (default: the remote's HEAD, else "
        "main, else master)");
    auto* max_commits = sub.add_option("--max-commits", options->max_commits,
                                       "Replay only the newest N commits (0 = all)")
                            ->check(whole_number(0, 10000000))
                            ->capture_default_str();
    auto* since =
        sub.add_option("--since", options->since,
                       "Replay only commits made on or after this date (YYYY-MM-DD, UTC)");
    sub.add_option("--measure", options->measures,
                   "Measure to show, repeatable (default: volume, difficulty, effort)");
    sub.add_option("--policy", options->policy_path,
                   "Draft policy to judge every replayed commit with (what-if)");
    auto* suggest =
        sub.add_option("--suggest", options->suggest,
                       "Write a policy whose limits sit at the P-th percentile of the history")
            ->check(real_number(0.0, 100.0));
    auto* block_rate =
        sub.add_option("--suggest-block-rate", options->block_rate,
                       "Write a policy whose limits are the strictest under which at most P% of "
                       "the replayed commits would have been blocked (searched per rule; the "
                       "report gives its replayed block and warning rates)")
            ->check(real_number(0.0, 100.0));
    sub.add_option("--suggest-warning-rate", options->warning_rate,
                   "With --suggest-block-rate: at most P% of the replayed commits may pass with "
                   "warnings (default: twice the block rate)")
        ->check(real_number(0.0, 100.0))
        ->needs(block_rate);
    suggest->excludes(block_rate);
    auto* keep_vendored =
        sub.add_flag("--keep-vendored", options->keep_vendored,
                     "Measure folders that look like bundled third-party code too (by default they "
                     "are left out, listed, and excluded in a suggested policy)");
    add_progress_option(sub, options->progress);
    sub.add_option("--out", options->out,
                   "Where --suggest or --suggest-block-rate writes the policy (default: stdout, "
                   "and then no report on stdout)");
    sub.add_option("--format", options->format, "Report on stdout: text or json")
        ->capture_default_str();
    sub.add_option("--html", options->html,
                   "Also write a self-contained HTML page with SVG histograms to PATH");
    sub.add_option("-j,--jobs", options->jobs, "Worker threads, one commit each (0 = all cores)")
        ->check(whole_number(0, k_max_jobs))
        ->capture_default_str();
    add_isolation_options(sub, options->isolation);
    sub.add_option("--cache-dir", options->cache_dir,
                   "Folder of the lexed-file cache (default: the tool's cache folder + "
                   "\"/calibrate\"); when it cannot be made, calibrate warns and runs without");
    sub.add_option("--cache-max-size", options->cache_max_size,
                   "After the run, remove the least recently used cache entries until the cache "
                   "holds at most SIZE (bytes, or a number with K, M or G; 0 = no limit)")
        ->transform(byte_size(std::uint64_t{1} << 40))
        ->type_name("SIZE")
        ->default_str(std::to_string(calibrate::k_default_cache_bytes >> 20) + "M");
    sub.add_option("--cache-max-age", options->cache_max_age,
                   "After the run, remove cache entries unused for more than DAYS days (0 = no "
                   "limit)")
        ->check(whole_number(0, 36500))
        ->type_name("DAYS")
        ->capture_default_str();
    sub.add_option("--compile-commands", options->compile_commands,
                   "compile_commands.json to take -D/-I/-std flags from (default: the "
                   "repository's own, at its root or in build/)");
    sub.add_flag("--no-pch-cache", options->no_pch_cache,
                 "Parse without the precompiled standard-library headers (as check's flag)");
    add_stroud_option(sub, options->stroud);
    add_rename_limit_option(sub, options->rename_limit);
    add_max_file_size_option(sub, options->max_file_size);
    auto* max_file_size = sub.get_option("--max-file-size");
    sub.add_flag("--no-shared-headers", options->no_shared_headers,
                 "Parse every version after the precompiled standard headers only, not also "
                 "after its own leading #include lines precompiled once per set of their "
                 "contents (same results, slower with heavy header-only libraries)");
    sub.add_option("--preamble-units", options->preamble_units,
                   "Translation units each parser process keeps to reparse the next version of "
                   "a file with its precompiled preamble (about 7 MiB of memory each, and the "
                   "preamble's file in the temporary folder; 0 = parse every version from "
                   "scratch)")
        ->check(whole_number(0, 4096))
        ->capture_default_str();
    auto* shard = sub.add_option("--shard", options->shard,
                                 "Replay only the K-th of N contiguous blocks of the history and "
                                 "write a partial result (JSON) on stdout for --merge")
                      ->type_name("K/N");
    sub.add_option("--merge", options->merge,
                   "Join the partial results of every shard and report them as one whole run "
                   "would (no repository needed; --policy, when given, must be the shards' own)")
        ->type_name("PART...")
        ->excludes(shard)
        ->excludes(range)
        ->excludes(branch)
        ->excludes(max_commits)
        ->excludes(since)
        ->excludes(keep_vendored)
        ->excludes(max_file_size)
        // The parts' own values decide these; a merge that took them would only seem to.
        ->excludes(sub.get_option("--stroud"))
        ->excludes(sub.get_option("--rename-limit"))
        ->excludes(sub.get_option("--compile-commands"));
    sub.footer("Examples:\n"
               "  tollgate calibrate                                 the last 300 commits of "
               "the default branch\n"
               "  tollgate calibrate --policy .tollgate.yaml         what it would have blocked\n"
               "  tollgate calibrate --suggest-block-rate 5 --out draft.yaml   block at most "
               "5% of commits\n"
               "  tollgate calibrate --suggest 95 --out draft.yaml   limits at the 95th "
               "percentile\n"
               "  tollgate calibrate --range v1.0..main --format json --html calibrate.html\n"
               "  tollgate calibrate --shard 2/4 > part-2.json       one of four CI jobs\n"
               "  tollgate calibrate --merge part-*.json --suggest 95   their joined result");
    sub.callback(
        [options, &selected] { selected = [options] { return run_calibrate(*options); }; });
}

} // namespace tollgate
