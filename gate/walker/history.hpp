// SPDX-License-Identifier: MIT
// First-parent history: the commits of a branch as its merges recorded them, newest last.
#pragma once

#include "gate/walker/repository.hpp"

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::walker {

// Which commits first_parent_history lists.
struct HistoryQuery {
    std::string range;                 // "A..B" (B's first-parent chain not reachable from A), "B"
                                       // (B's chain), or empty (the default branch's chain)
    std::string default_branch;        // the branch used when `range` is empty; empty: as
                                       // resolve_range finds it (origin/HEAD, main, master, ...)
    std::size_t max_commits = 300;     // keep only the newest this many; 0 keeps all
    std::optional<std::int64_t> since; // keep only commits whose commit time (seconds since
                                       // 1970, UTC) is at or after this
};

// One commit of a first-parent history.
struct HistoryCommit {
    ObjectId id;                    // the commit
    std::optional<ObjectId> parent; // its first parent; empty for a root commit
    unsigned parent_count = 0;      // 0 root, 1 ordinary, 2 or more merge
    std::string subject;            // first line of the message
    std::int64_t time = 0;          // commit time, seconds since 1970 (UTC)

    bool operator==(const HistoryCommit& other) const {
        return id == other.id && parent == other.parent && parent_count == other.parent_count &&
               subject == other.subject && time == other.time;
    }
};

// A first-parent history and how it was chosen.
struct History {
    std::string tip_name;               // the revision walked from, e.g. "main" or "B"
    std::vector<HistoryCommit> commits; // oldest first
};

// List the first-parent history that `query` selects in `repository`, oldest first (git log
// --first-parent --topo-order, reversed). Returns no commits when the range is empty. Throws
// UsageError for an unknown revision or a missing default branch, Failure when libgit2 fails.
History first_parent_history(const Repository& repository, const HistoryQuery& query);

} // namespace tollgate::walker
