// SPDX-License-Identifier: MIT
// The policy engine: judge a change report against a policy, giving findings and a verdict.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/policy/policy.hpp"
#include "gate/policy/verdict.hpp"

#include <functional>
#include <optional>
#include <string>

namespace tollgate::policy {

// Settings of one judgement that do not come from the policy file.
struct JudgeOptions {
    std::string today;         // YYYY-MM-DD; a waiver expires after its date (see current_date)
    std::string policy_origin; // copied into Verdict::policy_origin, e.g. "built-in default"
    // Return a function's measures in the baseline snapshot by its identity, or nothing when it
    // is not there. Used only when the policy grandfathers; may be empty.
    std::function<std::optional<core::Measures>(const std::string& identity)> baseline_lookup;
};

// Judge `report` against `policy`: apply every rule to the functions in scope, with path
// overrides, the noise floor and waivers. Return the findings (blocking first, then warnings,
// grandfathered last; each by path and line, then in policy order; budgets after functions)
// and the outcome (blocked when any non-grandfathered finding blocks). Notes name waived
// findings, expired waivers, waivers that waived nothing, and functions out of scope or below
// the noise floor. An empty report passes. Throws UsageError when `options.today` is not a
// YYYY-MM-DD date.
Verdict judge(const Policy& policy, const delta::ChangeReport& report, const JudgeOptions& options);

// Return whether a file at `path` is judged: it matches an include glob and no exclude glob.
bool in_scope(const PathScope& paths, const std::string& path);

// Return whether `f` is below every entry of `floors` on each side it has (and so not judged by
// per-function rules). An empty list holds no function below it.
bool below_noise_floor(const std::vector<NoiseFloor>& floors, const delta::FunctionDelta& f);

// Whether a formatted amount shows "+" before positive values.
enum class Sign {
    as_is,  // "18,400", "-3"
    always, // "+18,400", "-3"
};

// Return `value` for a reader: thousands separators from 100 up ("18,400"), else up to three
// significant digits ("41.3", "0.052"). Never fails.
std::string format_amount(double value, Sign sign);

} // namespace tollgate::policy
