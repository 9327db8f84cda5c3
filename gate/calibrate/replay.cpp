// SPDX-License-Identifier: MIT
// A queue of commits, N workers, results put back in history order.
#include "gate/calibrate/replay.hpp"

#include "gate/common/workers.hpp"
#include "gate/lexer/lex_files.hpp"
#include "gate/walker/repository.hpp"

#include <algorithm>
#include <exception>
#include <mutex>
#include <optional>
#include <thread>

namespace tollgate::calibrate {

namespace {

walker::ResolvedRange range_of(const walker::HistoryCommit& commit) {
    walker::ResolvedRange range;
    range.base = *commit.parent;
    range.head = commit.id;
    range.base_name = commit.parent->hex; // measure_change shows a full id as its short form
    range.head_name = commit.id.hex;
    range.head_source = walker::HeadSource::commit;
    range.base_source = walker::BaseSource::given;
    return range;
}

// Remove the files `keep` refuses from `changes` before anything is read or parsed; return
// their paths.
std::vector<std::string> drop_files(walker::ChangeSet& changes,
                                    const std::function<bool(const walker::ChangedFile&)>& keep) {
    std::vector<std::string> dropped;
    if (!keep) {
        return dropped;
    }
    std::vector<walker::ChangedFile> kept;
    for (auto& file : changes.files) {
        if (keep(file)) {
            kept.push_back(std::move(file));
        } else {
            dropped.push_back(file.head_path.empty() ? file.base_path : file.head_path);
        }
    }
    changes.files = std::move(kept);
    return dropped;
}

} // namespace

Replay replay_history(const std::string& repository_path, const walker::History& history,
                      const ReplaySettings& settings) {
    Replay replay;
    replay.history = history;
    std::vector<std::size_t> todo;
    for (std::size_t i = 0; i < history.commits.size(); ++i) {
        if (history.commits[i].parent) {
            todo.push_back(i);
        } else {
            replay.notes.push_back("root commit " + history.commits[i].id.short_hex() +
                                   " skipped: it has no parent to compare with");
        }
    }

    std::vector<std::optional<delta::ChangeReport>> results(history.commits.size());
    std::vector<std::vector<std::string>> dropped_of(history.commits.size());
    std::atomic<std::size_t> next{0};
    std::size_t done = 0;
    std::mutex mutex;
    std::exception_ptr first_error;
    delta::MeasureChangeSettings measure = settings.measure;
    measure.jobs = 1; // parallel across commits, not inside one

    auto work = [&] {
        try {
            const auto repository = walker::Repository::open(repository_path);
            for (std::size_t k = next++; k < todo.size(); k = next++) {
                if (settings.stop != nullptr && settings.stop->load()) {
                    break;
                }
                const auto& commit = history.commits[todo[k]];
                auto changes =
                    walker::collect_changes(repository, range_of(commit), settings.changes);
                std::vector<std::string> dropped = drop_files(changes, settings.keep_file);
                auto report = delta::measure_change(repository, changes, measure);
                std::lock_guard<std::mutex> lock(mutex);
                results[todo[k]] = std::move(report);
                dropped_of[todo[k]] = std::move(dropped);
                ++done;
                if (settings.on_progress) {
                    settings.on_progress(done, todo.size());
                }
            }
        } catch (...) {
            std::lock_guard<std::mutex> lock(mutex);
            if (!first_error) {
                first_error = std::current_exception();
            }
            next = todo.size();
        }
    };
    const unsigned threads =
        std::min<unsigned>(lexer::effective_jobs(settings.threads),
                           static_cast<unsigned>(std::max<std::size_t>(1, todo.size())));
    run_workers(threads, work);
    if (first_error) {
        std::rethrow_exception(first_error);
    }
    for (std::size_t i = 0; i < history.commits.size(); ++i) {
        if (results[i]) {
            replay.commits.push_back(
                {history.commits[i], std::move(*results[i]), std::move(dropped_of[i])});
        }
    }
    if (replay.commits.size() < todo.size()) {
        replay.end = ReplayEnd::interrupted;
        replay.notes.push_back("interrupted: " + std::to_string(replay.commits.size()) + " of " +
                               std::to_string(todo.size()) + " commits replayed");
    }
    return replay;
}

} // namespace tollgate::calibrate
