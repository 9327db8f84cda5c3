// SPDX-License-Identifier: MIT
// A first-parent revision walk with libgit2.
#include "gate/walker/history.hpp"

#include "gate/walker/libgit2_api.hpp"
#include "gate/walker/revision_range.hpp"

#include <algorithm>

namespace tollgate::walker {

namespace {

struct DisposeWalk {
    void operator()(git_revwalk* handle) const { git_revwalk_free(handle); }
};

std::string subject_of(const git_commit* commit) {
    const char* summary = git_commit_summary(const_cast<git_commit*>(commit));
    return summary == nullptr ? std::string() : std::string(summary);
}

} // namespace

History first_parent_history(const Repository& repository, const HistoryQuery& query) {
    git::ensure_started();
    git_repository* repo = git::handle_of(repository);
    History history;
    std::string hide;
    if (query.range.empty()) {
        history.tip_name = default_branch_name(repository, query.default_branch);
    } else {
        const auto dots = query.range.find("..");
        if (dots == std::string::npos) {
            history.tip_name = query.range;
        } else {
            hide = query.range.substr(0, dots);
            history.tip_name = query.range.substr(dots + 2);
            if (history.tip_name.empty()) {
                history.tip_name = "HEAD";
            }
        }
    }
    const ObjectId tip = repository.resolve_commit(history.tip_name, "range end");

    git_revwalk* raw = nullptr;
    git::check(git_revwalk_new(&raw, repo), "cannot start a history walk");
    const std::unique_ptr<git_revwalk, DisposeWalk> walk(raw);
    git::check(git_revwalk_sorting(walk.get(), GIT_SORT_TOPOLOGICAL),
               "cannot sort the history walk");
    git::check(git_revwalk_simplify_first_parent(walk.get()), "cannot follow first parents");
    const git_oid tip_id = git::to_git_oid(tip);
    git::check(git_revwalk_push(walk.get(), &tip_id), "cannot walk from " + tip.short_hex());
    if (!hide.empty()) {
        const git_oid hide_id = git::to_git_oid(repository.resolve_commit(hide, "range start"));
        git::check(git_revwalk_hide(walk.get(), &hide_id), "cannot hide " + hide);
    }

    git_oid id{};
    while (git_revwalk_next(&id, walk.get()) == 0) {
        git_commit* commit_raw = nullptr;
        git::check(git_commit_lookup(&commit_raw, repo, &id), "cannot read a commit");
        const git::Owned<git_commit> commit(commit_raw);
        HistoryCommit entry;
        entry.id = git::to_object_id(id);
        entry.parent_count = git_commit_parentcount(commit.get());
        if (entry.parent_count > 0) {
            entry.parent = git::to_object_id(*git_commit_parent_id(commit.get(), 0));
        }
        entry.subject = subject_of(commit.get());
        entry.time = static_cast<std::int64_t>(git_commit_time(commit.get()));
        if (query.since && entry.time < *query.since) {
            continue;
        }
        history.commits.push_back(std::move(entry));
        if (query.max_commits != 0 && history.commits.size() >= query.max_commits) {
            break;
        }
    }
    std::reverse(history.commits.begin(), history.commits.end());
    return history;
}

} // namespace tollgate::walker
