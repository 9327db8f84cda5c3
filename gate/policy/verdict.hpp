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
    pass,        // no blocking finding (warnings allowed): exit 0
    blocked,     // at least one blocking finding: exit 1
    would_block, // advisory: findings that would block are reported, the change passes: exit 0
};

// Whether blocking findings block the change.
enum class Enforcement {
    blocking, // a blocking finding blocks (exit 1)
    advisory, // every rule runs, a blocking finding is reported as "would block" (exit 0)
};

// Where an exemption the change carries was written.
enum class ExemptionSource {
    trailer, // a "Tollgate-Exemption:" trailer in a commit message of the change
    comment, // a "tollgate-exemption(RULES): REASON" comment in the function's source
};

// What the judging policy made of an exemption the change carries.
enum class ExemptionState {
    none,     // the finding has no exemption
    accepted, // the base policy accepts change exemptions: the finding does not block
    refused,  // the base policy refuses them: reported, no effect
};

// Return "blocking" or "warning".
const char* level_name(Level level);
// Return the rule kind's policy key ("growth", "added-ceiling", "ceiling", "budget"), or
// "unmeasured-lines" for the policy key of that name.
const char* rule_kind_name(RuleKind kind);
// Return "pass", "blocked" or "would-block".
const char* outcome_name(Outcome outcome);
// Return "accepted", "refused" or "none".
const char* exemption_state_name(ExemptionState state);

// One exemption a change claims for itself: data from the head, never obeyed unless the base
// policy accepts change exemptions.
struct ClaimedExemption {
    ExemptionSource source = ExemptionSource::trailer; // trailer or comment
    std::string where;       // the commit (short id) or "PATH:LINE" it was written at
    std::string function;    // trailer: glob on the qualified name ("*" for all); comment: the
                             // function it sits in
    std::string path;        // comment: the file; trailer: empty (any file)
    unsigned start_line = 0; // comment: the function's first line; trailer: 0
    std::vector<std::string> rules;                 // rule ids it names
    std::string reason;                             // why, as the author wrote it
    ExemptionState state = ExemptionState::refused; // what the policy made of it
    std::size_t findings = 0;                       // findings it covered

    bool operator==(const ClaimedExemption& other) const {
        return source == other.source && where == other.where && function == other.function &&
               path == other.path && start_line == other.start_line && rules == other.rules &&
               reason == other.reason && state == other.state && findings == other.findings;
    }
};

// One rule broken by one function (or by the whole change, for a budget).
struct Finding {
    std::string rule_id;              // the id the team gave the rule, e.g. "effort-growth"
    RuleKind kind = RuleKind::growth; // what kind of rule
    Level level = Level::blocking;    // its weight
    core::MeasureId measure = core::MeasureId::effort; // the measure judged
    std::string function;                              // qualified name; empty for a budget finding
    std::string signature;   // parameter types; empty for a budget finding
    std::string path;        // head path (base path for a removed function); empty for budget
    unsigned start_line = 0; // head extent's first line; 0 for budget
    unsigned end_line = 0;   // head extent's last line; 0 for budget
    double value = 0;        // the judged value (a growth, a head value or a sum)
    double limit = 0;        // the limit it broke
    double excess = 0;       // value - limit
    bool percent = false;    // value, limit and excess are percentages
    std::string message;     // the finding in words a reviewer understands, e.g.
                             // "src/filter.cpp:120: Kalman::update(): effort +18,400 (+61%)
                             // exceeds +40% (rule \"effort-growth\")"
    bool tolerated = false;  // above a ceiling already in the baseline; reported, not blocking
    bool advisory = false;   // judged in advisory mode: it would block, and does not
    ExemptionState exemption = ExemptionState::none; // an exemption the change carries for it
    std::string exemption_reason;                    // its reason (the author's text)
    std::string exemption_where;                     // where it was written
    ExemptionSource exemption_source = ExemptionSource::trailer; // how it was written

    // Return true when a blocking rule found it and neither the baseline nor an accepted
    // exemption excuses it: it blocks, or in advisory mode would block.
    bool weighs_blocking() const {
        return level == Level::blocking && !tolerated && exemption != ExemptionState::accepted;
    }
    // Return true when this finding blocks the change: it weighs blocking and is not advisory.
    bool blocks() const { return weighs_blocking() && !advisory; }
    // Return true when this finding would block but the run is advisory.
    bool would_block() const { return weighs_blocking() && advisory; }

    bool operator==(const Finding& other) const {
        return rule_id == other.rule_id && kind == other.kind && level == other.level &&
               measure == other.measure && function == other.function &&
               signature == other.signature && path == other.path &&
               start_line == other.start_line && end_line == other.end_line &&
               value == other.value && limit == other.limit && excess == other.excess &&
               percent == other.percent && message == other.message &&
               tolerated == other.tolerated && advisory == other.advisory &&
               exemption == other.exemption && exemption_reason == other.exemption_reason &&
               exemption_where == other.exemption_where &&
               exemption_source == other.exemption_source;
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
    Enforcement enforcement = Enforcement::blocking; // advisory: nothing blocks, see Outcome
    std::vector<ClaimedExemption> exemptions;        // every exemption the change carries
};

// Return how many of `verdict`'s findings block the change (see Finding::blocks).
std::size_t count_blocking(const Verdict& verdict);

// Return how many of `verdict`'s findings would block in an advisory run (see
// Finding::would_block).
std::size_t count_would_block(const Verdict& verdict);

// Turn `verdict` advisory: every finding is marked advisory, the outcome is would-block when a
// finding would block (else pass), and nothing blocks.
void make_advisory(Verdict& verdict);

} // namespace tollgate::policy
