// SPDX-License-Identifier: MIT
// Names of the verdict's enumerations, as policies and reports spell them.
#include "gate/policy/verdict.hpp"

namespace tollgate::policy {

const char* level_name(Level level) {
    switch (level) {
    case Level::blocking:
        return "blocking";
    case Level::warning:
        return "warning";
    }
    return "blocking";
}

const char* rule_kind_name(RuleKind kind) {
    switch (kind) {
    case RuleKind::growth:
        return "growth";
    case RuleKind::added_ceiling:
        return "added-ceiling";
    case RuleKind::ceiling:
        return "ceiling";
    case RuleKind::unmeasured_lines:
        return "unmeasured-lines";
    case RuleKind::budget:
        return "budget";
    }
    return "growth";
}

const char* outcome_name(Outcome outcome) {
    switch (outcome) {
    case Outcome::pass:
        return "pass";
    case Outcome::blocked:
        return "blocked";
    }
    return "blocked";
}

std::size_t count_blocking(const Verdict& verdict) {
    std::size_t blocking = 0;
    for (const auto& finding : verdict.findings) {
        blocking += finding.blocks() ? 1 : 0;
    }
    return blocking;
}

} // namespace tollgate::policy
