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
                                            const std::vector<core::MeasureId>& measures,
                                            const policy::Policy* honour) {
    std::vector<MeasureDistribution> out;
    for (const auto measure : measures) {
        MeasureDistribution d;
        d.measure = measure;
        for (std::size_t c = 0; c < replay.commits.size(); ++c) {
            const auto& functions = replay.commits[c].report.functions;
            for (std::size_t f = 0; f < functions.size(); ++f) {
                const auto& fn = functions[f];
                if (honour != nullptr && (!policy::in_scope(honour->paths, fn.shown_side().path) ||
                                          policy::below_noise_floor(honour->noise_floor, fn))) {
                    continue;
                }
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
            if (finding.level == policy::Level::warning || finding.grandfathered) {
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

} // namespace tollgate::calibrate
