// SPDX-License-Identifier: MIT
// Suggested policies as files: a comment with the figures behind them, then the canonical YAML.
#include "gate/calibrate/suggested_policy.hpp"

#include "gate/common/errors.hpp"
#include "gate/common/text_safety.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <sstream>

namespace tollgate::calibrate {

namespace {

// Text from the repository or a policy file inside a comment: one line, controls made visible,
// so that a name with a line break cannot end the comment and write policy keys.
std::string comment_text(const std::string& text) {
    return text::terminal_text(text);
}

double percentile_of(const Series& series, double p) {
    std::vector<double> values;
    for (const auto& s : series.samples) {
        values.push_back(s.value);
    }
    std::sort(values.begin(), values.end());
    return percentile(values, p);
}

// Two decimals, as the suggestion promises; never negative.
double two_decimals(double value) {
    return std::max(0.0, std::round(value * 100.0) / 100.0);
}

std::string tip_text(const Replay& replay) {
    return replay.history.tip_name.empty() ? "the history"
                                           : "\"" + comment_text(replay.history.tip_name) + "\"";
}

void write_vendored(std::ostream& out, const CalibrationScope& scope) {
    if (scope.vendored.empty()) {
        return;
    }
    out << (scope.handling == VendoredHandling::exclude
                ? "# Left out as bundled third-party code (in paths.exclude; --keep-vendored "
                  "keeps them):\n"
                : "# Kept although they look like bundled third-party code (--keep-vendored):\n");
    for (const auto& folder : scope.vendored) {
        out << "#   " << comment_text(folder.path) << "/ (" << vendored_sign_text(folder.sign)
            << ")\n";
    }
}

} // namespace

policy::Policy percentile_policy(const std::vector<MeasureDistribution>& distributions, double p,
                                 const policy::Policy& scope) {
    if (!(p >= 0 && p <= 100)) {
        throw UsageError(
            fmt::format("percentile \"{}\" is out of range (give a number from 0 to 100)", p));
    }
    policy::Policy out = scope;
    out.rules.clear();
    for (const auto& d : distributions) {
        const std::string name(core::measure_name(d.measure));
        if (d.growth.summary.count > 0) {
            policy::Rule rule;
            rule.id = name + "-growth";
            rule.kind = policy::RuleKind::growth;
            rule.measure = d.measure;
            rule.level = policy::Level::blocking;
            rule.max_increase = two_decimals(percentile_of(d.growth, p));
            if (d.growth_percent.summary.count > 0) {
                rule.max_increase_percent = two_decimals(percentile_of(d.growth_percent, p));
            }
            out.rules.push_back(rule);
        }
        if (d.added.summary.count > 0) {
            policy::Rule rule;
            rule.id = "new-function-" + name;
            rule.kind = policy::RuleKind::added_ceiling;
            rule.measure = d.measure;
            rule.level = policy::Level::warning;
            rule.ceiling = two_decimals(percentile_of(d.added, p));
            out.rules.push_back(rule);
        }
    }
    return out;
}

std::string percentile_policy_text(const Replay& replay,
                                   const std::vector<MeasureDistribution>& distributions, double p,
                                   const CalibrationScope& scope) {
    const policy::Policy suggested = percentile_policy(distributions, p, scope.policy);
    std::ostringstream out;
    out << "# Tollgate policy suggested by \"tollgate calibrate --suggest "
        << fmt::format("{:g}", p) << "\" from " << replay.commits.size() << " replayed commits "
        << replay_span(replay) << "\n# of " << tip_text(replay)
        << ", counting the paths and noise floor of " << comment_text(scope.origin)
        << ". Each limit is the p" << fmt::format("{:g}", p)
        << " of the team's own past changes\n# (linear interpolation between closest ranks), "
           "rounded to two decimals: review before use.\n";
    const auto line = [&](const Series& s, core::MeasureId measure, const char* what,
                          const char* sign, const char* unit) {
        const double value = percentile_of(s, p);
        out << fmt::format("# p{:g} of {} {} over {} functions in {} commits {}: {}{}{}", p,
                           core::measure_name(measure), what, s.summary.count,
                           replay.commits.size(), replay_span(replay), value >= 0 ? sign : "",
                           policy::plain_number(std::round(value * 100) / 100), unit)
            << (value < 0 ? " (raised to 0: a limit cannot be negative)" : "") << "\n";
    };
    for (const auto& d : distributions) {
        if (d.growth.summary.count > 0) {
            line(d.growth_percent, d.measure, "growth", "+", "%");
            line(d.growth, d.measure, "growth", "+", "");
        }
        if (d.added.summary.count > 0) {
            line(d.added, d.measure, "value of added functions", "", "");
        }
    }
    if (suggested.rules.empty()) {
        out << "# The history had no changed or added function: the policy has no rule.\n";
    }
    write_vendored(out, scope);
    out << "\n" << policy::describe_policy(suggested);
    return out.str();
}

std::string small_sample_warning(const BlockRateSuggestion& s) {
    if (!s.small_sample) {
        return {};
    }
    return fmt::format("small sample: {} commits and {} functions (fewer than {} commits or {} "
                       "functions); one commit moves the rate by {} points, so replay more "
                       "history (--max-commits) before trusting these limits",
                       s.commits, s.functions, k_min_sample_commits, k_min_sample_functions,
                       policy::plain_number(std::round(rate_percent(1, s.commits) * 100) / 100));
}

std::string block_rate_policy_text(const Replay& replay, const BlockRateSuggestion& s,
                                   const CalibrationScope& scope) {
    const auto percent = [](double value) {
        return policy::plain_number(std::round(value * 100) / 100) + "%";
    };
    std::ostringstream out;
    out << "# Tollgate policy suggested by \"tollgate calibrate --suggest-block-rate "
        << policy::plain_number(s.blocking.percent) << "\" from " << s.commits
        << " replayed commits " << replay_span(replay) << "\n# of " << tip_text(replay)
        << ", starting from " << comment_text(scope.origin) << " (its paths, noise floor and "
        << "waivers apply).\n";
    out << fmt::format("# Replayed with this policy: {} of {} commits blocked ({}), {} passed "
                       "with warnings ({}).\n",
                       s.replayed.blocked, s.replayed.judged,
                       percent(rate_percent(s.replayed.blocked, s.replayed.judged)),
                       s.replayed.warned,
                       percent(rate_percent(s.replayed.warned, s.replayed.judged)));
    out << fmt::format("# Sample: {} commits, {} touched functions inside the paths and above "
                       "the noise floor.\n",
                       s.commits, s.functions);
    out << "# Each searched limit is the strictest that keeps the replayed rate at or under its "
           "target\n# (blocking: "
        << percent(s.blocking.percent) << ", warnings: " << percent(s.warning.percent)
        << " of commits), rounded up as a person would write it:\n";
    for (const auto& limit : s.limits) {
        out << "#   " << comment_text(limit.rule_id) << " " << limit_key_name(limit.key) << ": "
            << policy::plain_number(limit.value);
        if (limit.searched) {
            out << fmt::format(" ({} of {} commits with a value are above it)\n",
                               limit.commits_above, limit.commits_with_values);
        } else {
            out << " (kept: no replayed commit has a value it judges)\n";
        }
    }
    for (const auto* target : {&s.blocking, &s.warning}) {
        if (!target->reached) {
            out << "# Not reached: even the loosest limits flag more than "
                << percent(target->percent)
                << " of commits (findings that no limit can lift, e.g. growth from a zero "
                   "base).\n";
        }
    }
    if (s.small_sample) {
        out << "# Warning: " << small_sample_warning(s) << ".\n";
    }
    write_vendored(out, scope);
    out << "\n" << policy::describe_policy(s.policy);
    return out.str();
}

} // namespace tollgate::calibrate
