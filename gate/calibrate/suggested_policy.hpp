// SPDX-License-Identifier: MIT
// The text of a suggested policy: a comment saying where every limit came from, then the policy
// in the canonical form `tollgate policy` prints.
#pragma once

#include "gate/calibrate/block_rate.hpp"
#include "gate/calibrate/calibration_scope.hpp"
#include "gate/calibrate/distribution.hpp"
#include "gate/calibrate/replay.hpp"

#include <string>
#include <vector>

namespace tollgate::calibrate {

// Return the policy of `scope` with its rules replaced by limits at the `p`-th percentile of
// `distributions` (per measure a blocking growth rule with max-increase and
// max-increase-percent, and a warning added-ceiling rule), each rounded to two decimals; a
// percentile below zero is raised to zero (a limit cannot be negative). A measure without
// samples gets no rule. Throws UsageError when `p` is not in [0, 100].
policy::Policy percentile_policy(const std::vector<MeasureDistribution>& distributions, double p,
                                 const policy::Policy& scope);

// Return the text of `percentile_policy(distributions, p, scope.policy)`: a comment naming the
// history and, per limit, the percentile it is, then the policy as describe_policy writes it
// (the noise floor and path excludes of `scope` included). Throws as percentile_policy.
std::string percentile_policy_text(const Replay& replay,
                                   const std::vector<MeasureDistribution>& distributions, double p,
                                   const CalibrationScope& scope);

// Return the text of `suggestion`: a comment with its replayed block and warning rates, sample
// size, each searched limit, the folders left out as vendored and, for a small sample, a
// warning; then the policy as describe_policy writes it. Never throws.
std::string block_rate_policy_text(const Replay& replay, const BlockRateSuggestion& suggestion,
                                   const CalibrationScope& scope);

// Return the small-sample warning of `suggestion` (one sentence), or empty when the sample is
// large enough.
std::string small_sample_warning(const BlockRateSuggestion& suggestion);

} // namespace tollgate::calibrate
