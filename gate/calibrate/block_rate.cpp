// SPDX-License-Identifier: MIT
// The block-rate search: per-commit values per limit, one rank shared by a level's limits,
// bisection on the replayed rate.
#include "gate/calibrate/block_rate.hpp"

#include "gate/common/errors.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <functional>
#include <optional>

namespace tollgate::calibrate {

namespace {

// The limit of `rule` that `key` names.
std::optional<double>& limit_of(policy::Rule& rule, LimitKey key) {
    switch (key) {
    case LimitKey::max_increase:
        return rule.max_increase;
    case LimitKey::max_increase_percent:
        return rule.max_increase_percent;
    case LimitKey::ceiling:
        return rule.ceiling;
    case LimitKey::max_total_increase:
        break;
    }
    return rule.max_total_increase;
}

bool judged_by(const policy::Rule& rule, const delta::FunctionDelta& f) {
    switch (rule.kind) {
    case policy::RuleKind::growth:
        return (f.label == delta::DeltaLabel::changed || f.label == delta::DeltaLabel::moved) &&
               f.base && f.head;
    case policy::RuleKind::added_ceiling:
        return f.label == delta::DeltaLabel::added && f.head.has_value();
    case policy::RuleKind::ceiling:
        return f.head.has_value();
    case policy::RuleKind::budget:
    case policy::RuleKind::unmeasured_lines: // judges the change's lines, not a function
        return false;
    }
    return false;
}

// The value one function holds for one limit, when the limit judges it.
std::optional<double> value_for(const policy::Rule& rule, LimitKey key,
                                const delta::FunctionDelta& f) {
    if (!judged_by(rule, f)) {
        return std::nullopt;
    }
    const core::Delta change = f.delta(rule.measure);
    switch (key) {
    case LimitKey::max_increase:
        return change.absolute;
    case LimitKey::max_increase_percent:
        return change.percent;
    case LimitKey::ceiling:
        return core::measure_value(f.head->measures, rule.measure);
    case LimitKey::max_total_increase:
        break;
    }
    return std::nullopt;
}

// The values one limit judges: per commit the largest, largest first.
std::vector<double> commit_values(const Replay& replay, const policy::Policy& scope,
                                  const policy::Rule& rule, LimitKey key) {
    std::vector<double> values;
    for (const auto& commit : replay.commits) {
        std::optional<double> largest;
        double total = 0;
        bool any = false;
        for (const auto& f : commit.report.functions) {
            if (!policy::in_scope(scope.paths, f.shown_side().path)) {
                continue;
            }
            if (key == LimitKey::max_total_increase) {
                // Budgets sum every function in the paths, the noise floor included.
                total += f.delta(rule.measure).absolute;
                any = true;
                continue;
            }
            if (policy::below_noise_floor(scope.noise_floor, f)) {
                continue;
            }
            const auto value = value_for(rule, key, f);
            if (value && (!largest || *value > *largest)) {
                largest = value;
            }
        }
        if (key == LimitKey::max_total_increase && any) {
            largest = total;
        }
        if (largest) {
            values.push_back(*largest);
        }
    }
    std::sort(values.begin(), values.end(), std::greater<>());
    return values;
}

// One searched limit while the search runs.
struct Knob {
    std::size_t rule = 0; // index into the policy's rules
    LimitKey key = LimitKey::max_increase;
    std::vector<double> values; // per-commit values, largest first
};

double limit_at(const Knob& knob, std::size_t j) {
    return readable_ceiling(j < knob.values.size() ? knob.values[j] : 0.0);
}

std::vector<LimitKey> keys_of(const policy::Rule& rule) {
    std::vector<LimitKey> keys;
    for (const auto key : {LimitKey::max_increase, LimitKey::max_increase_percent,
                           LimitKey::ceiling, LimitKey::max_total_increase}) {
        auto copy = rule;
        if (limit_of(copy, key)) {
            keys.push_back(key);
        }
    }
    return keys;
}

std::size_t allowed_commits(double percent, std::size_t judged) {
    return static_cast<std::size_t>(
        std::floor(percent * static_cast<double>(judged) / 100.0 + 1e-9));
}

// Search the limits of the rules of `level` in `policy` (changed in place) and return the target.
SearchTarget search_level(const Replay& replay, policy::Policy& policy, policy::Level level,
                          double percent, const policy::JudgeOptions& options,
                          std::vector<SearchedLimit>& report) {
    SearchTarget target;
    target.percent = percent;
    target.allowed = allowed_commits(percent, replay.commits.size());
    std::vector<Knob> knobs;
    for (std::size_t r = 0; r < policy.rules.size(); ++r) {
        const auto& rule = policy.rules[r];
        if (rule.level != level) {
            continue;
        }
        for (const auto key : keys_of(rule)) {
            Knob knob{r, key, commit_values(replay, policy, rule, key)};
            if (knob.values.empty()) {
                report.push_back({rule.id, key, *limit_of(policy.rules[r], key), 0, 0, false});
            } else {
                knobs.push_back(std::move(knob));
            }
        }
    }
    if (knobs.empty()) {
        return target;
    }
    const auto flagged_at = [&](std::size_t j) {
        for (const auto& knob : knobs) {
            limit_of(policy.rules[knob.rule], knob.key) = limit_at(knob, j);
        }
        const WhatIf w = what_if(replay, policy, options);
        return level == policy::Level::blocking ? w.blocked : w.warned;
    };
    std::size_t top = 0; // from here on every limit is 0 and a larger j changes nothing
    for (const auto& knob : knobs) {
        top = std::max(top, knob.values.size());
    }
    std::size_t chosen = 0;
    if (flagged_at(0) > target.allowed) {
        target.reached = false;
    } else if (flagged_at(top) <= target.allowed) {
        chosen = top;
    } else {
        std::size_t good = 0, bad = top; // flagged_at(good) fits, flagged_at(bad) does not
        while (bad - good > 1) {
            const std::size_t middle = good + (bad - good) / 2;
            (flagged_at(middle) <= target.allowed ? good : bad) = middle;
        }
        chosen = good;
    }
    for (const auto& knob : knobs) {
        const double value = limit_at(knob, chosen);
        limit_of(policy.rules[knob.rule], knob.key) = value;
        const auto above = static_cast<std::size_t>(std::count_if(
            knob.values.begin(), knob.values.end(), [value](double v) { return v > value; }));
        report.push_back(
            {policy.rules[knob.rule].id, knob.key, value, knob.values.size(), above, true});
    }
    return target;
}

} // namespace

const char* limit_key_name(LimitKey key) {
    switch (key) {
    case LimitKey::max_increase:
        return "max-increase";
    case LimitKey::max_increase_percent:
        return "max-increase-percent";
    case LimitKey::ceiling:
        return "ceiling";
    case LimitKey::max_total_increase:
        break;
    }
    return "max-total-increase";
}

double readable_ceiling(double value) {
    if (!(value > 0)) {
        return 0;
    }
    const double scale = value < 100 ? 100.0 : 1.0;
    // A hair below the next step first, so 53.37 stored as 53.369999... stays 53.37.
    double steps = std::ceil(value * scale - 1e-6);
    while (steps / scale < value) {
        steps += 1;
    }
    return steps / scale;
}

double rate_percent(std::size_t count, std::size_t total) {
    return total == 0 ? 0.0 : 100.0 * static_cast<double>(count) / static_cast<double>(total);
}

BlockRateSuggestion suggest_for_block_rate(const Replay& replay, const policy::Policy& scope,
                                           double block_percent, double warning_percent,
                                           const policy::JudgeOptions& options) {
    for (const double p : {block_percent, warning_percent}) {
        if (!(p >= 0 && p <= 100)) {
            throw UsageError(
                fmt::format("rate \"{}\" is out of range (give a percentage from 0 to 100)", p));
        }
    }
    BlockRateSuggestion s;
    s.policy = scope;
    s.blocking =
        search_level(replay, s.policy, policy::Level::blocking, block_percent, options, s.limits);
    s.warning =
        search_level(replay, s.policy, policy::Level::warning, warning_percent, options, s.limits);
    s.replayed = what_if(replay, s.policy, options);
    s.commits = replay.commits.size();
    for (const auto& commit : replay.commits) {
        for (const auto& f : commit.report.functions) {
            if (policy::in_scope(scope.paths, f.shown_side().path) &&
                !policy::below_noise_floor(scope.noise_floor, f)) {
                ++s.functions;
            }
        }
    }
    s.small_sample = s.commits < k_min_sample_commits || s.functions < k_min_sample_functions;
    return s;
}

} // namespace tollgate::calibrate
