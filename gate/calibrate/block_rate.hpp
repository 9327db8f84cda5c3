// SPDX-License-Identifier: MIT
// A policy whose limits are searched on the replayed history so that at most a given share of
// its commits would have been blocked.
#pragma once

#include "gate/calibrate/distribution.hpp"
#include "gate/calibrate/replay.hpp"
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"

#include <cstddef>
#include <string>
#include <vector>

namespace tollgate::calibrate {

// Below this many judged commits a suggestion carries a small-sample warning: one commit then
// moves the block rate by more than one percentage point.
constexpr std::size_t k_min_sample_commits = 100;
// Below this many judged functions a suggestion carries a small-sample warning: the limits then
// rest on a few dozen values per rule (common practice, no source).
constexpr std::size_t k_min_sample_functions = 300;

// Which limit of a rule.
enum class LimitKey { max_increase, max_increase_percent, ceiling, max_total_increase };

// Return the policy key of `key`, e.g. "max-increase-percent".
const char* limit_key_name(LimitKey key);

// One limit the search set.
struct SearchedLimit {
    std::string rule_id;                   // the rule
    LimitKey key = LimitKey::max_increase; // which of its limits
    double value = 0;                      // the limit written (see readable_ceiling)
    std::size_t commits_with_values = 0;   // commits with a value this limit judges
    std::size_t commits_above = 0;         // of which the limit alone flags this many
    bool searched = true;                  // false: no replayed value, the limit was kept
};

// What a level group of rules was searched for and what it gave.
struct SearchTarget {
    double percent = 0;      // the most commits (percent of those judged) it may flag
    std::size_t allowed = 0; // that as a count of commits
    bool reached = true;     // false: even the loosest limits flag more (they are then kept there)
};

// A suggested policy and its replayed figures.
struct BlockRateSuggestion {
    policy::Policy policy;             // the scope policy with its limits searched
    SearchTarget blocking;             // for blocking rules: blocked commits
    SearchTarget warning;              // for warning rules: commits that pass with warnings
    std::vector<SearchedLimit> limits; // in policy order
    WhatIf replayed;                   // the suggestion itself judged on the replay
    std::size_t commits = 0;           // commits judged
    std::size_t functions = 0;         // touched functions inside the paths, above the noise floor
    bool small_sample = false;         // commits or functions under the documented minimums
};

// Return `value` rounded up as a person would write a limit: to two decimals below 100, to a
// whole number from 100 up; never below `value`, never negative. Never fails.
double readable_ceiling(double value);

// Return `count` as a percentage of `total` (0 when `total` is 0).
double rate_percent(std::size_t count, std::size_t total);

// Search the limits of `scope`'s rules on `replay` (judged as `options` says): the blocking rules
// first, for the strictest limits under which at most `block_percent` of the commits would be
// blocked; then the warning rules, for the strictest under which at most `warning_percent` would
// pass with warnings. Within a group every limit is the (j+1)-th largest per-commit value it
// judges (the largest value a commit holds for that rule), rounded up; the largest j whose
// replayed rate keeps to the target is found by bisection (the rate only grows with j), so the
// result is the same on every run. A rule without any replayed value keeps its limits. Paths,
// per-path blocks, the noise floor and waivers of `scope` apply, as check applies them. Throws
// UsageError when a percentage is not in [0, 100].
BlockRateSuggestion suggest_for_block_rate(const Replay& replay, const policy::Policy& scope,
                                           double block_percent, double warning_percent,
                                           const policy::JudgeOptions& options);

} // namespace tollgate::calibrate
