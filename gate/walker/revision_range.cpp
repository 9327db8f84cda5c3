// SPDX-License-Identifier: MIT
// Resolve a revision range to base and head commits: defaults, merge bases and shallow clones.
#include "gate/walker/revision_range.hpp"

#include "gate/common/errors.hpp"
#include "gate/walker/libgit2_api.hpp"
#include "gate/walker/third_party_leak.hpp"

#include <algorithm>
#include <cctype>

namespace tollgate::walker {

namespace {

std::string quoted(const std::string& text) {
    return "\"" + text + "\"";
}

bool is_hex_id(const std::string& text) {
    return text.size() >= 4 && text.size() <= GIT_OID_HEXSZ &&
           std::all_of(text.begin(), text.end(),
                       [](unsigned char c) { return std::isxdigit(c) != 0; });
}

bool is_shallow(const Repository& repository) {
    return git_repository_is_shallow(git::handle_of(repository)) == 1;
}

bool names_existing_reference(const Repository& repository, const std::string& name) {
    git_reference* raw = nullptr;
    if (git_reference_dwim(&raw, git::handle_of(repository), name.c_str()) < 0) {
        return false;
    }
    git_reference_free(raw);
    return true;
}

// Resolve `revision`; in a shallow clone, a commit that history cut off gets the fetch remedy
// instead of "reference not found".
ObjectId resolve_present(const Repository& repository, const std::string& revision,
                         const std::string& role) {
    try {
        return repository.resolve_commit(revision, role);
    } catch (const UsageError& error) {
        // Only "not found" can mean "cut off"; an ambiguous id or a tree keeps its own message.
        const bool not_found =
            std::string(error.what()).find(": reference not found") != std::string::npos;
        if (!not_found || !is_shallow(repository)) {
            throw;
        }
        const bool cut_off = is_hex_id(revision) ||
                             revision.find_first_of("~^") != std::string::npos ||
                             names_existing_reference(repository, revision);
        if (!cut_off) {
            throw;
        }
        const std::string shown = is_hex_id(revision) ? revision.substr(0, 7) : quoted(revision);
        throw UsageError(role + " commit " + shown +
                         " is not in this clone (it is shallow: fetch with depth 0, or run \"git "
                         "fetch --deepen=N\" / \"git fetch --unshallow\")");
    }
}

// The default branch and how it was found.
struct DefaultBranch {
    std::string name;   // a revision naming it, e.g. "origin/main"
    std::string origin; // how it was found, for the note
};

DefaultBranch find_default_branch(const Repository& repository, const std::string& given) {
    if (!given.empty()) {
        return DefaultBranch{given, "given"};
    }
    git_repository* repo = git::handle_of(repository);
    git_reference* raw = nullptr;
    if (git_reference_lookup(&raw, repo, "refs/remotes/origin/HEAD") == 0) {
        const git::Owned<git_reference> remote_head(raw);
        const char* target = git_reference_symbolic_target(raw);
        const std::string prefix = "refs/remotes/";
        if (target != nullptr && std::string(target).rfind(prefix, 0) == 0) {
            return DefaultBranch{std::string(target).substr(prefix.size()),
                                 "taken from refs/remotes/origin/HEAD"};
        }
    }
    for (const char* name : {"refs/heads/main", "refs/heads/master", "refs/remotes/origin/main",
                             "refs/remotes/origin/master"}) {
        if (git_reference_lookup(&raw, repo, name) == 0) {
            git_reference_free(raw);
            const std::string full = name;
            const std::string short_name = full.substr(full.find('/', 5) + 1);
            return DefaultBranch{short_name, "found by name"};
        }
    }
    throw UsageError("no default branch found: none of \"origin/HEAD\", \"main\", \"master\", "
                     "\"origin/main\", \"origin/master\" exists (pass --base, or fetch the "
                     "default branch)");
}

} // namespace

std::string default_branch_name(const Repository& repository, const std::string& given) {
    return find_default_branch(repository, given).name;
}

ResolvedRange resolve_range(const Repository& repository, const RevisionRange& range) {
    ResolvedRange resolved;
    const std::string head_name = range.head.empty() ? "HEAD" : range.head;
    if (range.worktree) {
        if (repository.is_bare()) {
            throw UsageError("a bare repository has no working tree to compare (drop --worktree)");
        }
        if (head_name != "HEAD") {
            throw UsageError("head " + quoted(head_name) +
                             " cannot be combined with the working tree (drop --head or "
                             "--worktree)");
        }
        resolved.head_source = HeadSource::worktree;
        resolved.head_name = "working tree";
        resolved.base_name = range.base.empty() ? "HEAD" : range.base;
        resolved.base = resolve_present(repository, resolved.base_name, "base");
        resolved.base_source = BaseSource::given;
        return resolved;
    }
    resolved.head_name = head_name;
    resolved.head = resolve_present(repository, head_name, "head");
    if (!range.base.empty()) {
        resolved.base_name = range.base;
        resolved.base = resolve_present(repository, range.base, "base");
        resolved.base_source = BaseSource::given;
        return resolved;
    }

    const DefaultBranch branch = find_default_branch(repository, range.default_branch);
    const ObjectId tip = resolve_present(repository, branch.name, "default branch");
    resolved.base_name = branch.name;
    const git_oid head_id = git::to_git_oid(resolved.head);
    const git_oid tip_id = git::to_git_oid(tip);
    git_oid merge_base{};
    int code = 0;
    {
        const ThirdPartyLeakExemption exemption;
        code = git_merge_base(&merge_base, git::handle_of(repository), &head_id, &tip_id);
    }
    if (code == 0) {
        resolved.base = git::to_object_id(merge_base);
        resolved.base_source = BaseSource::merge_base;
        resolved.note = "base is " + resolved.base.short_hex() + ", the merge base of " +
                        quoted(head_name) + " and the default branch " + quoted(branch.name) +
                        " (" + branch.origin + ")";
        return resolved;
    }
    // A shallow clone cuts history: libgit2 1.5 does not honour the shallow boundary while
    // walking, so the search fails with an object-database error (or finds nothing). Both tips
    // are present, so a direct comparison still works.
    if (is_shallow(repository)) {
        resolved.base = tip;
        resolved.base_source = BaseSource::default_branch;
        resolved.note = "merge base unavailable in this shallow clone: compared base and head "
                        "directly (base is the tip of the default branch " +
                        quoted(branch.name) + ")";
        return resolved;
    }
    if (code == GIT_ENOTFOUND) {
        throw UsageError("head " + quoted(head_name) + " and the default branch " +
                         quoted(branch.name) + " have no common ancestor (pass --base)");
    }
    git::check(code, "cannot compute the merge base of " + quoted(head_name) + " and " +
                         quoted(branch.name));
    return resolved;
}

} // namespace tollgate::walker
