// SPDX-License-Identifier: MIT
// What the policy says about a change: findings (data, not errors) and the outcome.
#pragma once

#include "tollgate/core/measures.hpp"

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::policy {

// How much a rule's finding weighs.
enum class Level {
    blocking, // a finding blocks the change (exit 1)
    warning,  // a finding is reported, the change passes
};

// The kind of rule a finding comes from.
enum class RuleKind {
    growth,           // a changed function's measure grew more than allowed
    added_ceiling,    // an added function's measure is above the ceiling
    ceiling,          // a touched function's head value is above the ceiling
    budget,           // the whole change's summed increase is above the budget
    unmeasured_lines, // the change's C/C++ lines outside every measured function are above the
                      // policy's "unmeasured-lines" limit (not a rule of "rules")
};

// The verdict of the whole change.
enum class Outcome {
    pass,    // no blocking finding (warnings allowed): exit 0
    blocked, // at least one blocking finding: exit 1
};

// Return "blocking" or "warning".
const char* level_name(Level level);
// Return the rule kind's policy key ("growth", "added-ceiling", "ceiling", "budget"), or
// "unmeasured-lines" for the policy key of that name.
const char* rule_kind_name(RuleKind kind);
// Return "pass" or "blocked".
const char* outcome_name(Outcome outcome);

// One rule broken by one function (or by the whole change, for a budget).
struct Finding {
    std::string rule_id;              // the id the team gave the rule, e.g. "effort-growth"
    RuleKind kind = RuleKind::growth; // what kind of rule
    Level level = Level::blocking;    // its weight
    core::MeasureId measure = core::MeasureId::effort; // the measure judged
    std::string function;                              // qualified name; empty for a budget finding
    std::string signature;      // parameter types; empty for a budget finding
    std::string path;           // head path (base path for a removed function); empty for budget
    unsigned start_line = 0;    // head extent's first line; 0 for budget
    unsigned end_line = 0;      // head extent's last line; 0 for budget
    double value = 0;           // the judged value (a growth, a head value or a sum)
    double limit = 0;           // the limit it broke
    double excess = 0;          // value - limit
    bool percent = false;       // value, limit and excess are percentages
    std::string message;        // the finding in words a reviewer understands, e.g.
                                // "src/filter.cpp:120: Kalman::update(): effort +18,400 (+61%)
                                // exceeds +40% (rule \"effort-growth\")"
    bool grandfathered = false; // above a ceiling already in the baseline; reported, not blocking

    // Return true when this finding blocks the change: a blocking rule, not grandfathered.
    bool blocks() const { return level == Level::blocking && !grandfathered; }

    bool operator==(const Finding& other) const {
        return rule_id == other.rule_id && kind == other.kind && level == other.level &&
               measure == other.measure && function == other.function &&
               signature == other.signature && path == other.path &&
               start_line == other.start_line && end_line == other.end_line &&
               value == other.value && limit == other.limit && excess == other.excess &&
               percent == other.percent && message == other.message &&
               grandfathered == other.grandfathered;
    }
};

// The policy's judgement of one change.
struct Verdict {
    Outcome outcome = Outcome::pass; // pass or blocked
    std::vector<Finding> findings;   // blocking first, then warnings; each by path and line
    std::vector<std::string> notes;  // sentences for every report: expired waivers, waivers that
                                     // matched nothing, functions waived, policy differences
    std::string policy_origin;       // where the judging policy came from, e.g.
                                     // ".tollgate.yaml at base 3f2a91c" or "built-in default"
    std::vector<std::string> policy_changes; // when the head's policy differs from the base's:
                                             // one line per difference; empty otherwise
    std::string policy_change_summary;       // one sentence saying the change edits its policy and
                                             // which side judges; empty when it does not
};

// Return how many of `verdict`'s findings block the change (see Finding::blocks).
std::size_t count_blocking(const Verdict& verdict);

} // namespace tollgate::policy
