// SPDX-License-Identifier: MIT
// Percentiles, histograms, what-if judgements and suggested policies over a replayed history.
#include "gate/calibrate/distribution.hpp"

#include "gate/common/errors.hpp"
#include "gate/common/text_safety.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <set>
#include <sstream>

namespace tollgate::calibrate {

double percentile(const std::vector<double>& sorted, double p) {
    if (sorted.empty()) {
        return 0;
    }
    const double h = static_cast<double>(sorted.size() - 1) * p / 100.0;
    const auto below = static_cast<std::size_t>(std::floor(h));
    if (below + 1 >= sorted.size()) {
        return sorted.back();
    }
    return sorted[below] + (h - static_cast<double>(below)) * (sorted[below + 1] - sorted[below]);
}

Summary summarize(std::vector<double> values) {
    Summary summary;
    summary.count = values.size();
    if (values.empty()) {
        return summary;
    }
    std::sort(values.begin(), values.end());
    for (std::size_t i = 0; i < k_report_percentiles.size(); ++i) {
        summary.at[i] = percentile(values, k_report_percentiles[i]);
    }
    summary.min = values.front();
    summary.max = values.back();
    return summary;
}

std::vector<Bin> histogram(const std::vector<double>& values) {
    std::vector<Bin> bins;
    if (values.empty()) {
        return bins;
    }
    std::vector<double> sorted = values;
    std::sort(sorted.begin(), sorted.end());
    const double low = sorted.front();
    const double top = percentile(sorted, 99);
    constexpr std::size_t k_bars = 12;
    const double width = (top - low) / static_cast<double>(k_bars);
    if (width <= 0) {
        bins.push_back({low, top, 0, false});
    } else {
        for (std::size_t i = 0; i < k_bars; ++i) {
            bins.push_back({low + width * static_cast<double>(i),
                            i + 1 == k_bars ? top : low + width * static_cast<double>(i + 1), 0,
                            false});
        }
    }
    Bin overflow{top, sorted.back(), 0, true};
    for (double v : sorted) {
        if (v > top) {
            ++overflow.count;
        } else if (width <= 0) {
            ++bins.front().count;
        } else {
            auto index = static_cast<std::size_t>((v - low) / width);
            bins[std::min(index, k_bars - 1)].count++;
        }
    }
    if (overflow.count > 0) {
        bins.push_back(overflow);
    }
    return bins;
}

namespace {

void finish(Series& series) {
    std::vector<double> values;
    values.reserve(series.samples.size());
    for (const auto& s : series.samples) {
        values.push_back(s.value);
    }
    series.summary = summarize(values);
    series.bins = histogram(values);
    series.largest = series.samples;
    // Ties keep replay order, so the list is the same on every run.
    std::stable_sort(series.largest.begin(), series.largest.end(),
                     [](const Sample& a, const Sample& b) { return a.value > b.value; });
    if (series.largest.size() > 5) {
        series.largest.resize(5);
    }
}

} // namespace

std::vector<MeasureDistribution> distribute(const Replay& replay,
                                            const std::vector<core::MeasureId>& measures) {
    std::vector<MeasureDistribution> out;
    for (const auto measure : measures) {
        MeasureDistribution d;
        d.measure = measure;
        for (std::size_t c = 0; c < replay.commits.size(); ++c) {
            const auto& functions = replay.commits[c].report.functions;
            for (std::size_t f = 0; f < functions.size(); ++f) {
                const auto& fn = functions[f];
                const auto change = fn.delta(measure);
                if (fn.label == delta::DeltaLabel::added) {
                    d.added.samples.push_back({change.head, c, f});
                } else if ((fn.label == delta::DeltaLabel::changed ||
                            fn.label == delta::DeltaLabel::moved) &&
                           fn.base && fn.head) {
                    d.growth.samples.push_back({change.absolute, c, f});
                    if (change.percent) {
                        d.growth_percent.samples.push_back({*change.percent, c, f});
                    }
                }
            }
        }
        finish(d.growth);
        finish(d.growth_percent);
        finish(d.added);
        out.push_back(std::move(d));
    }
    return out;
}

WhatIf what_if(const Replay& replay, const policy::Policy& policy,
               const policy::JudgeOptions& options) {
    WhatIf result;
    result.policy_origin = options.policy_origin;
    for (std::size_t c = 0; c < replay.commits.size(); ++c) {
        const auto verdict = policy::judge(policy, replay.commits[c].report, options);
        ++result.judged;
        CommitJudgement judgement;
        judgement.commit = c;
        judgement.outcome = verdict.outcome;
        std::set<std::string> seen;
        for (const auto& finding : verdict.findings) {
            if (finding.level == policy::Level::warning || finding.tolerated) {
                ++judgement.warnings;
            }
            seen.insert(finding.rule_id);
        }
        for (const auto& rule : policy.rules) {
            if (seen.count(rule.id) != 0) {
                judgement.rules.push_back(rule.id);
                ++result.rule_commits[rule.id];
            }
        }
        if (verdict.outcome == policy::Outcome::blocked) {
            ++result.blocked;
        } else if (!verdict.findings.empty()) {
            ++result.warned;
        }
        if (!verdict.findings.empty()) {
            result.flagged.push_back(std::move(judgement));
        }
    }
    return result;
}

std::string replay_span(const Replay& replay) {
    if (replay.commits.empty()) {
        return "no commits";
    }
    return replay.commits.front().commit.id.short_hex() + ".." +
           replay.commits.back().commit.id.short_hex();
}

namespace {

double percentile_of(const Series& series, double p) {
    std::vector<double> values;
    for (const auto& s : series.samples) {
        values.push_back(s.value);
    }
    std::sort(values.begin(), values.end());
    return percentile(values, p);
}

// A limit as the policy file shows it: two decimals, never negative.
std::string limit_text(double value) {
    return fmt::format("{:.2f}", std::max(0.0, value));
}

std::string origin_comment(double p, const char* what, core::MeasureId measure, const Series& s,
                           const Replay& replay, double value, const char* unit) {
    std::string text = fmt::format("p{:g} of {} {} over {} functions in {} commits {}: {}{}", p,
                                   core::measure_name(measure), what, s.summary.count,
                                   replay.commits.size(), replay_span(replay),
                                   std::string(what) == "growth" ? fmt::format("{:+.2f}", value)
                                                                 : fmt::format("{:.2f}", value),
                                   unit);
    if (value < 0) {
        text += " (raised to 0: a limit cannot be negative)";
    }
    return text;
}

} // namespace

std::string suggest_policy(const Replay& replay,
                           const std::vector<MeasureDistribution>& distributions, double p) {
    if (!(p >= 0 && p <= 100)) {
        throw UsageError(
            fmt::format("percentile \"{}\" is out of range (give a number from 0 to 100)", p));
    }
    std::ostringstream out;
    out << "# Tollgate policy suggested by \"tollgate calibrate --suggest "
        << fmt::format("{:g}", p) << "\" from " << replay.commits.size() << " replayed commits "
        << replay_span(replay)
        << "\n# of "
        // A name with a line break must not end the comment and write policy keys.
        << (replay.history.tip_name.empty()
                ? "the history"
                : "\"" + text::terminal_text(replay.history.tip_name) + "\"")
        << ". Each limit is the p" << fmt::format("{:g}", p)
        << " of the team's own past changes\n# (linear interpolation between closest ranks), "
           "rounded to two decimals: review before use.\n\n";
    out << "tollgate-policy: 1\n\njudge-with: base              # the target branch's policy "
           "judges a change\n\nrules:\n";
    bool any = false;
    for (const auto& d : distributions) {
        const std::string name(core::measure_name(d.measure));
        if (d.growth.summary.count > 0) {
            any = true;
            const double absolute = percentile_of(d.growth, p);
            out << "  - id: " << name << "-growth\n"
                << "    kind: growth              # changed functions: head minus base; a finding "
                   "when either limit is exceeded\n"
                << "    measure: " << name << "\n";
            if (d.growth_percent.summary.count > 0) {
                const double percent = percentile_of(d.growth_percent, p);
                out << "    max-increase-percent: " << limit_text(percent) << "   # "
                    << origin_comment(p, "growth", d.measure, d.growth_percent, replay, percent,
                                      "%")
                    << "\n";
            }
            out << "    max-increase: " << limit_text(absolute) << "   # "
                << origin_comment(p, "growth", d.measure, d.growth, replay, absolute, "") << "\n"
                << "    level: blocking\n\n";
        }
        if (d.added.summary.count > 0) {
            any = true;
            const double ceiling = percentile_of(d.added, p);
            out << "  - id: new-function-" << name << "\n"
                << "    kind: added-ceiling       # added functions: their head value\n"
                << "    measure: " << name << "\n"
                << "    ceiling: " << limit_text(ceiling) << "   # "
                << origin_comment(p, "value of added functions", d.measure, d.added, replay,
                                  ceiling, "")
                << "\n    level: warning\n\n";
        }
    }
    if (!any) {
        out << "  []                            # the history had no changed or added function\n";
    }
    return out.str();
}

} // namespace tollgate::calibrate
