// SPDX-License-Identifier: MIT
// The terminal table of a change report.
#include "gate/report/change_report.hpp"
#include "gate/report/marks.hpp"
#include "gate/report/measure_table.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <functional>
#include <vector>

namespace tollgate::report {

namespace {

using core::MeasureId;
using delta::ChangeReport;
using delta::FunctionDelta;

constexpr const char* k_red = "\x1b[31m";
constexpr const char* k_green = "\x1b[32m";
constexpr const char* k_dim = "\x1b[2m";
constexpr const char* k_yellow = "\x1b[33m";
constexpr const char* k_bold = "\x1b[1m";
constexpr const char* k_reset = "\x1b[0m";

std::string side_value(const std::optional<delta::FunctionSide>& side, MeasureId id, int decimals) {
    return side ? format_number(core::measure_value(side->measures, id), decimals) : "-";
}

// "base -> head (+pct)" for one measure of one function.
std::string change_cell(const FunctionDelta& f, MeasureId id, int decimals) {
    const auto d = f.delta(id);
    std::string cell = side_value(f.base, id, decimals) + " -> " + side_value(f.head, id, decimals);
    if (f.base && f.head && d.absolute != 0.0) {
        cell += " (" + format_percent(d.percent) + ")";
    }
    return cell;
}

std::string location_of(const FunctionDelta& f) {
    const auto& side = f.shown_side();
    return fmt::format("{}:{}", side.path, side.start_line);
}

} // namespace

std::string rules_broken_by(const policy::Verdict& verdict, const FunctionDelta& f) {
    const auto& side = f.shown_side();
    std::string blocking, warning;
    for (const auto& finding : verdict.findings) {
        if (finding.function != f.name || finding.path != side.path ||
            finding.start_line != side.start_line) {
            continue;
        }
        std::string& list = finding.blocks() ? blocking : warning;
        list += (list.empty() ? "" : ", ") + finding.rule_id;
    }
    if (blocking.empty() || warning.empty()) {
        return blocking + warning;
    }
    return blocking + ", " + warning;
}

namespace {

void write_verdict_text(std::ostream& out, const policy::Verdict& verdict,
                        const std::function<std::string(const char*, const std::string&)>& paint) {
    const std::size_t blocking = policy::count_blocking(verdict);
    const std::size_t warnings = verdict.findings.size() - blocking;
    const bool blocked = verdict.outcome == policy::Outcome::blocked;
    std::string line = blocked ? fmt::format("verdict: BLOCKED by {} blocking finding{}", blocking,
                                             blocking == 1 ? "" : "s")
                               : std::string("verdict: pass");
    if (warnings > 0) {
        line += fmt::format("{} {} warning{}", blocked ? "," : " with", warnings,
                            warnings == 1 ? "" : "s");
    }
    line += " (policy: " + verdict.policy_origin + ")";
    out << paint(blocked ? k_red : k_green, line) << "\n";
    for (const auto& f : verdict.findings) {
        const bool blocks = f.blocks();
        out << "  " << paint(blocks ? k_red : k_yellow, blocks ? "blocking" : "warning ") << "  "
            << f.message << "\n";
    }
    for (const auto& note : verdict.notes) {
        out << "  note: " << note << "\n";
    }
}

} // namespace

void write_change_text(std::ostream& out, const ChangeReport& report,
                       const policy::Verdict& verdict, const RenderOptions& options) {
    const bool colour = options.colour == Colour::on;
    const std::function<std::string(const char*, const std::string&)> paint =
        [colour](const char* code, const std::string& text) {
            return colour ? std::string(code) + text + k_reset : text;
        };
    out << paint(k_bold, fmt::format("tollgate: {} -> {}", report.base_label, report.head_label))
        << "\n";
    if (!verdict.policy_change_summary.empty()) {
        out << paint(k_yellow, "policy: " + verdict.policy_change_summary) << "\n";
        for (const auto& change : verdict.policy_changes) {
            out << paint(k_yellow, "  " + change) << "\n";
        }
    }
    for (const auto& note : report.notes) {
        out << "note: " << note << "\n";
    }
    if (report.functions.empty()) {
        if (report.measured_files == 0) {
            out << "no C/C++ file changed: nothing to measure\n";
        } else {
            out << fmt::format("{} C/C++ file{} changed, but no function definition was touched\n",
                               report.measured_files, report.measured_files == 1 ? "" : "s");
        }
    } else {
        std::vector<std::vector<std::string>> rows;
        rows.push_back({"label", "location", "function", "V", "D", "E", "rules"});
        for (const auto& f : report.functions) {
            rows.push_back({delta::label_name(f.label), location_of(f), function_title(f),
                            change_cell(f, MeasureId::volume, 1),
                            change_cell(f, MeasureId::difficulty, 2),
                            change_cell(f, MeasureId::effort, 0), rules_broken_by(verdict, f)});
        }
        std::vector<std::size_t> widths(rows.front().size(), 0);
        for (const auto& row : rows) {
            for (std::size_t c = 0; c < row.size(); ++c) {
                widths[c] = std::max(widths[c], row[c].size());
            }
        }
        for (std::size_t r = 0; r < rows.size(); ++r) {
            std::string line;
            for (std::size_t c = 0; c < rows[r].size(); ++c) {
                const bool numeric = c >= 3 && c <= 5;
                line += c == 0 ? "" : "  ";
                line += numeric ? fmt::format("{:>{}}", rows[r][c], widths[c])
                                : fmt::format("{:<{}}", rows[r][c], widths[c]);
            }
            while (!line.empty() && line.back() == ' ') {
                line.pop_back();
            }
            if (r == 0) {
                line = paint(k_bold, line);
            } else {
                const FunctionDelta& f = report.functions[r - 1];
                const double growth = f.delta(MeasureId::effort).absolute;
                if (f.label == delta::DeltaLabel::unchanged) {
                    line = paint(k_dim, line);
                } else if (growth > 0) {
                    line = paint(k_red, line);
                } else if (growth < 0) {
                    line = paint(k_green, line);
                }
            }
            out << line << "\n";
        }
        const auto& t = report.totals;
        const auto effort = core::compute_delta(t.base_effort, t.head_effort);
        out << fmt::format("total: {} function{} touched in {} file{} ({} added, {} changed, {} "
                           "removed); effort {} -> {} ({}{}, {})\n",
                           t.functions, t.functions == 1 ? "" : "s", report.files.size(),
                           report.files.size() == 1 ? "" : "s", t.added, t.changed, t.removed,
                           group_thousands(t.base_effort), group_thousands(t.head_effort),
                           effort.absolute >= 0 ? "+" : "", group_thousands(effort.absolute),
                           format_percent(effort.percent));
    }
    for (const auto& lines : report.unmeasured) {
        out << fmt::format("unmeasured: {}: {}\n", lines.path, unmeasured_text(lines));
    }
    write_verdict_text(out, verdict, paint);
    for (const auto& s : report.skipped) {
        out << fmt::format("skipped: {} ({})\n", s.path, s.reason);
    }
    for (const auto& w : report.warnings) {
        out << fmt::format("warning: {} {}{}: {}\n", w.side, w.path,
                           w.line > 0 ? ":" + std::to_string(w.line) : std::string(), w.message);
    }
}

std::string group_thousands(double value) {
    const double rounded = std::round(value);
    const bool negative = rounded < 0;
    std::string digits = fmt::format("{:.0f}", std::fabs(rounded));
    std::string grouped;
    for (std::size_t i = 0; i < digits.size(); ++i) {
        if (i > 0 && (digits.size() - i) % 3 == 0) {
            grouped += ',';
        }
        grouped += digits[i];
    }
    return (negative && grouped != "0" ? "-" : "") + grouped;
}

std::string format_percent(const std::optional<double>& percent) {
    if (!percent) {
        return "new";
    }
    const double rounded = std::round(*percent);
    if (rounded == 0.0) {
        return *percent > 0 ? "+0%" : (*percent < 0 ? "-0%" : "0%");
    }
    return fmt::format("{}{:.0f}%", rounded > 0 ? "+" : "", rounded);
}

std::string make_link(const std::string& link_template, const std::string& commit,
                      const std::string& path, unsigned line) {
    if (link_template.empty()) {
        return {};
    }
    std::string link = link_template;
    const auto replace_all = [&link](const std::string& from, const std::string& to) {
        for (auto pos = link.find(from); pos != std::string::npos;
             pos = link.find(from, pos + to.size())) {
            link.replace(pos, from.size(), to);
        }
    };
    replace_all("{commit}", commit);
    replace_all("{path}", path);
    replace_all("{line}", std::to_string(line));
    return link;
}

} // namespace tollgate::report
