// SPDX-License-Identifier: MIT
// The built-in default policy, used when a repository has no policy file.
#include "gate/policy/policy.hpp"

namespace tollgate::policy {

namespace {

// Kept as YAML so that "tollgate policy --default" can show the same text, comments included,
// that the program reads. The thresholds are a team's choice: no published source gives
// per-function bands for Halstead measures (common practice, no source).
const char* const k_default_policy_yaml =
    R"(# Tollgate's built-in default policy: used when the repository has no .tollgate.yaml.
# Copy it to .tollgate.yaml and tune it; every threshold is a team's choice (common practice,
# no source: no published study gives per-function bands for Halstead measures).
tollgate-policy: 1          # schema version of this file

judge-with: base            # the base commit's policy judges a change, so a change cannot
                            # loosen its own gate (set "head" to let the change's policy apply)

noise-floor:
  volume: 100               # functions whose base and head volume are both under 100 (about
                            # 20 tokens) are too small for the per-function rules

rules:
  - id: effort-growth       # a changed function may not grow its effort by more than half
    kind: growth
    measure: effort
    max-increase-percent: 50
    level: blocking

  - id: new-function-effort # a new function above this effort deserves a second look
    kind: added-ceiling
    measure: effort
    ceiling: 30000
    level: warning

  - id: difficulty-ceiling  # any touched function this hard to read is pointed out
    kind: ceiling
    measure: difficulty
    ceiling: 60
    level: warning

  - id: change-effort-budget # the whole change's summed effort growth
    kind: budget
    measure: effort
    max-total-increase: 100000
    level: warning

paths:
  include: ["**"]           # every file
  exclude: ["third_party/**", "vendor/**", "**/generated/**"]   # code the team does not write

inactive-code: judge        # functions in #if branches the compiler flags skip are judged like
                            # any other ("warn": their findings never block; "skip": not judged)

unmeasured-lines: off       # changed lines outside every function are listed per file; write
                            # {limit: 40, level: warning} to make more than 40 a finding
)";

} // namespace

const std::string& default_policy_text() {
    static const std::string text = k_default_policy_yaml;
    return text;
}

Policy default_policy() {
    static const Policy policy = load_policy(default_policy_text(), "built-in default");
    return policy;
}

} // namespace tollgate::policy
