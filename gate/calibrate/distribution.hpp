// SPDX-License-Identifier: MIT
// What a replayed history says: per-measure distributions, what a policy would have done, and a
// policy whose thresholds sit at a percentile of the history.
#pragma once

#include "gate/calibrate/replay.hpp"
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "tollgate/core/measures.hpp"

#include <array>
#include <cstddef>
#include <map>
#include <string>
#include <vector>

namespace tollgate::calibrate {

// Return the `p`-th percentile (0..100) of `sorted` (ascending) by linear interpolation between
// the closest ranks: h = (n - 1) p / 100, x[floor h] + (h - floor h) (x[floor h + 1] - x[floor h])
// (numpy's default "linear", R's type 7, Python's statistics.quantiles(method="inclusive")).
// Returns 0 for an empty list.
double percentile(const std::vector<double>& sorted, double p);

// The percentiles a report shows, in this order.
inline constexpr std::array<double, 5> k_report_percentiles = {50, 75, 90, 95, 99};

// A summary of one list of values.
struct Summary {
    std::size_t count = 0;      // values summarised
    std::array<double, 5> at{}; // the k_report_percentiles, in order; 0 when empty
    double max = 0;             // largest value; 0 when empty
    double min = 0;             // smallest value; 0 when empty
};

// Return the summary of `values` (any order). Empty values give an all-zero summary.
Summary summarize(std::vector<double> values);

// One value with the commit and function behind it.
struct Sample {
    double value = 0;         // the growth, percent growth or added value
    std::size_t commit = 0;   // index into Replay::commits
    std::size_t function = 0; // index into that commit's report.functions
};

// One bar of a histogram: values in [low, high), the last bar closed at both ends.
struct Bin {
    double low = 0;        // lower bound
    double high = 0;       // upper bound
    std::size_t count = 0; // values inside
    bool overflow = false; // the bar for values above the 99th percentile
};

// Return a histogram of `values`: 12 equal-width bars from the smallest value to the 99th
// percentile, and one more for values above it when there are any. Empty values give no bars.
std::vector<Bin> histogram(const std::vector<double>& values);

// The distributions of one measure over a replay.
struct Series {
    std::vector<Sample> samples; // in replay order
    Summary summary;             // of the samples' values
    std::vector<Bin> bins;       // histogram of the samples' values
    std::vector<Sample> largest; // up to 5 samples with the largest values, largest first
};

// Every distribution of one measure.
struct MeasureDistribution {
    core::MeasureId measure = core::MeasureId::effort; // the measure
    Series growth;         // head - base of changed functions (label changed or moved), every one
                           // of them: zero and negative changes included
    Series growth_percent; // 100 (head - base) / base of the same functions, those with base > 0
    Series added;          // head value of added functions
};

// Return the distributions of `measures` over `replay`. With `honour`, only functions inside its
// paths (include and exclude) and not below its noise floor count; null counts every function.
std::vector<MeasureDistribution> distribute(const Replay& replay,
                                            const std::vector<core::MeasureId>& measures,
                                            const policy::Policy* honour = nullptr);

// What a policy would have said about one replayed commit.
struct CommitJudgement {
    std::size_t commit = 0;                          // index into Replay::commits
    policy::Outcome outcome = policy::Outcome::pass; // pass or blocked
    std::size_t warnings = 0;                        // warning findings
    std::vector<std::string> rules; // ids of the rules with findings, in policy order
};

// What a policy would have done to the replayed history.
struct WhatIf {
    std::string policy_origin;                       // the policy file
    std::size_t judged = 0;                          // commits judged
    std::size_t blocked = 0;                         // of which blocked
    std::size_t warned = 0;                          // of which passed with warnings
    std::map<std::string, std::size_t> rule_commits; // per rule id: commits with a finding of it
    std::vector<CommitJudgement> flagged;            // blocked or warned commits, in replay order
};

// Judge every commit of `replay` with `policy` (judged as check judges: `options.today` decides
// waivers). Never throws for a valid policy.
WhatIf what_if(const Replay& replay, const policy::Policy& policy,
               const policy::JudgeOptions& options);

// Return "a1b2c3d..f4e5d6a" for the replayed commits (first..last), or "no commits".
std::string replay_span(const Replay& replay);

} // namespace tollgate::calibrate
