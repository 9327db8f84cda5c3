// SPDX-License-Identifier: MIT
// Judge a change against a policy: scopes, overrides, noise floor, rules, waivers, verdict.
#include "gate/policy/judge.hpp"

#include "gate/policy/calendar_date.hpp"
#include "gate/policy/glob.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <tuple>

namespace tollgate::policy {

std::string format_amount(double value, Sign sign) {
    std::string text;
    if (std::fabs(value) >= 100) {
        const double rounded = std::round(value);
        char digits_buffer[64];
        std::snprintf(digits_buffer, sizeof digits_buffer, "%.0f", std::fabs(rounded));
        const std::string digits = digits_buffer;
        for (std::size_t i = 0; i < digits.size(); ++i) {
            if (i > 0 && (digits.size() - i) % 3 == 0) {
                text += ',';
            }
            text += digits[i];
        }
        if (rounded < 0) {
            text = "-" + text;
        }
    } else {
        char buffer[64];
        std::snprintf(buffer, sizeof buffer, "%.3g", value);
        text = buffer;
        if (text == "-0") {
            text = "0";
        }
    }
    if (sign == Sign::always && value > 0) {
        text = "+" + text;
    }
    return text;
}

namespace {

// Format `value` so that it reads differently from `limit` when they differ.
std::string amount_beside(double value, double limit, Sign sign) {
    std::string text = format_amount(value, sign);
    if (value != limit && text == format_amount(limit, sign)) {
        char buffer[64];
        std::snprintf(buffer, sizeof buffer, sign == Sign::always ? "%+.6g" : "%.6g", value);
        text = buffer;
    }
    return text;
}

// Format a percentage: whole numbers from 10 up, one decimal below; one decimal also when the
// whole number would hide that `value` is above `limit`.
std::string percent_text(double value, Sign sign, std::optional<double> limit = std::nullopt) {
    const char* whole = sign == Sign::always ? "%+.0f" : "%.0f";
    const char* tenth = sign == Sign::always ? "%+.1f" : "%.1f";
    char buffer[64];
    std::snprintf(buffer, sizeof buffer, std::fabs(value) >= 10 ? whole : tenth, value);
    std::string text = buffer;
    if (limit && value > *limit && std::round(value) <= *limit) {
        std::snprintf(buffer, sizeof buffer, tenth, value);
        text = buffer;
    }
    if (text.size() > 2 && text.compare(text.size() - 2, 2, ".0") == 0) {
        text.erase(text.size() - 2);
    }
    if (text == "+0" || text == "-0") {
        text = "0";
    }
    return text + "%";
}

std::string points_text(double excess) {
    std::string text = percent_text(excess, Sign::as_is);
    text.pop_back();
    return text + (text == "1" ? " point" : " points");
}

// The rule as it applies to one path, after the overrides that match it.
struct AppliedRule {
    RuleSwitch state = RuleSwitch::on; // off: the rule does not apply here
    Rule rule;                         // the effective limits and level
};

void apply_limit(std::optional<double>& limit, const LimitOverride& change) {
    if (change.setting == LimitSetting::set) {
        limit = change.value;
    } else if (change.setting == LimitSetting::remove) {
        limit.reset();
    }
}

AppliedRule apply_overrides(const Rule& rule, const std::string& path, const PathScope& paths) {
    AppliedRule applied;
    applied.rule = rule;
    for (const auto& path_override : paths.overrides) {
        if (!glob_match(path_override.match, path, GlobSubject::path)) {
            continue;
        }
        for (const auto& change : path_override.rules) {
            if (change.rule_id != rule.id) {
                continue;
            }
            applied.state = change.state;
            if (change.level) {
                applied.rule.level = *change.level;
            }
            apply_limit(applied.rule.max_increase, change.max_increase);
            apply_limit(applied.rule.max_increase_percent, change.max_increase_percent);
            apply_limit(applied.rule.ceiling, change.ceiling);
        }
    }
    return applied;
}

bool matches_any(const std::vector<std::string>& globs, const std::string& path) {
    return std::any_of(globs.begin(), globs.end(), [&path](const std::string& glob) {
        return glob_match(glob, path, GlobSubject::path);
    });
}

std::string function_text(const delta::FunctionDelta& f) {
    return f.name + "(" + f.signature + ")";
}

std::string location_text(const delta::FunctionDelta& f) {
    const auto& side = f.shown_side();
    return side.path + ":" + std::to_string(side.start_line) + ": " + function_text(f);
}

// The waivers of one judgement, with what happened to each.
class WaiverBook {
public:
    WaiverBook(const std::vector<Waiver>& waivers, const std::string& today)
        : m_waivers(waivers), m_used(waivers.size(), false) {
        for (const auto& waiver : waivers) {
            // A waiver applies through the end of its expiry day.
            m_expired.push_back(!waiver.expires.empty() && waiver.expires < today);
        }
    }

    // Return the active waiver that exempts `f` from `rule_id`, marking it used; or none.
    const Waiver* find(const delta::FunctionDelta& f, const std::string& rule_id) {
        const std::string& path = f.shown_side().path;
        for (std::size_t i = 0; i < m_waivers.size(); ++i) {
            const Waiver& waiver = m_waivers[i];
            if (m_expired[i] ||
                std::find(waiver.rules.begin(), waiver.rules.end(), rule_id) ==
                    waiver.rules.end() ||
                !glob_match(waiver.file, path, GlobSubject::path) ||
                !glob_match(waiver.function, f.name, GlobSubject::name)) {
                continue;
            }
            m_used[i] = true;
            return &waiver;
        }
        return nullptr;
    }

    void add_notes(std::vector<std::string>& notes) const {
        for (std::size_t i = 0; i < m_waivers.size(); ++i) {
            const Waiver& waiver = m_waivers[i];
            const std::string name =
                "waiver for \"" + waiver.file + "\" \"" + waiver.function + "\"";
            if (m_expired[i]) {
                notes.push_back(name + " expired on " + waiver.expires +
                                " and no longer applies (renew it with a later date, or remove "
                                "it)");
            } else if (!m_used[i]) {
                notes.push_back(name + " waived nothing in this change (remove it once the code it "
                                       "covers is gone)");
            }
        }
    }

private:
    const std::vector<Waiver>& m_waivers;
    std::vector<bool> m_used;
    std::vector<bool> m_expired;
};

std::string rule_tail(const Rule& rule, const std::string& extra = "") {
    return " (rule \"" + rule.id + "\", " + level_name(rule.level) + extra + ")";
}

Finding start_finding(const Rule& rule, const delta::FunctionDelta& f) {
    Finding finding;
    finding.rule_id = rule.id;
    finding.kind = rule.kind;
    finding.level = rule.level;
    finding.measure = rule.measure;
    finding.function = f.name;
    finding.signature = f.signature;
    const auto& side = f.shown_side();
    finding.path = side.path;
    finding.start_line = side.start_line;
    finding.end_line = side.end_line;
    return finding;
}

// How a growth breaks a rule's percent limit.
enum class PercentBreach {
    none,      // it does not
    percent,   // its percentage is above the limit
    from_zero, // it grows from a zero base, where the limit allows no growth
};

PercentBreach percent_breach(const Rule& rule, const core::Delta& change) {
    if (!rule.max_increase_percent) {
        return PercentBreach::none;
    }
    if (change.percent) {
        return *change.percent > *rule.max_increase_percent ? PercentBreach::percent
                                                            : PercentBreach::none;
    }
    // A percent limit allows base * percent / 100 of growth; from a zero base that is nothing,
    // so any growth breaks it, judged by its absolute value (the percentage is undefined).
    return change.base == 0.0 && change.absolute > 0.0 ? PercentBreach::from_zero
                                                       : PercentBreach::none;
}

// "+18,400 (+61%)", or "+937,250 (from 0)" when the percentage is undefined.
std::string growth_text(const Rule& rule, const core::Delta& change) {
    std::string text = rule.max_increase
                           ? amount_beside(change.absolute, *rule.max_increase, Sign::always)
                           : format_amount(change.absolute, Sign::always);
    if (change.percent) {
        return text + " (" +
               percent_text(*change.percent, Sign::always, rule.max_increase_percent) + ")";
    }
    return change.base == 0.0 ? text + " (from 0)" : text;
}

std::optional<Finding> judge_growth(const Rule& rule, const delta::FunctionDelta& f) {
    const core::Delta change = f.delta(rule.measure);
    const bool over_absolute = rule.max_increase && change.absolute > *rule.max_increase;
    const PercentBreach breach = percent_breach(rule, change);
    if (!over_absolute && breach == PercentBreach::none) {
        return std::nullopt;
    }
    Finding finding = start_finding(rule, f);
    // The absolute limit gives the finding's value when both are broken.
    finding.value = change.absolute;
    finding.limit = over_absolute ? *rule.max_increase : 0.0;
    finding.excess = change.absolute - finding.limit;
    if (!over_absolute && breach == PercentBreach::percent) {
        finding.value = *change.percent;
        finding.limit = *rule.max_increase_percent;
        finding.excess = *change.percent - *rule.max_increase_percent;
        finding.percent = true;
    }
    std::string limits;
    if (over_absolute) {
        limits = "the limit " + format_amount(*rule.max_increase, Sign::always) + " by " +
                 amount_beside(change.absolute - *rule.max_increase, 0, Sign::as_is);
    }
    if (breach != PercentBreach::none) {
        limits += (limits.empty() ? "the limit " : " and the limit ") +
                  percent_text(*rule.max_increase_percent, Sign::always) +
                  (breach == PercentBreach::from_zero
                       ? std::string(", which allows no growth from a zero base")
                       : " by " + points_text(*change.percent - *rule.max_increase_percent));
    }
    finding.message = location_text(f) + ": " + std::string(core::measure_name(rule.measure)) +
                      " " + growth_text(rule, change) + " exceeds " + limits + rule_tail(rule);
    return finding;
}

std::optional<Finding> judge_ceiling(const Rule& rule, const delta::FunctionDelta& f,
                                     const JudgeOptions& options, Grandfathering grandfather) {
    if (!f.head || !rule.ceiling) {
        return std::nullopt;
    }
    const double value = core::measure_value(f.head->measures, rule.measure);
    if (value <= *rule.ceiling) {
        return std::nullopt;
    }
    Finding finding = start_finding(rule, f);
    finding.value = value;
    finding.limit = *rule.ceiling;
    finding.excess = value - *rule.ceiling;
    const std::string measure(core::measure_name(rule.measure));
    std::string described;
    if (rule.kind == RuleKind::added_ceiling) {
        described =
            "new function with " + measure + " " + amount_beside(value, *rule.ceiling, Sign::as_is);
    } else {
        described = measure + " " + amount_beside(value, *rule.ceiling, Sign::as_is);
        if (f.base) {
            described +=
                " (base " +
                format_amount(core::measure_value(f.base->measures, rule.measure), Sign::as_is) +
                ")";
        }
    }
    std::string extra;
    if (grandfather == Grandfathering::on && options.baseline_lookup) {
        if (const auto recorded = options.baseline_lookup(f.identity)) {
            const double before = core::measure_value(*recorded, rule.measure);
            // Only a finite recorded value can grandfather: an infinite one would cover anything.
            if (std::isfinite(before) && before > *rule.ceiling && value <= before) {
                finding.grandfathered = true;
                extra = ", grandfathered: the baseline has " + format_amount(before, Sign::as_is);
            }
        }
    }
    finding.message = location_text(f) + ": " + described + " exceeds the ceiling " +
                      format_amount(*rule.ceiling, Sign::as_is) + " by " +
                      amount_beside(finding.excess, 0, Sign::as_is) + rule_tail(rule, extra);
    return finding;
}

bool applies_to(RuleKind kind, const delta::FunctionDelta& f) {
    switch (kind) {
    case RuleKind::growth:
        return (f.label == delta::DeltaLabel::changed || f.label == delta::DeltaLabel::moved) &&
               f.base && f.head;
    case RuleKind::added_ceiling:
        return f.label == delta::DeltaLabel::added && f.head.has_value();
    case RuleKind::ceiling:
        return f.head.has_value();
    case RuleKind::budget:
    case RuleKind::unmeasured_lines:
        return false;
    }
    return false;
}

// Return true when the function a reviewer looks at is defined in a skipped #if branch.
bool is_inactive(const delta::FunctionDelta& f) {
    return f.shown_side().inactive;
}

std::string waived_note(const delta::FunctionDelta& f, const std::string& rule_id,
                        const Waiver& waiver) {
    return location_text(f) + ": rule \"" + rule_id + "\" waived (" + waiver.reason + "; " +
           (waiver.expires.empty() ? std::string("no expiry") : "until " + waiver.expires) + ")";
}

std::string count_text(std::size_t count, const char* one, const char* many) {
    return std::to_string(count) + " " + (count == 1 ? one : many);
}

// Judge the change's changed C/C++ lines outside every measured function (files in scope only)
// against the policy's "unmeasured-lines" limit; nothing when there is no limit or no excess.
std::optional<Finding> judge_unmeasured_lines(const Policy& policy,
                                              const delta::ChangeReport& report) {
    if (!policy.unmeasured_lines.limit) {
        return std::nullopt;
    }
    double total = 0;
    std::string files;
    for (const auto& file : report.unmeasured) {
        if (in_scope(policy.paths, file.path)) {
            total += file.count;
            files += (files.empty() ? "" : ", ") + file.path + " " + std::to_string(file.count);
        }
    }
    const double limit = *policy.unmeasured_lines.limit;
    if (total <= limit) {
        return std::nullopt;
    }
    Finding finding;
    finding.rule_id = "unmeasured-lines";
    finding.kind = RuleKind::unmeasured_lines;
    finding.level = policy.unmeasured_lines.level;
    finding.value = total;
    finding.limit = limit;
    finding.excess = total - limit;
    finding.message = "the change: " + format_amount(total, Sign::as_is) +
                      " changed C/C++ lines outside every measured function (" + files +
                      ") exceed the limit " + format_amount(limit, Sign::as_is) + " by " +
                      format_amount(finding.excess, Sign::as_is) +
                      " (policy \"unmeasured-lines\", " + level_name(finding.level) + ")";
    return finding;
}

} // namespace

bool below_noise_floor(const std::vector<NoiseFloor>& floors, const delta::FunctionDelta& f) {
    if (floors.empty()) {
        return false;
    }
    for (const auto& floor : floors) {
        for (const auto* side : {&f.base, &f.head}) {
            // Written so that a value that is not a number is judged rather than skipped.
            if (*side && !(core::measure_value((*side)->measures, floor.measure) < floor.below)) {
                return false;
            }
        }
    }
    return true;
}

bool in_scope(const PathScope& paths, const std::string& path) {
    return matches_any(paths.include, path) && !matches_any(paths.exclude, path);
}

Verdict judge(const Policy& policy, const delta::ChangeReport& report,
              const JudgeOptions& options) {
    if (!is_calendar_date(options.today)) {
        throw UsageError("cannot judge waivers without today's date: \"" + options.today +
                         "\" is not YYYY-MM-DD (set TOLLGATE_TODAY=YYYY-MM-DD)");
    }
    Verdict verdict;
    verdict.policy_origin = options.policy_origin;
    WaiverBook waivers(policy.waivers, options.today);
    std::vector<std::string> waived_notes;
    std::size_t out_of_scope = 0;
    std::size_t noise = 0;
    std::size_t inactive_skipped = 0;

    for (const auto& f : report.functions) {
        const std::string& path = f.shown_side().path;
        if (!in_scope(policy.paths, path)) {
            ++out_of_scope;
            continue;
        }
        if (below_noise_floor(policy.noise_floor, f)) {
            ++noise;
            continue;
        }
        if (is_inactive(f) && policy.inactive_code == InactiveCode::skip) {
            ++inactive_skipped;
            continue;
        }
        for (const auto& base_rule : policy.rules) {
            if (!applies_to(base_rule.kind, f)) {
                continue;
            }
            AppliedRule applied = apply_overrides(base_rule, path, policy.paths);
            if (applied.state == RuleSwitch::off) {
                continue;
            }
            if (is_inactive(f) && policy.inactive_code == InactiveCode::warn) {
                applied.rule.level = Level::warning;
            }
            std::optional<Finding> finding =
                base_rule.kind == RuleKind::growth
                    ? judge_growth(applied.rule, f)
                    : judge_ceiling(applied.rule, f, options, policy.baseline.grandfather);
            if (!finding) {
                continue;
            }
            if (const Waiver* waiver = waivers.find(f, base_rule.id)) {
                waived_notes.push_back(waived_note(f, base_rule.id, *waiver));
                continue;
            }
            verdict.findings.push_back(std::move(*finding));
        }
    }

    // Budgets sum over every touched function in scope, the noise floor included: many small
    // increases add up. A missing side counts as zero, so removals offset additions.
    for (const auto& rule : policy.rules) {
        if (rule.kind != RuleKind::budget || !rule.max_total_increase) {
            continue;
        }
        double total = 0;
        std::size_t counted = 0;
        for (const auto& f : report.functions) {
            const std::string& path = f.shown_side().path;
            if (!in_scope(policy.paths, path) ||
                apply_overrides(rule, path, policy.paths).state == RuleSwitch::off ||
                (is_inactive(f) && policy.inactive_code == InactiveCode::skip)) {
                continue;
            }
            if (const Waiver* waiver = waivers.find(f, rule.id)) {
                waived_notes.push_back(waived_note(f, rule.id, *waiver));
                continue;
            }
            total += f.delta(rule.measure).absolute;
            ++counted;
        }
        if (total <= *rule.max_total_increase) {
            continue;
        }
        Finding finding;
        finding.rule_id = rule.id;
        finding.kind = rule.kind;
        finding.level = rule.level;
        finding.measure = rule.measure;
        finding.value = total;
        finding.limit = *rule.max_total_increase;
        finding.excess = total - *rule.max_total_increase;
        finding.message = "the change: " + std::string(core::measure_name(rule.measure)) + " " +
                          amount_beside(total, finding.limit, Sign::always) + " summed over " +
                          count_text(counted, "function", "functions") + " exceeds the budget " +
                          format_amount(*rule.max_total_increase, Sign::always) + " by " +
                          amount_beside(finding.excess, 0, Sign::as_is) + rule_tail(rule);
        verdict.findings.push_back(std::move(finding));
    }

    if (auto finding = judge_unmeasured_lines(policy, report)) {
        verdict.findings.push_back(std::move(*finding));
    }

    std::stable_sort(
        verdict.findings.begin(), verdict.findings.end(), [](const Finding& a, const Finding& b) {
            const auto key = [](const Finding& x) {
                return std::make_tuple(x.grandfathered ? 1 : 0, x.level == Level::blocking ? 0 : 1,
                                       x.path.empty() ? 1 : 0, std::cref(x.path), x.start_line,
                                       std::cref(x.function));
            };
            return key(a) < key(b);
        });
    const bool blocks = std::any_of(verdict.findings.begin(), verdict.findings.end(),
                                    [](const Finding& x) { return x.blocks(); });
    verdict.outcome = blocks ? Outcome::blocked : Outcome::pass;

    if (out_of_scope > 0) {
        verdict.notes.push_back(count_text(out_of_scope, "function is", "functions are") +
                                " outside the policy's paths and not judged");
    }
    if (noise > 0) {
        verdict.notes.push_back(count_text(noise, "function is", "functions are") +
                                " below the noise floor and not judged by per-function rules");
    }
    if (inactive_skipped > 0) {
        verdict.notes.push_back(count_text(inactive_skipped, "function is", "functions are") +
                                " in #if branches the preprocessor skipped and not judged "
                                "(policy: inactive-code: skip)");
    }
    verdict.notes.insert(verdict.notes.end(), waived_notes.begin(), waived_notes.end());
    waivers.add_notes(verdict.notes);
    return verdict;
}

} // namespace tollgate::policy
