// SPDX-License-Identifier: MIT
// What a change is: the base and head revisions as given, and as resolved to commits.
#pragma once

#include "gate/walker/repository.hpp"

#include <string>

namespace tollgate::walker {

// The revisions a user asked to compare, as given on the command line.
struct RevisionRange {
    std::string base;           // base revision; empty: the merge base of head and the default
                                // branch (HEAD when `worktree` is set)
    std::string head = "HEAD";  // head revision; empty means HEAD; must stay HEAD for the worktree
    bool worktree = false;      // compare the working tree (staged, unstaged and untracked files)
                                // against the base instead of a head commit
    std::string default_branch; // default branch to take the merge base with; empty: the target
                                // of refs/remotes/origin/HEAD, else main, else master, else
                                // origin/main, else origin/master

    bool operator==(const RevisionRange& other) const {
        return base == other.base && head == other.head && worktree == other.worktree &&
               default_branch == other.default_branch;
    }
};

// Where the head side's files come from.
enum class HeadSource {
    commit,   // the tree of the head commit, read from the object database
    worktree, // the working tree, read from disk
};

// How the base commit was chosen.
enum class BaseSource {
    given,          // the base revision the user named (or HEAD in worktree mode)
    merge_base,     // the merge base of head and the default branch
    default_branch, // the default branch's tip itself: the merge base was unavailable (shallow)
};

// A revision range resolved to commits, ready for collect_changes.
struct ResolvedRange {
    ObjectId base;                               // the base commit
    ObjectId head;                               // the head commit; empty for the working tree
    std::string base_name;                       // the base as given, or the default branch used
    std::string head_name;                       // the head as given ("HEAD" by default), or
                                                 // "working tree"
    HeadSource head_source = HeadSource::commit; // commit or working tree
    BaseSource base_source = BaseSource::given;  // how the base was chosen
    std::string note;                            // one sentence for the report on how the base was
                                                 // chosen; empty when it was given

    bool operator==(const ResolvedRange& other) const {
        return base == other.base && head == other.head && base_name == other.base_name &&
               head_name == other.head_name && head_source == other.head_source &&
               base_source == other.base_source && note == other.note;
    }
};

// Resolve `range` in `repository` to commits. An empty base becomes the merge base of head and the
// default branch; in a shallow clone where the merge base cannot be computed, the default branch's
// tip is compared directly and the note says so. Throws UsageError for an unknown revision (with
// "did you mean"), for a commit missing from a shallow clone (with the fetch remedy), for a
// missing default branch, for histories without a common ancestor, and for the working tree of
// a bare repository or together with a head other than HEAD; Failure when libgit2 fails.
ResolvedRange resolve_range(const Repository& repository, const RevisionRange& range);

// Return the default branch as resolve_range finds it: `given` when non-empty, else the target
// of refs/remotes/origin/HEAD, else main, master, origin/main or origin/master. Throws UsageError
// when none exists.
std::string default_branch_name(const Repository& repository, const std::string& given);

} // namespace tollgate::walker
