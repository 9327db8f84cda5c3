// SPDX-License-Identifier: MIT
// Reading the judging policy from the user's path, the base tree or the head.
#include "gate/cli/policy_source.hpp"

#include "gate/common/disk_file.hpp"
#include "gate/common/errors.hpp"

#include <filesystem>
#include <fstream>
#include <optional>
#include <sstream>

namespace tollgate {

namespace {

// A policy file as found on one side.
struct SidePolicy {
    std::optional<std::string> text; // the file's text; empty when the side has no file
    std::string origin;              // where it was read, for messages
};

SidePolicy read_head_policy(const walker::Repository& repository,
                            const walker::ResolvedRange& range) {
    SidePolicy side;
    if (range.head_source == walker::HeadSource::worktree) {
        const std::filesystem::path path =
            std::filesystem::path(repository.workdir()) / policy::k_default_policy_path;
        side.origin = std::string(policy::k_default_policy_path) + " in the working tree";
        std::ifstream in(path, std::ios::binary);
        if (in) {
            std::ostringstream text;
            text << in.rdbuf();
            side.text = text.str();
        }
        return side;
    }
    side.origin = std::string(policy::k_default_policy_path) + " at head " + range.head.short_hex();
    if (auto file = repository.read_file(range.head, policy::k_default_policy_path)) {
        side.text = file->content;
    }
    return side;
}

// A policy being drafted in the working tree is not what judges a commit range: say how to try
// it, once, when it differs from the base's.
std::string worktree_policy_hint(const walker::Repository& repository,
                                 const walker::ResolvedRange& range,
                                 const std::optional<std::string>& base_text,
                                 bool judge_with_head) {
    if (repository.is_bare() ||
        (range.head_source == walker::HeadSource::worktree && judge_with_head)) {
        return {};
    }
    const DiskFile draft = read_regular_file(
        (std::filesystem::path(repository.workdir()) / policy::k_default_policy_path).string());
    if (draft.entry != DiskEntry::regular || (base_text && *base_text == draft.content)) {
        return {};
    }
    if (range.head_source == walker::HeadSource::commit) {
        const auto head = repository.read_file(range.head, policy::k_default_policy_path);
        if (head && head->content == draft.content) {
            return {}; // committed: the report's policy-change block covers it
        }
    }
    return std::string("the working tree's ") + policy::k_default_policy_path +
           " differs from the base's and does not judge this change (try it with \"--policy " +
           policy::k_default_policy_path + "\")";
}

} // namespace

SelectedPolicy select_policy(const walker::Repository& repository,
                             const walker::ResolvedRange& range, const std::string& given) {
    SelectedPolicy selected;
    if (!given.empty()) {
        selected.policy = policy::load_policy_file(given);
        selected.origin = given;
        selected.change_exemptions = selected.policy.change_exemptions;
        return selected;
    }
    SidePolicy base;
    base.origin = std::string(policy::k_default_policy_path) + " at base " + range.base.short_hex();
    if (auto file = repository.read_file(range.base, policy::k_default_policy_path)) {
        base.text = file->content;
    }
    const SidePolicy head = read_head_policy(repository, range);

    const policy::Policy base_policy =
        base.text ? policy::load_policy(*base.text, base.origin) : policy::default_policy();
    const std::string base_origin =
        base.text
            ? base.origin
            : "built-in default (no " + std::string(policy::k_default_policy_path) + " at base)";
    const bool judge_with_head = base_policy.judge_with == policy::JudgeWith::head;
    selected.change_exemptions = base_policy.change_exemptions;
    selected.worktree_hint = worktree_policy_hint(repository, range, base.text, judge_with_head);

    if (base.text == head.text) {
        selected.policy = base_policy;
        selected.origin = base_origin;
        return selected;
    }
    // The change edits its own policy: say so, and judge with the side the base allows.
    std::optional<policy::Policy> head_policy;
    std::string head_error;
    try {
        head_policy =
            head.text ? policy::load_policy(*head.text, head.origin) : policy::default_policy();
    } catch (const policy::PolicyError& e) {
        if (judge_with_head) {
            throw;
        }
        head_error = e.what();
    }
    if (head_policy) {
        selected.changes = policy::policy_difference(base_policy, *head_policy);
    } else {
        selected.changes.push_back("the head's policy does not load: " + head_error);
    }
    const std::string edited = head.text ? (base.text ? "edits" : "adds") : "removes";
    if (judge_with_head && head_policy) {
        selected.policy = *head_policy;
        selected.origin = head.text ? head.origin : "built-in default (no policy file at head)";
        selected.change_summary = "this change " + edited + " " + policy::k_default_policy_path +
                                  "; the head's policy judges it (judge-with: head in the base's "
                                  "policy)";
    } else {
        selected.policy = base_policy;
        selected.origin = base_origin;
        selected.change_summary = "this change " + edited + " " + policy::k_default_policy_path +
                                  "; the base's policy judges it until the change is merged";
    }
    if (selected.changes.empty()) {
        selected.changes.push_back("no effective difference (comments or layout only)");
    }
    return selected;
}

} // namespace tollgate
