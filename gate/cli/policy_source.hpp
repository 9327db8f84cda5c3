// SPDX-License-Identifier: MIT
// Choose the policy that judges a change: the user's file, else the base commit's, else built in.
#pragma once

#include "gate/policy/policy.hpp"
#include "gate/walker/repository.hpp"
#include "gate/walker/revision_range.hpp"

#include <string>
#include <vector>

namespace tollgate {

// The policy chosen for a change, and what the reports say about it.
struct SelectedPolicy {
    policy::Policy policy;            // the policy that judges
    std::string origin;               // e.g. ".tollgate.yaml at base 3f2a91c"
    std::vector<std::string> changes; // differences from base to head policy; empty when equal
    std::string change_summary;       // one sentence when the change edits its policy
    policy::ChangeExemptions change_exemptions =
        policy::ChangeExemptions::refuse; // as the
                                          // base's policy (or the given file) says, never the
                                          // head's
    std::string worktree_hint; // one line when an uncommitted .tollgate.yaml differs from
                               // the base's and does not judge; empty otherwise
};

// Select the policy for `range`. A `given` path (--policy) is read from disk and judges alone.
// Otherwise .tollgate.yaml is read from the base commit's tree and from the head (commit tree or
// working tree); a side without the file has the built-in default. The base policy's
// `judge-with` setting chooses which side judges, so a change cannot loosen its own gate
// unnoticed. Whether the change may exempt itself is always the base's (or the given file's)
// setting. When the working tree holds an uncommitted .tollgate.yaml that differs from the
// base's and does not judge, `worktree_hint` says how to try it. Throws PolicyError (exit 2) when
// the judging policy is broken; a broken head policy that does not judge is reported as a change,
// not an error.
SelectedPolicy select_policy(const walker::Repository& repository,
                             const walker::ResolvedRange& range, const std::string& given);

} // namespace tollgate
