// SPDX-License-Identifier: MIT
// What a calibration counts: the policy whose paths and noise floor it honours, and the folders
// of bundled third-party code it leaves out.
#pragma once

#include "gate/calibrate/vendored.hpp"
#include "gate/policy/policy.hpp"
#include "gate/walker/change_set.hpp"
#include "gate/walker/history.hpp"
#include "gate/walker/repository.hpp"

#include <string>
#include <vector>

namespace tollgate::calibrate {

// Whether folders that look vendored are left out.
enum class VendoredHandling {
    exclude, // left out of the replay and written into a suggested policy's paths.exclude
    keep,    // measured like the team's own code (--keep-vendored)
};

// The policy and folders a calibration honours.
struct CalibrationScope {
    policy::Policy policy; // the chosen policy, with excluded vendored folders added to
                           // paths.exclude; judges every what-if and seeds every suggestion
    std::string origin;    // e.g. "draft.yaml", ".tollgate.yaml at 3f2a91c", "built-in default"
    std::vector<VendoredFolder> vendored; // folders that look vendored, sorted by path
    VendoredHandling handling = VendoredHandling::exclude; // whether `vendored` is left out
    bool draft = false; // the policy is a draft given with --policy (then judged as a what-if)
};

// Return the scope of a calibration of `history` in `repository`: the policy is the file at
// `draft_path` when it is not empty, else `.tollgate.yaml` of the history's newest commit, else
// the built-in default. Vendored folders are looked for in the trees of the newest commit and
// of the oldest commit's first parent. Throws UsageError when the draft cannot be read,
// PolicyError when the chosen policy is broken, Failure when a tree cannot be read.
CalibrationScope choose_scope(const walker::Repository& repository, const walker::History& history,
                              const std::string& draft_path, VendoredHandling handling);

// Add to `scope.policy.paths.exclude` a glob (folder_glob) for each folder of `scope.vendored`
// the policy does not already leave out, when `scope.handling` excludes them. Never fails.
void exclude_vendored(CalibrationScope& scope);

// Return whether `file` is measured under `scope`: outside every excluded vendored folder, and
// inside the policy's paths on its head or base side (the judge then decides per function).
bool keep_changed_file(const CalibrationScope& scope, const walker::ChangedFile& file);

// Return a glob that matches exactly the files below `folder`: "folder/**", with `*`, `?` and
// `[` in the folder's name written as one-character classes so that they match themselves.
std::string folder_glob(const std::string& folder);

// Count, into `scope.vendored`, the changed files and commits of `dropped_per_commit` (the
// dropped paths of each replayed commit) that lie in each vendored folder.
void count_vendored(CalibrationScope& scope,
                    const std::vector<std::vector<std::string>>& dropped_per_commit);

} // namespace tollgate::calibrate
