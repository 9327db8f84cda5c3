// SPDX-License-Identifier: MIT
// The team policy: rules, path scopes, waivers and settings, loaded and validated from YAML.
#pragma once

#include "gate/common/errors.hpp"
#include "gate/policy/verdict.hpp"
#include "tollgate/core/measures.hpp"

#include <optional>
#include <string>
#include <vector>

namespace tollgate::policy {

// The policy file looked for at the repository root when no `--policy FILE` is given.
constexpr const char* k_default_policy_path = ".tollgate.yaml";

// The schema version this build reads and writes (key "tollgate-policy").
constexpr int k_policy_schema_version = 1;

// A broken policy: every problem found, one finished message per entry, each starting with
// "file:line:column: ". Nothing is judged with a broken policy (exit 2).
class PolicyError : public UsageError {
public:
    // Build the error from `messages` (at least one); what() joins them with newlines.
    explicit PolicyError(std::vector<std::string> messages);
    // Return every message, in file order.
    const std::vector<std::string>& messages() const { return m_messages; }

private:
    std::vector<std::string> m_messages;
};

// Whose policy file judges a change in `check`.
enum class JudgeWith {
    base, // the base commit's policy (a change cannot loosen its own gate)
    head, // the head commit's policy (the change's own edits to the policy apply)
};

// Whether a limit key in an override sets a value or removes the rule's limit.
enum class LimitSetting {
    keep,   // not mentioned: the rule's own value stays
    set,    // replaced by `value`
    remove, // "off": the limit no longer applies
};

// One limit as an override states it.
struct LimitOverride {
    LimitSetting setting = LimitSetting::keep; // what the override does to the limit
    double value = 0;                          // the new limit when `setting` is set

    bool operator==(const LimitOverride& other) const {
        return setting == other.setting && (setting != LimitSetting::set || value == other.value);
    }
};

// One rule of the policy.
struct Rule {
    std::string id;                   // the team's name for it, unique in the policy
    RuleKind kind = RuleKind::growth; // what it limits
    core::MeasureId measure = core::MeasureId::effort; // the measure it judges
    Level level = Level::blocking;                     // the weight of its findings
    std::optional<double> max_increase;                // growth: largest allowed head - base
    std::optional<double> max_increase_percent;        // growth: largest allowed percent growth
    std::optional<double> ceiling;                     // added-ceiling, ceiling: largest head value
    std::optional<double> max_total_increase;          // budget: largest summed head - base

    bool operator==(const Rule& other) const {
        return id == other.id && kind == other.kind && measure == other.measure &&
               level == other.level && max_increase == other.max_increase &&
               max_increase_percent == other.max_increase_percent && ceiling == other.ceiling &&
               max_total_increase == other.max_total_increase;
    }
};

// Whether an override keeps a rule on for the paths it matches.
enum class RuleSwitch {
    on,  // the rule applies, with the override's changes
    off, // the rule does not apply to these paths
};

// What one path override does to one rule.
struct RuleOverride {
    std::string rule_id;                // the rule it changes (must exist)
    RuleSwitch state = RuleSwitch::on;  // off: the rule is turned off for the matched paths
    std::optional<Level> level;         // a different weight, when given
    LimitOverride max_increase;         // growth
    LimitOverride max_increase_percent; // growth
    LimitOverride ceiling;              // added-ceiling, ceiling

    bool operator==(const RuleOverride& other) const {
        return rule_id == other.rule_id && state == other.state && level == other.level &&
               max_increase == other.max_increase &&
               max_increase_percent == other.max_increase_percent && ceiling == other.ceiling;
    }
};

// Rule changes for the files that match one glob.
struct PathOverride {
    std::string match;               // glob on the repository-relative path
    std::vector<RuleOverride> rules; // in file order

    bool operator==(const PathOverride& other) const {
        return match == other.match && rules == other.rules;
    }
};

// Which files the policy judges, and per-glob rule changes.
struct PathScope {
    std::vector<std::string> include{"**"}; // a function is judged when its path matches one
    std::vector<std::string> exclude;       // ... and none of these
    std::vector<PathOverride> overrides;    // applied in file order; a later match wins

    bool operator==(const PathScope& other) const {
        return include == other.include && exclude == other.exclude && overrides == other.overrides;
    }
};

// A function exempted from named rules.
struct Waiver {
    std::string file;               // glob on the repository-relative path
    std::string function;           // glob on the qualified name ("Parser::*")
    std::vector<std::string> rules; // rule ids it exempts from (each must exist)
    std::string reason;             // why (mandatory)
    std::string expires;            // YYYY-MM-DD, the last day it applies; empty: never expires

    bool operator==(const Waiver& other) const {
        return file == other.file && function == other.function && rules == other.rules &&
               reason == other.reason && expires == other.expires;
    }
};

// A size below which a function is noise for per-function rules.
struct NoiseFloor {
    core::MeasureId measure = core::MeasureId::volume; // the measure compared
    double below = 0; // a function whose present sides are all under this is ignored

    bool operator==(const NoiseFloor& other) const {
        return measure == other.measure && below == other.below;
    }
};

// Whether findings already present in the baseline block.
enum class Grandfathering {
    off, // every finding weighs its rule's level
    on,  // a ceiling finding no worse than the baseline's value is reported, not blocking
};

// Where the baseline snapshot is and how it is used (read by the baseline work).
struct BaselineSettings {
    std::string path;                                // snapshot file; empty: none configured
    Grandfathering grandfather = Grandfathering::on; // see Grandfathering; on unless turned off

    bool operator==(const BaselineSettings& other) const {
        return path == other.path && grandfather == other.grandfather;
    }
};

// How functions defined in #if branches the preprocessor skipped are judged.
enum class InactiveCode {
    judge, // like any other function (the default)
    warn,  // their findings are warnings, never blocking
    skip,  // left out of every rule, budgets included; a note counts them
};

// What a change's changed C/C++ lines outside every measured function may amount to.
struct UnmeasuredLimit {
    std::optional<double> limit;  // more lines than this in scope is a finding; none: the
                                  // reports list them per file, nothing more
    Level level = Level::warning; // the finding's weight

    bool operator==(const UnmeasuredLimit& other) const {
        return limit == other.limit && level == other.level;
    }
};

// A whole policy, as loaded or built in. Plain data; compare with ==.
struct Policy {
    int schema_version = k_policy_schema_version;     // key "tollgate-policy"
    JudgeWith judge_with = JudgeWith::base;           // key "judge-with"
    std::vector<NoiseFloor> noise_floor;              // key "noise-floor"; all entries must hold
    std::vector<Rule> rules;                          // key "rules", in file order
    PathScope paths;                                  // key "paths"
    std::vector<Waiver> waivers;                      // key "waivers", in file order
    BaselineSettings baseline;                        // key "baseline"
    InactiveCode inactive_code = InactiveCode::judge; // key "inactive-code"
    UnmeasuredLimit unmeasured_lines;                 // key "unmeasured-lines"

    bool operator==(const Policy& other) const {
        return schema_version == other.schema_version && judge_with == other.judge_with &&
               noise_floor == other.noise_floor && rules == other.rules && paths == other.paths &&
               waivers == other.waivers && baseline == other.baseline &&
               inactive_code == other.inactive_code && unmeasured_lines == other.unmeasured_lines;
    }
    bool operator!=(const Policy& other) const { return !(*this == other); }
};

// Return the YAML text of the built-in default policy, with a comment on every key.
const std::string& default_policy_text();

// Return the built-in default policy, used when the repository has no policy file.
Policy default_policy();

// Load and validate the policy in `text`; `origin` names it in messages (e.g. ".tollgate.yaml").
// Throws PolicyError listing every problem found (YAML syntax, unknown or misspelled keys and
// measures, wrong types, bad dates, duplicate or unknown rule ids), each with origin:line:column.
Policy load_policy(const std::string& text, const std::string& origin);

// Read the file at `path` and load it with `path` as origin. Throws UsageError when the file
// cannot be read, PolicyError when it is broken.
Policy load_policy_file(const std::string& path);

// Return `policy` as canonical YAML with every effective value written out; load_policy reads
// it back to an equal Policy. Control and non-ASCII characters are written as YAML escapes
// ("\x1b", "\u202e") inside double quotes, so printing it shows them instead of obeying them.
std::string describe_policy(const Policy& policy);

// Return `value` as a policy file writes it, as a person would (53.37, not 53.369999999999997):
// the shortest decimal that load_policy reads back as exactly the same double. Never fails.
std::string plain_number(double value);

// Return one readable line per setting that differs between `base` and `head`, e.g.
// `rules["effort-growth"].max-increase-percent: 40 in base, 80 in head`; empty when equal.
std::vector<std::string> policy_difference(const Policy& base, const Policy& head);

// Return "base" or "head".
const char* judge_with_name(JudgeWith judge_with);

// Return "judge", "warn" or "skip".
const char* inactive_code_name(InactiveCode inactive_code);

} // namespace tollgate::policy
