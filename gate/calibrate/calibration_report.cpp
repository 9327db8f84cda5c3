// SPDX-License-Identifier: MIT
// Text, JSON and HTML views of a calibration; every number comes from the Calibration value.
#include "gate/calibrate/calibration_report.hpp"

#include "gate/calibrate/suggested_policy.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/delta/function_delta.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <nlohmann/json.hpp>
#include <string>

namespace tollgate::calibrate {

namespace {

using text::terminal_text;

// Cut a commit subject for one terminal line (the JSON and HTML keep it whole).
std::string short_subject(const std::string& subject) {
    return text::clip(terminal_text(subject), 60);
}

using nlohmann::json;

std::string number(double value) {
    return fmt::format("{:.2f}", value);
}

struct SeriesView {
    const char* key;   // JSON key
    const char* title; // heading
    const char* unit;  // "" or "%"
    const Series* series;
};

std::vector<SeriesView> views_of(const MeasureDistribution& d) {
    return {
        {"growth", "growth of changed functions (head - base)", "", &d.growth},
        {"growth_percent", "growth of changed functions, percent of base", "%", &d.growth_percent},
        {"added", "value of added functions", "", &d.added}};
}

const delta::FunctionDelta& function_of(const Replay& replay, const Sample& s) {
    return replay.commits[s.commit].report.functions[s.function];
}

std::string function_place(const delta::FunctionDelta& f) {
    const auto& side = f.shown_side();
    return fmt::format("{}:{} {}()", side.path, side.start_line, f.name);
}

std::string header_line(const Calibration& c) {
    const Replay& r = *c.replay;
    std::size_t functions = 0;
    for (const auto& commit : r.commits) {
        functions += commit.report.functions.size();
    }
    return fmt::format("{} commits replayed ({}) on {}, {} touched functions, {:.1f} s on {} "
                       "threads; blobs parsed {} of {} visits ({} distinct)",
                       r.commits.size(), replay_span(r),
                       r.history.tip_name.empty() ? std::string("history") : r.history.tip_name,
                       functions, c.seconds, c.threads, c.cache.parses, c.cache.visits,
                       c.cache.distinct_blobs);
}

std::string percent_text(std::size_t count, std::size_t total) {
    return policy::plain_number(std::round(rate_percent(count, total) * 100) / 100) + "%";
}

// The lines that say what was counted: the policy honoured and the folders left out.
std::vector<std::string> scope_lines(const Calibration& c) {
    std::vector<std::string> lines;
    if (c.scope == nullptr) {
        return lines;
    }
    const auto& scope = *c.scope;
    lines.push_back("counted: functions inside the paths and above the noise floor of " +
                    scope.origin);
    if (scope.vendored.empty()) {
        lines.push_back("vendored: no folder looks like bundled third-party code");
        return lines;
    }
    const bool excluded = scope.handling == VendoredHandling::exclude;
    lines.push_back(excluded ? "vendored: left out, not parsed (--keep-vendored keeps them):"
                             : "vendored: kept (--keep-vendored):");
    for (const auto& folder : scope.vendored) {
        lines.push_back("  " + folder.path + "/ (" + vendored_sign_text(folder.sign) + ")" +
                        (excluded
                             ? fmt::format(": {} changed {} in {} {} left out", folder.files,
                                           folder.files == 1 ? "file" : "files", folder.commits,
                                           folder.commits == 1 ? "commit" : "commits")
                             : std::string()));
    }
    return lines;
}

// The lines of a block-rate suggestion: its replayed rates, sample and limits.
std::vector<std::string> suggestion_lines(const BlockRateSuggestion& s) {
    std::vector<std::string> lines;
    const auto& w = s.replayed;
    lines.push_back(fmt::format("replayed with the suggestion: {} of {} commits blocked ({}), {} "
                                "passed with warnings ({})",
                                w.blocked, w.judged, percent_text(w.blocked, w.judged), w.warned,
                                percent_text(w.warned, w.judged)));
    lines.push_back(fmt::format("sample: {} commits, {} functions inside the paths and above "
                                "the noise floor",
                                s.commits, s.functions));
    for (const auto& limit : s.limits) {
        lines.push_back("  " + limit.rule_id + " " + limit_key_name(limit.key) + ": " +
                        policy::plain_number(limit.value) +
                        (limit.searched
                             ? fmt::format(" ({} of {} commits with a value are above it)",
                                           limit.commits_above, limit.commits_with_values)
                             : std::string(" (kept: no replayed value)")));
    }
    for (const auto* target : {&s.blocking, &s.warning}) {
        if (!target->reached) {
            lines.push_back(fmt::format("not reached: even the loosest {} limits flag more than "
                                        "{}% of commits",
                                        target == &s.blocking ? "blocking" : "warning",
                                        policy::plain_number(target->percent)));
        }
    }
    if (s.small_sample) {
        lines.push_back("warning: " + small_sample_warning(s));
    }
    return lines;
}

std::string suggestion_title(const BlockRateSuggestion& s) {
    return fmt::format("suggestion: at most {}% of commits blocked, {}% passed with warnings",
                       policy::plain_number(s.blocking.percent),
                       policy::plain_number(s.warning.percent));
}

} // namespace

void write_calibration_text(std::ostream& out, const Calibration& c) {
    const Replay& r = *c.replay;
    out << "tollgate calibrate: " << terminal_text(header_line(c)) << "\n";
    for (const auto& note : r.notes) {
        out << "note: " << terminal_text(note) << "\n";
    }
    for (const auto& line : scope_lines(c)) {
        out << terminal_text(line) << "\n";
    }
    out << "percentiles: linear interpolation between closest ranks; changed functions counted "
           "with zero and negative changes\n";
    for (const auto& d : c.distributions) {
        out << "\n== " << core::measure_name(d.measure) << " ==\n";
        out << fmt::format("{:<48} {:>6} {:>11} {:>11} {:>11} {:>11} {:>11} {:>11}\n", "", "count",
                           "p50", "p75", "p90", "p95", "p99", "max");
        for (const auto& v : views_of(d)) {
            const auto& s = v.series->summary;
            out << fmt::format("{:<48} {:>6} {:>11} {:>11} {:>11} {:>11} {:>11} {:>11}\n", v.title,
                               s.count, number(s.at[0]), number(s.at[1]), number(s.at[2]),
                               number(s.at[3]), number(s.at[4]), number(s.max));
        }
        for (const auto& v : views_of(d)) {
            if (v.series->bins.empty()) {
                continue;
            }
            out << "\n" << v.title << ":\n";
            std::size_t top = 1;
            for (const auto& b : v.series->bins) {
                top = std::max(top, b.count);
            }
            for (const auto& b : v.series->bins) {
                const auto width = static_cast<std::size_t>(
                    40.0 * static_cast<double>(b.count) / static_cast<double>(top) + 0.5);
                const std::string range = b.overflow ? fmt::format("> {}{}", number(b.low), v.unit)
                                                     : fmt::format("{}{} .. {}{}", number(b.low),
                                                                   v.unit, number(b.high), v.unit);
                out << fmt::format("  {:>28} |{:<40}| {}\n", range, std::string(width, '#'),
                                   b.count);
            }
            out << "  largest:\n";
            for (const auto& s : v.series->largest) {
                const auto& commit = r.commits[s.commit].commit;
                out << fmt::format("    {}{}  {} {}  {}\n", number(s.value), v.unit,
                                   commit.id.short_hex(), short_subject(commit.subject),
                                   terminal_text(function_place(function_of(r, s))));
            }
        }
    }
    if (c.what_if) {
        const auto& w = *c.what_if;
        out << "\n== what if: " << terminal_text(w.policy_origin) << " ==\n";
        out << fmt::format("{} of {} commits blocked, {} passed with warnings\n", w.blocked,
                           w.judged, w.warned);
        for (const auto& [rule, count] : w.rule_commits) {
            out << fmt::format("  rule \"{}\": {} commits\n", terminal_text(rule), count);
        }
        for (const auto& j : w.flagged) {
            const auto& commit = r.commits[j.commit].commit;
            std::string rules;
            for (const auto& id : j.rules) {
                rules += (rules.empty() ? "" : ", ") + id;
            }
            out << fmt::format("  {} {:<8} {}  ({})\n", commit.id.short_hex(),
                               j.outcome == policy::Outcome::blocked ? "blocked" : "warned",
                               short_subject(commit.subject), terminal_text(rules));
        }
    }
    if (c.suggestion) {
        out << "\n== " << suggestion_title(*c.suggestion) << " ==\n";
        for (const auto& line : suggestion_lines(*c.suggestion)) {
            out << terminal_text(line) << "\n";
        }
    }
}

namespace {

json summary_json(const Summary& s) {
    return {{"count", s.count}, {"p50", s.at[0]}, {"p75", s.at[1]}, {"p90", s.at[2]},
            {"p95", s.at[3]},   {"p99", s.at[4]}, {"max", s.max},   {"min", s.min}};
}

} // namespace

void write_calibration_json(std::ostream& out, const Calibration& c) {
    const Replay& r = *c.replay;
    json commits = json::array();
    for (const auto& rc : r.commits) {
        commits.push_back({{"commit", rc.commit.id.hex},
                           {"parent", rc.commit.parent ? rc.commit.parent->hex : ""},
                           {"subject", rc.commit.subject},
                           {"merge", rc.commit.parent_count > 1},
                           {"functions", rc.report.functions.size()}});
    }
    json measures = json::object();
    for (const auto& d : c.distributions) {
        json m = json::object();
        for (const auto& v : views_of(d)) {
            json bins = json::array();
            for (const auto& b : v.series->bins) {
                bins.push_back({{"low", b.low},
                                {"high", b.high},
                                {"count", b.count},
                                {"overflow", b.overflow}});
            }
            json largest = json::array();
            for (const auto& s : v.series->largest) {
                const auto& f = function_of(r, s);
                const auto& commit = r.commits[s.commit].commit;
                largest.push_back({{"value", s.value},
                                   {"commit", commit.id.hex},
                                   {"subject", commit.subject},
                                   {"function", f.name},
                                   {"file", f.shown_side().path},
                                   {"line", f.shown_side().start_line}});
            }
            json values = json::array();
            for (const auto& s : v.series->samples) {
                values.push_back(s.value);
            }
            m[v.key] = {{"summary", summary_json(v.series->summary)},
                        {"histogram", bins},
                        {"largest", largest},
                        {"values", values}};
        }
        measures[std::string(core::measure_name(d.measure))] = m;
    }
    json doc = {{"schema", "tollgate.calibrate/1"},
                {"tip", r.history.tip_name},
                {"complete", r.end == ReplayEnd::complete},
                {"notes", r.notes},
                {"percentile_method", "linear interpolation between closest ranks (numpy "
                                      "'linear', Python statistics.quantiles inclusive)"},
                {"commits", commits},
                {"measures", measures},
                {"cache",
                 {{"visits", c.cache.visits},
                  {"hits", c.cache.hits},
                  {"parses", c.cache.parses},
                  {"damaged", c.cache.damaged},
                  {"write_failures", c.cache.write_failures},
                  {"distinct_blobs", c.cache.distinct_blobs}}},
                {"seconds", c.seconds},
                {"threads", c.threads}};
    if (c.what_if) {
        const auto& w = *c.what_if;
        json flagged = json::array();
        for (const auto& j : w.flagged) {
            flagged.push_back({{"commit", r.commits[j.commit].commit.id.hex},
                               {"subject", r.commits[j.commit].commit.subject},
                               {"outcome", policy::outcome_name(j.outcome)},
                               {"warnings", j.warnings},
                               {"rules", j.rules}});
        }
        doc["what_if"] = {{"policy", w.policy_origin}, {"judged", w.judged},
                          {"blocked", w.blocked},      {"warned", w.warned},
                          {"rules", w.rule_commits},   {"flagged", flagged}};
    }
    if (c.scope != nullptr) {
        json vendored = json::array();
        for (const auto& folder : c.scope->vendored) {
            vendored.push_back({{"path", folder.path},
                                {"sign", vendored_sign_text(folder.sign)},
                                {"excluded", c.scope->handling == VendoredHandling::exclude},
                                {"changed_files", folder.files},
                                {"commits", folder.commits}});
        }
        doc["scope"] = {{"policy", c.scope->origin},
                        {"include", c.scope->policy.paths.include},
                        {"exclude", c.scope->policy.paths.exclude},
                        {"vendored", vendored}};
    }
    if (c.suggestion) {
        const auto& s = *c.suggestion;
        json limits = json::array();
        for (const auto& limit : s.limits) {
            limits.push_back({{"rule", limit.rule_id},
                              {"key", limit_key_name(limit.key)},
                              {"value", limit.value},
                              {"searched", limit.searched},
                              {"commits_with_values", limit.commits_with_values},
                              {"commits_above", limit.commits_above}});
        }
        doc["suggestion"] = {{"block_rate_target", s.blocking.percent},
                             {"warning_rate_target", s.warning.percent},
                             {"block_target_reached", s.blocking.reached},
                             {"warning_target_reached", s.warning.reached},
                             {"judged", s.replayed.judged},
                             {"blocked", s.replayed.blocked},
                             {"warned", s.replayed.warned},
                             {"block_rate", rate_percent(s.replayed.blocked, s.replayed.judged)},
                             {"warning_rate", rate_percent(s.replayed.warned, s.replayed.judged)},
                             {"sample", {{"commits", s.commits}, {"functions", s.functions}}},
                             {"small_sample", s.small_sample},
                             {"limits", limits}};
    }
    out << text::dump_json(doc, 2) << "\n";
}

namespace {

// Every text on the page, ours or the history's, goes through one HTML escape.
std::string escape(const std::string& text) {
    return text::html_text(text);
}

// The chart palette: Okabe, M. and Ito, K., "Color Universal Design (CUD): how to make figures
// and presentations that are friendly to colorblind people", 2008 (hex values from memory):
// blue for the bins, vermillion for the overflow bin, told apart by hue and lightness under
// red-green colour blindness, and each also marked in words (the ">" label and the legend).
constexpr const char* k_bin_colour = "#0072B2";      // Okabe-Ito blue
constexpr const char* k_overflow_colour = "#D55E00"; // Okabe-Ito vermillion

std::string svg_histogram(const Series& series, const std::string& id, const char* unit) {
    constexpr int k_width = 640, k_height = 200, k_bottom = 40, k_left = 40;
    std::size_t top = 1;
    for (const auto& b : series.bins) {
        top = std::max(top, b.count);
    }
    const int bars = static_cast<int>(series.bins.size());
    const int bar_width = bars == 0 ? 0 : (k_width - k_left) / bars;
    std::string svg = fmt::format(
        "<svg class=\"histogram\" id=\"{}\" xmlns=\"http://www.w3.org/2000/svg\" width=\"{}\" "
        "height=\"{}\" viewBox=\"0 0 {} {}\" role=\"img\">",
        id, k_width, k_height + k_bottom, k_width, k_height + k_bottom);
    svg += fmt::format("<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"#444\"/>", k_left,
                       k_height, k_width, k_height);
    svg += fmt::format("<text x=\"2\" y=\"12\" font-size=\"10\">{}</text>", top);
    for (int i = 0; i < bars; ++i) {
        const auto& b = series.bins[static_cast<std::size_t>(i)];
        const int h = static_cast<int>(static_cast<double>(k_height - 10) *
                                       static_cast<double>(b.count) / static_cast<double>(top));
        const int x = k_left + i * bar_width;
        const std::string label = b.overflow
                                      ? "&gt; " + number(b.low) + unit
                                      : number(b.low) + unit + " .. " + number(b.high) + unit;
        svg += fmt::format("<rect class=\"bar\" x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" "
                           "fill=\"{}\" data-count=\"{}\"><title>{}: {}</title></rect>",
                           x + 1, k_height - h, bar_width - 2, h,
                           b.overflow ? k_overflow_colour : k_bin_colour, b.count, label, b.count);
        svg +=
            fmt::format("<text x=\"{}\" y=\"{}\" font-size=\"9\" text-anchor=\"middle\">{}</text>",
                        x + bar_width / 2, k_height - h - 2, b.count);
        if (i % 2 == 0 || b.overflow) {
            svg += fmt::format("<text x=\"{}\" y=\"{}\" font-size=\"9\" "
                               "text-anchor=\"middle\">{}{}</text>",
                               x + bar_width / 2, k_height + 14 + (i % 4 == 0 ? 0 : 12),
                               b.overflow ? "&gt;" : "", number(b.low));
        }
    }
    svg += "</svg>";
    return svg;
}

} // namespace

void write_calibration_html(std::ostream& out, const Calibration& c) {
    const Replay& r = *c.replay;
    out << "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
           "<title>tollgate calibrate</title><style>"
           "body{font-family:sans-serif;margin:2em;color:#222;max-width:1100px}"
           "table{border-collapse:collapse;margin:0.5em 0}"
           "td,th{border:1px solid #bbb;padding:3px 8px;text-align:right}"
           "th:first-child,td:first-child{text-align:left}"
           ".largest td:nth-child(n+2),.largest th:nth-child(n+2){text-align:left}"
           "code{font-family:monospace}.note{color:#555}"
           "</style></head><body>\n";
    out << "<h1>tollgate calibrate</h1>\n<p id=\"summary\">" << escape(header_line(c)) << "</p>\n";
    for (const auto& note : r.notes) {
        out << "<p class=\"note\">" << escape(note) << "</p>\n";
    }
    for (const auto& line : scope_lines(c)) {
        out << "<p class=\"note scope\">" << escape(line) << "</p>\n";
    }
    out << "<p class=\"note\">Percentiles: linear interpolation between closest ranks. Changed "
           "functions are counted with zero and negative changes.</p>\n";
    out << "<p class=\"note legend\"><span style=\"color:" << k_bin_colour
        << "\">&#9632;</span> functions per bin; <span style=\"color:" << k_overflow_colour
        << "\">&#9632;</span> the last bin, marked &gt;, holds every larger value.</p>\n";
    for (const auto& d : c.distributions) {
        const std::string name(core::measure_name(d.measure));
        out << "<h2>" << escape(name) << "</h2>\n<table class=\"percentiles\" id=\"table-"
            << escape(name)
            << "\"><tr><th></th><th>count</th><th>p50</th><th>p75</th>"
               "<th>p90</th><th>p95</th><th>p99</th><th>max</th></tr>\n";
        for (const auto& v : views_of(d)) {
            const auto& s = v.series->summary;
            out << "<tr data-series=\"" << v.key << "\"><td>" << escape(v.title) << "</td><td>"
                << s.count << "</td>";
            for (double value : s.at) {
                out << "<td>" << number(value) << "</td>";
            }
            out << "<td>" << number(s.max) << "</td></tr>\n";
        }
        out << "</table>\n";
        for (const auto& v : views_of(d)) {
            if (v.series->bins.empty()) {
                continue;
            }
            out << "<h3>" << escape(name) << ": " << escape(v.title) << "</h3>\n"
                << svg_histogram(*v.series, "hist-" + name + "-" + v.key, v.unit) << "\n";
            out << "<table class=\"largest\"><tr><th>value</th><th>commit</th><th>subject</th>"
                   "<th>function</th></tr>\n";
            for (const auto& s : v.series->largest) {
                const auto& commit = r.commits[s.commit].commit;
                out << "<tr><td>" << number(s.value) << v.unit << "</td><td><code>"
                    << commit.id.short_hex() << "</code></td><td>" << escape(commit.subject)
                    << "</td><td><code>" << escape(function_place(function_of(r, s)))
                    << "</code></td></tr>\n";
            }
            out << "</table>\n";
        }
    }
    if (c.what_if) {
        const auto& w = *c.what_if;
        out << "<h2>What if: " << escape(w.policy_origin) << "</h2>\n<p id=\"what-if\">"
            << w.blocked << " of " << w.judged << " commits blocked, " << w.warned
            << " passed with warnings</p>\n<table><tr><th>commit</th><th>outcome</th>"
               "<th>subject</th><th>rules</th></tr>\n";
        for (const auto& j : w.flagged) {
            const auto& commit = r.commits[j.commit].commit;
            std::string rules;
            for (const auto& id : j.rules) {
                rules += (rules.empty() ? "" : ", ") + id;
            }
            out << "<tr><td><code>" << commit.id.short_hex() << "</code></td><td>"
                << (j.outcome == policy::Outcome::blocked ? "blocked" : "warned") << "</td><td>"
                << escape(commit.subject) << "</td><td>" << escape(rules) << "</td></tr>\n";
        }
        out << "</table>\n";
    }
    if (c.suggestion) {
        out << "<h2 id=\"suggestion\">" << escape(suggestion_title(*c.suggestion)) << "</h2>\n";
        for (const auto& line : suggestion_lines(*c.suggestion)) {
            out << "<p>" << escape(line) << "</p>\n";
        }
    }
    out << "</body></html>\n";
}

} // namespace tollgate::calibrate
