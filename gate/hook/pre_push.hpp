// SPDX-License-Identifier: MIT
// git's pre-push protocol: the refs a push updates, and the base and head each one is judged on.
#pragma once

#include <string>
#include <vector>

namespace tollgate::hook {

// One line of the pre-push hook's standard input.
struct PushedRef {
    std::string local_ref;  // e.g. "refs/heads/feature", or "(delete)" for a deletion
    std::string local_sha;  // the commit pushed; all zeros when the remote ref is deleted
    std::string remote_ref; // the ref updated on the remote
    std::string remote_sha; // its current commit on the remote; all zeros when it is new
    bool operator==(const PushedRef& other) const {
        return local_ref == other.local_ref && local_sha == other.local_sha &&
               remote_ref == other.remote_ref && remote_sha == other.remote_sha;
    }
};

// Parse the pre-push standard input `text` (one ref per line, four fields separated by spaces).
// Blank lines are skipped; an empty input yields none. Throws UsageError naming the line when a
// line does not have four fields or an object id is not 40 or 64 lowercase hex digits (ids are
// passed to git, so nothing that could read as an option gets through).
std::vector<PushedRef> parse_pushed_refs(const std::string& text);

// Return true when `sha` is an all-zero object id (git's "no such ref").
bool is_null_sha(const std::string& sha);

// Return true when `ref` pushes a tag (its remote or local ref is under refs/tags/).
bool is_tag_push(const PushedRef& ref);

// The variable a person sets to change one run of the hook: "off" lets the push through without
// judging it, "warn" judges it without blocking, "judge" (or unset) judges and may block.
inline constexpr const char* k_hook_mode_variable = "TOLLGATE_HOOK";

// What one run of the hook does.
enum class HookMode {
    judge, // judge every pushed ref; a blocking finding stops the push
    warn,  // judge every pushed ref in advisory mode: "would block", the push goes ahead
    off,   // judge nothing: the push goes ahead (a bypass for this one push)
};

// Return the mode `value` of k_hook_mode_variable names (empty: judge). Throws UsageError naming
// the values when `value` is none of them.
HookMode parse_hook_mode(const std::string& value);

// What the hook does with one pushed ref.
enum class RefAction {
    check, // judge the commits from `base` to `head`
    skip,  // nothing to judge; `reason` says why
};

// The judgement plan for one pushed ref.
struct RefPlan {
    PushedRef ref;                       // the ref as git announced it
    RefAction action = RefAction::check; // check or skip
    std::string base;                    // base commit id (check only)
    std::string head;                    // head commit id (check only)
    std::string reason;                  // how the base was chosen, or why the ref is skipped
};

// Plan `ref` for a push to `remote` by asking git in the current folder: a deleted ref is
// skipped; an updated ref is judged from the remote's commit when this clone has it; a new
// branch (or a remote commit this clone lacks) from its merge base with the remote's default
// branch (refs/remotes/REMOTE/HEAD, else REMOTE/main, else REMOTE/master), else from the parent
// of the first pushed commit not on any remote-tracking ref. A ref whose commits are all on the
// remote already, or whose history has no commit to compare with, is skipped. Throws Failure
// when git cannot be run.
RefPlan plan_ref(const PushedRef& ref, const std::string& remote);

} // namespace tollgate::hook
