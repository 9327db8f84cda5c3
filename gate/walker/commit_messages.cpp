// SPDX-License-Identifier: MIT
// A revision walk over a change's own commits, reading their messages.
#include "gate/walker/commit_messages.hpp"

#include "gate/walker/libgit2_api.hpp"
#include "gate/walker/third_party_leak.hpp"

namespace tollgate::walker {

namespace {

struct DisposeWalk {
    void operator()(git_revwalk* handle) const { git_revwalk_free(handle); }
};

} // namespace

std::vector<CommitMessage> commit_messages(const Repository& repository, const ObjectId& base,
                                           const ObjectId& head, std::size_t limit) {
    git::ensure_started();
    git_repository* repo = git::handle_of(repository);
    git_revwalk* raw = nullptr;
    git::check(git_revwalk_new(&raw, repo), "cannot start a history walk");
    const std::unique_ptr<git_revwalk, DisposeWalk> walk(raw);
    git::check(git_revwalk_sorting(walk.get(), GIT_SORT_TOPOLOGICAL | GIT_SORT_TIME),
               "cannot sort the history walk");
    const git_oid head_id = git::to_git_oid(head);
    git::check(git_revwalk_push(walk.get(), &head_id), "cannot walk from " + head.short_hex());
    const git_oid base_id = git::to_git_oid(base);
    git::check(git_revwalk_hide(walk.get(), &base_id), "cannot hide " + base.short_hex());

    std::vector<CommitMessage> messages;
    git_oid id{};
    const auto next = [&] {
        const ThirdPartyLeakExemption exemption; // a shallow clone's boundary (see there)
        return git_revwalk_next(&id, walk.get());
    };
    while (messages.size() < limit && next() == 0) {
        git_commit* commit_raw = nullptr;
        git::check(git_commit_lookup(&commit_raw, repo, &id), "cannot read a commit");
        const git::Owned<git_commit> commit(commit_raw);
        const char* message = git_commit_message(commit.get());
        messages.push_back({git::to_object_id(id), message == nullptr ? "" : message});
    }
    return messages;
}

} // namespace tollgate::walker
