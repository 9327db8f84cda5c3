// SPDX-License-Identifier: MIT
// One change, measured: read sides, lex in parallel, compare, total.
#include "gate/delta/measure_change.hpp"

#include "gate/common/byte_size.hpp"
#include "gate/delta/compare.hpp"
#include "gate/delta/snapshot_check.hpp"
#include "gate/delta/unmeasured_lines.hpp"
#include "gate/java/java_front_end.hpp"
#include "gate/lexer/lex_files.hpp"
#include "gate/lexer/lexer.hpp"
#include "gate/lexer/lexical_fallback.hpp"

#include <algorithm>
#include <atomic>
#include <fmt/format.h>
#include <set>
#include <spdlog/spdlog.h>

namespace tollgate::delta {

namespace {

std::string label_for(const std::string& name, const walker::ObjectId& id) {
    if (id.hex.empty()) {
        return name;
    }
    return name == id.hex || name.empty() ? id.short_hex()
                                          : fmt::format("{} ({})", name, id.short_hex());
}

// Every file a side needs: the changed files' content and the side's headers.
struct SideSources {
    std::vector<SourceFile> tree;                   // every C/C++ file of the side
    std::vector<OversizedFile> oversized;           // files of the side left unread for size
    lexer::ParseContext context;                    // built from `tree`
    std::vector<std::optional<SourceFile>> changed; // per changed file, its content on this side
};

SideSources read_side_sources(const walker::Repository& repository,
                              const walker::ChangeSet& changes, Side side,
                              const MeasureChangeSettings& settings) {
    SideSources sources;
    bool any = false;
    for (const auto& file : changes.files) {
        sources.changed.push_back(walker::read_side(repository, changes, file, side));
        // Only C/C++ files need the side's headers; a Java file stands alone.
        any = any || (sources.changed.back() && !is_java_path(sources.changed.back()->path));
    }
    if (any) {
        sources.tree = walker::read_side_tree(repository, changes, side, &sources.oversized);
    }
    sources.context =
        lexer::make_parse_context(sources.tree, settings.compile_commands_json,
                                  settings.compile_commands_root, settings.compile_commands_origin);
    lexer::add_include_dirs(sources.context, sources.tree, settings.include_dirs);
    sources.context.convention = settings.convention;
    sources.context.cache_dir = settings.cache_dir;
    return sources;
}

// Releases, on the way out of an exception, the cache keys a caller claimed and did not store,
// so that threads waiting for them take them over instead of waiting in vain.
class ClaimGuard {
public:
    ClaimGuard(lexer::LexCache& cache, const std::vector<lexer::LexJob>& jobs)
        : m_cache(cache), m_jobs(jobs) {}
    ~ClaimGuard() {
        for (const std::size_t j : m_claimed) {
            m_cache.abandon(*m_jobs[j].file, *m_jobs[j].context);
        }
    }
    ClaimGuard(const ClaimGuard&) = delete;
    ClaimGuard& operator=(const ClaimGuard&) = delete;
    std::vector<std::size_t>& claimed() { return m_claimed; }

private:
    lexer::LexCache& m_cache;
    const std::vector<lexer::LexJob>& m_jobs;
    std::vector<std::size_t> m_claimed;
};

// Lex `jobs`, taking what `settings.lex_cache` already holds and keeping what was parsed. A file
// another worker is parsing is not parsed again: it is awaited once this worker has stored its
// own claims (waiting while holding a claim could deadlock two workers).
std::vector<lexer::FileFunctions> lex_with_cache(const std::vector<lexer::LexJob>& jobs,
                                                 const MeasureChangeSettings& settings) {
    std::atomic<std::size_t> done{0};
    std::size_t total = 0;
    const auto on_done = [&](const lexer::FileFunctions&) {
        if (settings.on_progress) {
            settings.on_progress(++done, total);
        }
    };
    if (settings.lex_cache == nullptr) {
        total = jobs.size();
        return lexer::lex_jobs(jobs, settings.jobs, on_done);
    }
    lexer::LexCache& cache = *settings.lex_cache;
    std::vector<lexer::FileFunctions> lexed(jobs.size());
    ClaimGuard guard(cache, jobs);
    std::vector<std::size_t>& claimed = guard.claimed();
    std::vector<std::size_t> pending;
    const auto take = [&](std::size_t j, lexer::Lookup found) {
        if (found.state == lexer::LookupState::found) {
            lexed[j] = std::move(*found.functions);
        } else if (found.state == lexer::LookupState::claimed) {
            claimed.push_back(j);
        } else {
            pending.push_back(j);
        }
    };
    for (std::size_t j = 0; j < jobs.size(); ++j) {
        take(j, cache.lookup(*jobs[j].file, *jobs[j].context));
    }
    while (!claimed.empty() || !pending.empty()) {
        if (!claimed.empty()) { // a lexer costs an index even with nothing to parse
            std::vector<lexer::LexJob> missing;
            for (const std::size_t j : claimed) {
                missing.push_back(jobs[j]);
            }
            total += missing.size(); // files found in the cache are not counted
            std::vector<lexer::FileFunctions> parsed =
                lexer::lex_jobs(missing, settings.jobs, on_done);
            const std::vector<std::size_t> mine = std::move(claimed);
            claimed.clear();
            for (std::size_t k = 0; k < parsed.size(); ++k) {
                const std::size_t j = mine[k];
                // A time limit depends on this run's limits and load, not only on the file: not
                // kept on disk, only handed to this run's waiters.
                if (parsed[k].parser_stop == lexer::ParserStop::timed_out) {
                    cache.share(*jobs[j].file, *jobs[j].context, parsed[k]);
                } else {
                    cache.store(*jobs[j].file, *jobs[j].context, parsed[k]);
                }
                lexed[j] = std::move(parsed[k]);
            }
        }
        const std::vector<std::size_t> waiting = std::move(pending);
        pending.clear();
        for (const std::size_t j : waiting) {
            lexer::Lookup found = cache.await(*jobs[j].file, *jobs[j].context);
            if (found.state == lexer::LookupState::pending) { // a LexCache that cannot wait
                found = cache.lookup(*jobs[j].file, *jobs[j].context);
            }
            take(j, std::move(found));
        }
    }
    return lexed;
}

// Every file side lexed for one change, and where each changed file's sides are.
struct LexedChange {
    std::vector<lexer::LexJob> jobs;                  // one per file and side
    std::vector<std::pair<std::size_t, Side>> owner;  // per job: changed file and side
    std::vector<lexer::FileFunctions> lexed;          // per job
    std::vector<std::optional<std::size_t>> base_job; // per changed file
    std::vector<std::optional<std::size_t>> head_job; // per changed file
};

// Lex both sides of every changed file through one pool.
LexedChange lex_change(const walker::ChangeSet& changes, const SideSources& base,
                       const SideSources& head, const MeasureChangeSettings& settings) {
    LexedChange change;
    const std::size_t files = changes.files.size();
    for (std::size_t i = 0; i < files; ++i) {
        if (base.changed[i]) {
            change.jobs.push_back({&*base.changed[i], &base.context});
            change.owner.emplace_back(i, Side::base);
        }
        if (head.changed[i]) {
            change.jobs.push_back({&*head.changed[i], &head.context});
            change.owner.emplace_back(i, Side::head);
        }
    }
    spdlog::debug("lexing {} file sides of {} changed files", change.jobs.size(), files);
    change.lexed = lex_with_cache(change.jobs, settings);
    change.base_job.resize(files);
    change.head_job.resize(files);
    for (std::size_t j = 0; j < change.lexed.size(); ++j) {
        const auto [index, side] = change.owner[j];
        (side == Side::base ? change.base_job : change.head_job)[index] = j;
    }
    return change;
}

bool stopped(const LexedChange& change, const std::optional<std::size_t>& job) {
    return job && change.lexed[*job].parser_stop != lexer::ParserStop::none;
}

// Where the parser stopped on one side of a file, measure the other side lexically too, so that
// base and head are counted by the same rules. Return, per changed file, whether either side
// was measured lexically for that reason.
std::vector<bool> measure_sides_alike(LexedChange& change, const walker::ChangeSet& changes) {
    std::vector<bool> lexical(changes.files.size(), false);
    for (std::size_t i = 0; i < changes.files.size(); ++i) {
        const bool head_stopped = stopped(change, change.head_job[i]);
        const bool base_stopped = stopped(change, change.base_job[i]);
        lexical[i] = head_stopped || base_stopped;
        if (head_stopped == base_stopped) {
            continue;
        }
        const auto& other = head_stopped ? change.base_job[i] : change.head_job[i];
        if (other) {
            const std::string note = std::string("the parser stopped on the ") +
                                     (head_stopped ? "head" : "base") +
                                     " side of this file: this side is measured lexically too";
            const lexer::LexJob& job = change.jobs[*other];
            change.lexed[*other] =
                lexer::lex_lexically(*job.file, *job.context, lexer::ParserStop::none, note);
        }
    }
    return lexical;
}

// The two sides of every changed file, for compare_functions; warnings go to `report`.
std::vector<FileSides> assemble_sides(const LexedChange& change, const walker::ChangeSet& changes,
                                      ChangeReport& report) {
    std::vector<FileSides> sides(changes.files.size());
    for (std::size_t i = 0; i < changes.files.size(); ++i) {
        const auto& file = changes.files[i];
        sides[i].base_path = file.base_path;
        sides[i].head_path = file.head_path;
        sides[i].base_lines = &file.base_lines;
        sides[i].head_lines = &file.head_lines;
    }
    for (std::size_t j = 0; j < change.lexed.size(); ++j) {
        const auto [index, side] = change.owner[j];
        (side == Side::base ? sides[index].base : sides[index].head) =
            side_functions(&change.lexed[j]);
        for (const auto& w : change.lexed[j].warnings) {
            report.warnings.push_back(
                {side == Side::base ? "base" : "head", w.path, w.line, w.message});
        }
    }
    return sides;
}

// Compare `parsed`, the touched functions measured from `sides`, with the same change measured
// with `snapshot`'s base functions in place of the parsed ones. Files measured lexically because
// the parser stopped on a side keep their parsed base: the snapshot holds what the parser saw.
SnapshotCheck compare_with_snapshot(const std::vector<FileSides>& sides,
                                    const walker::ChangeSet& changes,
                                    const baseline::Snapshot& snapshot,
                                    const std::vector<bool>& measured_lexically,
                                    const std::vector<FunctionDelta>& parsed,
                                    const core::MeasureSettings& measures) {
    std::vector<FileSides> recorded = sides;
    for (std::size_t i = 0; i < changes.files.size(); ++i) {
        const std::string& path = changes.files[i].base_path;
        if (!path.empty() && !measured_lexically[i]) {
            recorded[i].base = side_functions(snapshot, path);
        }
    }
    return check_base_snapshot(parsed, compare_functions(recorded, measures));
}

} // namespace

ChangeReport measure_change(const walker::Repository& repository, const walker::ChangeSet& changes,
                            const MeasureChangeSettings& settings) {
    ChangeReport report;
    report.base_label = label_for(changes.range.base_name, changes.range.base);
    report.head_label = changes.range.head_source == walker::HeadSource::worktree
                            ? std::string("working tree")
                            : label_for(changes.range.head_name, changes.range.head);
    report.base_commit = changes.range.base.hex;
    report.head_commit = changes.range.head.hex;
    report.convention = java::build_fingerprint(settings.convention);
    if (!changes.range.note.empty()) {
        report.notes.push_back(changes.range.note);
    }
    report.notes.insert(report.notes.end(), changes.notes.begin(), changes.notes.end());
    std::set<std::string> skipped_paths;
    for (const auto& skipped : changes.skipped) {
        const std::string& path = skipped.head_path.empty() ? skipped.base_path : skipped.head_path;
        skipped_paths.insert(path);
        report.skipped.push_back({path, skipped.reason == walker::SkipReason::too_large
                                            ? oversized_reason(skipped.size, changes.max_file_size)
                                            : walker::skip_reason_text(skipped.reason)});
    }
    report.measured_files = static_cast<unsigned>(changes.files.size());
    if (changes.files.empty()) {
        return report;
    }

    // The base is always parsed: a snapshot of it is only compared (see check_base_snapshot).
    const SideSources base = read_side_sources(repository, changes, Side::base, settings);
    const SideSources head = read_side_sources(repository, changes, Side::head, settings);
    // Unchanged files left unread: the changed files that include them are parsed without them.
    std::set<std::string> noted;
    for (const SideSources* sources : {&base, &head}) {
        for (const auto& file : sources->oversized) {
            if (skipped_paths.count(file.path) == 0 && noted.insert(file.path).second) {
                report.notes.push_back(fmt::format(
                    "\"{}\" was not read: {} is over the {} limit (--max-file-size); files that "
                    "include it are parsed without it",
                    file.path, format_byte_size(file.size),
                    format_byte_size(changes.max_file_size)));
            }
        }
    }

    // A file takes its flags from the side it is read on (head, else base): say how many had
    // none, so that the reports can tell how to give a compile database.
    report.compile_database = !settings.compile_commands_json.empty();
    for (std::size_t i = 0; i < changes.files.size(); ++i) {
        const SideSources& side = head.changed[i] ? head : base;
        const auto& file = head.changed[i] ? head.changed[i] : base.changed[i];
        if (file && side.context.file_flags.count(file->path) == 0) {
            ++report.files_without_compile_flags;
        }
    }
    LexedChange lexed = lex_change(changes, base, head, settings);
    const std::vector<bool> measured_lexically = measure_sides_alike(lexed, changes);
    const std::vector<FileSides> sides = assemble_sides(lexed, changes, report);
    report.functions = compare_functions(sides, settings.measures);
    if (settings.base_snapshot != nullptr && settings.snapshot_check != nullptr &&
        settings.base_snapshot->commit == changes.range.base.hex) {
        *settings.snapshot_check =
            compare_with_snapshot(sides, changes, *settings.base_snapshot, measured_lexically,
                                  report.functions, settings.measures);
    }
    compute_totals(report);
    for (std::size_t i = 0; i < changes.files.size(); ++i) {
        const auto& file = changes.files[i];
        const std::string& path = file.head_path.empty() ? file.base_path : file.head_path;
        if (is_java_path(path)) {
            continue; // the lines outside functions are counted for C and C++ files
        }
        const auto& base_file = base.changed[i];
        const auto& head_file = head.changed[i];
        UnmeasuredLines lines =
            unmeasured_lines(path, sides[i], base_file ? &base_file->content : nullptr,
                             head_file ? &head_file->content : nullptr);
        if (lines.count > 0) {
            report.unmeasured_lines += lines.count;
            report.unmeasured.push_back(std::move(lines));
        }
    }
    std::sort(report.unmeasured.begin(), report.unmeasured.end(),
              [](const UnmeasuredLines& a, const UnmeasuredLines& b) { return a.path < b.path; });
    return report;
}

} // namespace tollgate::delta
