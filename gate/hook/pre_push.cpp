// SPDX-License-Identifier: MIT
// Parse git's pre-push input and choose a base and head for each pushed ref by asking git.
#include "gate/hook/pre_push.hpp"

#include "gate/common/errors.hpp"
#include "gate/hook/process.hpp"

#include <sstream>

namespace tollgate::hook {

namespace {

std::string trim(const std::string& text) {
    const auto first = text.find_first_not_of(" \t\r\n");
    if (first == std::string::npos) {
        return {};
    }
    const auto last = text.find_last_not_of(" \t\r\n");
    return text.substr(first, last - first + 1);
}

// Run git with `args`; return its trimmed output, or nothing when it exits non-zero.
bool ask_git(const std::vector<std::string>& args, std::string& out) {
    std::vector<std::string> argv = {"git"};
    argv.insert(argv.end(), args.begin(), args.end());
    const ProcessResult result = run_process(argv, Output::capture);
    out = trim(result.out);
    return result.exit_code == 0;
}

bool has_commit(const std::string& sha) {
    std::string ignored;
    return ask_git({"cat-file", "-e", "--end-of-options", sha + "^{commit}"}, ignored);
}

// Return whether `sha` is a full object id: 40 (SHA-1) or 64 (SHA-256) lowercase hex digits.
bool is_object_id(const std::string& sha) {
    return (sha.size() == 40 || sha.size() == 64) &&
           sha.find_first_not_of("0123456789abcdef") == std::string::npos;
}

// Return the remote's default branch as a remote-tracking ref, or empty when none is known.
std::string remote_default_branch(const std::string& remote) {
    std::string target;
    if (ask_git({"symbolic-ref", "--quiet", "refs/remotes/" + remote + "/HEAD"}, target) &&
        !target.empty()) {
        return target;
    }
    for (const char* name : {"main", "master"}) {
        const std::string ref = "refs/remotes/" + remote + "/" + name;
        if (ask_git({"rev-parse", "--verify", "--quiet", "--end-of-options", ref + "^{commit}"},
                    target)) {
            return ref;
        }
    }
    return {};
}

std::string short_sha(const std::string& sha) {
    return sha.substr(0, 7);
}

// Plan a ref whose remote side is unknown here: a new branch, or a remote commit not fetched.
RefPlan plan_new_history(RefPlan plan, const std::string& remote) {
    const std::string& head = plan.ref.local_sha;
    const std::string default_ref = remote_default_branch(remote);
    std::string base;
    if (!default_ref.empty() &&
        ask_git({"merge-base", "--end-of-options", head, default_ref}, base) && !base.empty()) {
        plan.reason = "merge base with " + default_ref.substr(std::string("refs/remotes/").size());
    } else {
        std::string listed;
        ask_git({"rev-list", "--reverse", head, "--not", "--remotes"}, listed);
        const std::string first = listed.substr(0, listed.find('\n'));
        if (first.empty()) {
            plan.action = RefAction::skip;
            plan.reason = "every commit is on a remote-tracking ref already";
            return plan;
        }
        if (!ask_git({"rev-parse", "--verify", "--quiet", "--end-of-options", first + "^1"},
                     base) ||
            base.empty()) {
            plan.action = RefAction::skip;
            plan.reason = "its history has no commit on a remote to compare with";
            return plan;
        }
        plan.reason =
            "parent of " + short_sha(first) + ", the first commit not on a remote-tracking ref";
    }
    if (base == head) {
        plan.action = RefAction::skip;
        plan.reason = "no new commit on top of " + short_sha(base);
        return plan;
    }
    plan.base = base;
    plan.head = head;
    return plan;
}

// The ids reach git's command line: only full hexadecimal object ids pass.
void check_object_ids(const PushedRef& ref, int number) {
    for (const std::string* sha : {&ref.local_sha, &ref.remote_sha}) {
        if (!is_object_id(*sha)) {
            throw UsageError("pre-push input line " + std::to_string(number) +
                             ": expected a full hexadecimal object id, got \"" + *sha +
                             "\" (is the hook called by git?)");
        }
    }
}

} // namespace

bool is_tag_push(const PushedRef& ref) {
    const std::string tags = "refs/tags/";
    return ref.remote_ref.rfind(tags, 0) == 0 || ref.local_ref.rfind(tags, 0) == 0;
}

HookMode parse_hook_mode(const std::string& value) {
    if (value.empty() || value == "judge") {
        return HookMode::judge;
    }
    if (value == "warn") {
        return HookMode::warn;
    }
    if (value == "off") {
        return HookMode::off;
    }
    throw UsageError(std::string(k_hook_mode_variable) + " must be \"judge\", \"warn\" or " +
                     "\"off\", not \"" + value + "\" (unset it to judge the push)");
}

bool is_null_sha(const std::string& sha) {
    return !sha.empty() && sha.find_first_not_of('0') == std::string::npos;
}

std::vector<PushedRef> parse_pushed_refs(const std::string& text) {
    std::vector<PushedRef> refs;
    std::istringstream lines(text);
    std::string line;
    for (int number = 1; std::getline(lines, line); ++number) {
        if (trim(line).empty()) {
            continue;
        }
        std::istringstream fields(line);
        PushedRef ref;
        std::string extra;
        if (!(fields >> ref.local_ref >> ref.local_sha >> ref.remote_ref >> ref.remote_sha) ||
            (fields >> extra)) {
            throw UsageError("pre-push input line " + std::to_string(number) + ": expected \"" +
                             "LOCAL-REF LOCAL-SHA REMOTE-REF REMOTE-SHA\", got \"" + trim(line) +
                             "\" (is the hook called by git?)");
        }
        check_object_ids(ref, number);
        refs.push_back(ref);
    }
    return refs;
}

RefPlan plan_ref(const PushedRef& ref, const std::string& remote) {
    RefPlan plan;
    plan.ref = ref;
    if (is_null_sha(ref.local_sha)) {
        plan.action = RefAction::skip;
        plan.reason = "the ref is deleted";
        return plan;
    }
    if (is_null_sha(ref.remote_sha) || !has_commit(ref.remote_sha)) {
        return plan_new_history(plan, remote);
    }
    if (ref.remote_sha == ref.local_sha) {
        plan.action = RefAction::skip;
        plan.reason = "the remote has this commit already";
        return plan;
    }
    plan.base = ref.remote_sha;
    plan.head = ref.local_sha;
    plan.reason = "the remote's " + ref.remote_ref;
    return plan;
}

} // namespace tollgate::hook
