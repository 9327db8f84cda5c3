// SPDX-License-Identifier: MIT
// Exemptions a change carries for itself (a commit trailer or a marked source comment), read as
// data and applied only as the base policy's "change-exemptions" allows.
#pragma once

#include "gate/policy/policy.hpp"
#include "gate/policy/verdict.hpp"

#include <cstddef>
#include <string>
#include <vector>

namespace tollgate::policy {

// The trailer key a commit message carries an exemption under (matched without regard to case).
constexpr const char* k_exemption_trailer = "Tollgate-Exemption";
// The marker of an exemption in a source comment: "tollgate-exemption(RULES): REASON".
constexpr const char* k_exemption_marker = "tollgate-exemption(";
// The most exemptions one change may claim; more are ignored with a note.
constexpr std::size_t k_exemption_limit = 20;

// Exemptions found in a change, and what could not be read.
struct ExemptionClaims {
    std::vector<ClaimedExemption> claims; // in the order found, at most k_exemption_limit
    std::vector<std::string> notes;       // one sentence per malformed or dropped exemption
};

// Read the "Tollgate-Exemption: FUNCTION (RULE[, RULE...]): REASON" lines of commit message
// `message` (of commit `where`, a short id) into `found`: FUNCTION is a glob on the qualified
// name ("*" for every function), the rules are rule ids, the reason is required. A malformed
// line adds a note and nothing else. State is left `refused` until apply_exemptions decides.
void read_exemption_trailers(const std::string& message, const std::string& where,
                             ExemptionClaims& found);

// Read the "tollgate-exemption(RULE[, RULE...]): REASON" markers in comments of lines
// `first_line`..`last_line` (1-based, inclusive) of `source`, and in the comment lines directly
// above `first_line`, into `found` as claims for `function` (qualified name) of `path` whose
// definition starts at `first_line`. A marker counts only after "//", "/*" or at the start of a
// "*" continuation line; one without rules or a reason adds a note.
void read_exemption_comments(const std::string& source, const std::string& path,
                             const std::string& function, unsigned first_line, unsigned last_line,
                             ExemptionClaims& found);

// Match `claims` to `verdict`'s findings (a trailer by rule id and name glob, a comment by rule id
// and function) and mark each matched finding with the claim: with `setting` accept, it no
// longer blocks; with refuse, it is marked refused and weighs as before. Every claim is copied
// into `verdict.exemptions` with its state and how many findings it covered; the outcome is
// recomputed (blocked when a finding still blocks). A finding takes the first claim that covers
// it.
void apply_exemptions(Verdict& verdict, const ExemptionClaims& claims, ChangeExemptions setting);

} // namespace tollgate::policy
