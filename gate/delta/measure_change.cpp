// SPDX-License-Identifier: MIT
// One change, measured: read sides, lex in parallel, compare, total.
#include "gate/delta/measure_change.hpp"

#include "gate/delta/compare.hpp"
#include "gate/delta/unmeasured_lines.hpp"
#include "gate/lexer/lex_files.hpp"
#include "gate/lexer/lexer.hpp"
#include "gate/lexer/missing_headers.hpp"

#include <algorithm>
#include <fmt/format.h>
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
        any = any || sources.changed.back().has_value();
    }
    if (any) {
        sources.tree = walker::read_side_tree(repository, changes, side);
    }
    sources.context = lexer::make_parse_context(sources.tree, settings.compile_commands_json,
                                                settings.compile_commands_root);
    lexer::add_include_dirs(sources.context, sources.tree, settings.include_dirs);
    sources.context.convention = settings.convention;
    sources.context.cache_dir = settings.cache_dir;
    return sources;
}

// Lex `jobs`, taking what `settings.lex_cache` already holds and keeping what was parsed.
std::vector<lexer::FileFunctions> lex_with_cache(const std::vector<lexer::LexJob>& jobs,
                                                 const MeasureChangeSettings& settings) {
    if (settings.lex_cache == nullptr) {
        return lexer::lex_jobs(jobs, settings.jobs);
    }
    std::vector<lexer::FileFunctions> lexed(jobs.size());
    std::vector<lexer::LexJob> missing;
    std::vector<std::size_t> missing_index;
    for (std::size_t j = 0; j < jobs.size(); ++j) {
        if (auto found = settings.lex_cache->find(*jobs[j].file, *jobs[j].context)) {
            lexed[j] = std::move(*found);
        } else {
            missing.push_back(jobs[j]);
            missing_index.push_back(j);
        }
    }
    std::vector<lexer::FileFunctions> parsed;
    if (!missing.empty()) { // a lexer costs an index even with nothing to parse
        parsed = lexer::lex_jobs(missing, settings.jobs);
    }
    for (std::size_t k = 0; k < parsed.size(); ++k) {
        settings.lex_cache->store(*missing[k].file, *missing[k].context, parsed[k]);
        lexed[missing_index[k]] = std::move(parsed[k]);
    }
    return lexed;
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
    report.convention = core::fingerprint(settings.convention);
    if (!changes.range.note.empty()) {
        report.notes.push_back(changes.range.note);
    }
    report.notes.insert(report.notes.end(), changes.notes.begin(), changes.notes.end());
    for (const auto& skipped : changes.skipped) {
        report.skipped.push_back({skipped.head_path.empty() ? skipped.base_path : skipped.head_path,
                                  walker::skip_reason_text(skipped.reason)});
    }
    report.measured_files = static_cast<unsigned>(changes.files.size());
    if (changes.files.empty()) {
        return report;
    }

    const bool base_from_snapshot = settings.base_snapshot != nullptr &&
                                    settings.base_snapshot->commit == changes.range.base.hex;
    if (base_from_snapshot) {
        report.notes.push_back("base-side measures come from the baseline snapshot " +
                               settings.base_snapshot_path + " of " +
                               changes.range.base.short_hex() + " (the base was not re-parsed)");
    }
    const SideSources base = base_from_snapshot
                                 ? SideSources{}
                                 : read_side_sources(repository, changes, Side::base, settings);
    const SideSources head = read_side_sources(repository, changes, Side::head, settings);

    // One job per file and side; both sides go through one pool.
    std::vector<lexer::LexJob> jobs;
    std::vector<std::pair<std::size_t, Side>> job_owner;
    for (std::size_t i = 0; i < changes.files.size(); ++i) {
        if (!base_from_snapshot && base.changed[i]) {
            jobs.push_back({&*base.changed[i], &base.context});
            job_owner.emplace_back(i, Side::base);
        }
        if (head.changed[i]) {
            jobs.push_back({&*head.changed[i], &head.context});
            job_owner.emplace_back(i, Side::head);
        }
    }
    spdlog::debug("lexing {} file sides of {} changed files", jobs.size(), changes.files.size());
    const std::vector<lexer::FileFunctions> lexed = lex_with_cache(jobs, settings);

    std::vector<FileSides> sides(changes.files.size());
    for (std::size_t i = 0; i < changes.files.size(); ++i) {
        const auto& file = changes.files[i];
        sides[i].base_path = file.base_path;
        sides[i].head_path = file.head_path;
        sides[i].base_lines = &file.base_lines;
        sides[i].head_lines = &file.head_lines;
        if (base_from_snapshot && !file.base_path.empty()) {
            sides[i].base = side_functions(*settings.base_snapshot, file.base_path);
        }
    }
    std::vector<lexer::LexWarning> base_warnings, head_warnings;
    for (std::size_t j = 0; j < lexed.size(); ++j) {
        const auto [index, side] = job_owner[j];
        (side == Side::base ? sides[index].base : sides[index].head) = side_functions(&lexed[j]);
        auto& warnings = side == Side::base ? base_warnings : head_warnings;
        warnings.insert(warnings.end(), lexed[j].warnings.begin(), lexed[j].warnings.end());
    }
    bool headers_missing = false;
    for (const auto side : {Side::base, Side::head}) {
        const auto summary =
            lexer::summarise_missing_headers(side == Side::base ? base_warnings : head_warnings);
        headers_missing = headers_missing || summary.headers_missing;
        for (const auto& w : summary.warnings) {
            report.warnings.push_back(
                {side == Side::base ? "base" : "head", w.path, w.line, w.message});
        }
    }
    if (headers_missing) {
        report.notes.push_back(lexer::include_folder_hint());
    }
    report.functions = compare_functions(sides, settings.measures);
    compute_totals(report);
    for (std::size_t i = 0; i < changes.files.size(); ++i) {
        const auto& file = changes.files[i];
        const std::optional<SourceFile> base_file =
            base_from_snapshot ? walker::read_side(repository, changes, file, Side::base)
                               : base.changed[i];
        const auto& head_file = head.changed[i];
        UnmeasuredLines lines = unmeasured_lines(
            file.head_path.empty() ? file.base_path : file.head_path, sides[i],
            base_file ? &base_file->content : nullptr, head_file ? &head_file->content : nullptr);
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
