// SPDX-License-Identifier: MIT
// Replay a first-parent history: measure each commit against its first parent, in parallel.
#pragma once

#include "gate/delta/measure_change.hpp"
#include "gate/walker/change_set.hpp"
#include "gate/walker/history.hpp"

#include <atomic>
#include <cstddef>
#include <functional>
#include <string>
#include <vector>

namespace tollgate::calibrate {

// Settings of one replay.
struct ReplaySettings {
    delta::MeasureChangeSettings measure; // as check's; `jobs` is forced to 1 per worker
    walker::ChangeOptions changes;        // rename detection bounds, as check's
    unsigned threads = 0; // worker threads, each replaying whole commits (0 = cores)
    const std::atomic<bool>* stop = nullptr; // when set and true, workers take no new commit
    // Called (serialised, from worker threads) after each commit with the commits done so far
    // and the total; may be empty.
    std::function<void(std::size_t done, std::size_t total)> on_progress;
    // Return whether a changed file is measured; a file it refuses is never read nor parsed and
    // is listed in ReplayedCommit::dropped. Called from worker threads; empty keeps every file.
    std::function<bool(const walker::ChangedFile& file)> keep_file;
};

// One commit, measured against its first parent exactly as check measures a change.
struct ReplayedCommit {
    walker::HistoryCommit commit;     // the commit
    delta::ChangeReport report;       // its touched functions (measure_change's report)
    std::vector<std::string> dropped; // changed files that keep_file refused (head path, else
                                      // base path), not parsed
};

// How a replay ended.
enum class ReplayEnd {
    complete,    // every commit of the history was replayed
    interrupted, // the stop flag was raised; `commits` holds those finished before
};

// The result of a replay.
struct Replay {
    walker::History history;             // what was asked for
    std::vector<ReplayedCommit> commits; // replayed commits, in history order (oldest first)
    std::vector<std::string> notes;      // e.g. that the root commit was skipped
    ReplayEnd end = ReplayEnd::complete; // complete or interrupted
};

// Replay every commit of `history` in the repository at `repository_path` against its first
// parent (a merge against its first parent; a root commit is skipped with a note) on
// `settings.threads` workers, each with its own repository handle. Results are in history order
// whatever the thread count. Throws what collect_changes and measure_change throw.
Replay replay_history(const std::string& repository_path, const walker::History& history,
                      const ReplaySettings& settings);

} // namespace tollgate::calibrate
