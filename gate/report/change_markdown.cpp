// SPDX-License-Identifier: MIT
// The Markdown delta table a reviewer reads in the merge request.
#include "gate/report/change_report.hpp"
#include "gate/report/marks.hpp"
#include "gate/report/measure_table.hpp"

#include <fmt/format.h>

namespace tollgate::report {

namespace {

using core::MeasureId;
using delta::ChangeReport;
using delta::FunctionDelta;

// Escape text for a table cell: pipes split cells, backslashes and angle brackets need care.
std::string cell_text(const std::string& text) {
    std::string escaped;
    for (char c : text) {
        switch (c) {
        case '|':
            escaped += "\\|";
            break;
        case '<':
            escaped += "&lt;";
            break;
        case '>':
            escaped += "&gt;";
            break;
        case '\\':
            escaped += "\\\\";
            break;
        case '*':
        case '_':
        case '`':
        case '[':
        case ']':
            escaped += '\\';
            escaped += c;
            break;
        default:
            escaped += c;
        }
    }
    return escaped;
}

// Put a function name in a code span; only the pipe needs escaping there inside a table.
std::string code_cell(const std::string& text) {
    std::string escaped;
    for (char c : text) {
        if (c == '|') {
            escaped += "\\|";
        } else {
            escaped += c;
        }
    }
    return "`" + escaped + "`";
}

// The function's name in a code span, its base identity when that changed, then its marks.
std::string function_cell(const FunctionDelta& f) {
    const std::string base = base_identity(f);
    return code_cell(head_identity(f)) + (base.empty() ? "" : " (base: " + code_cell(base) + ")") +
           cell_text(marks_text(f));
}

std::string pair_cell(const FunctionDelta& f, MeasureId id, int decimals) {
    const auto value = [&](const std::optional<delta::FunctionSide>& side) {
        if (!side) {
            return std::string("–");
        }
        const double v = core::measure_value(side->measures, id);
        return decimals == 0 ? group_thousands(v) : format_number(v, decimals);
    };
    return value(f.base) + " → " + value(f.head);
}

std::string growth_cell(const FunctionDelta& f) {
    const auto d = f.delta(MeasureId::effort);
    if (f.label == delta::DeltaLabel::unchanged || d.absolute == 0.0) {
        return "0";
    }
    return fmt::format("{}{} ({})", d.absolute > 0 ? "+" : "", group_thousands(d.absolute),
                       format_percent(d.percent));
}

std::string location_cell(const FunctionDelta& f, const ChangeReport& report,
                          const RenderOptions& options) {
    const auto& side = f.shown_side();
    const std::string text = fmt::format("{}:{}", side.path, side.start_line);
    const std::string commit = f.head ? report.head_commit : report.base_commit;
    const std::string link = make_link(options.link_template, commit.empty() ? "HEAD" : commit,
                                       side.path, side.start_line);
    if (link.empty()) {
        return cell_text(text);
    }
    return "[" + cell_text(text) + "](" + link + ")";
}

void write_table(std::ostream& out, const ChangeReport& report, const policy::Verdict& verdict,
                 const RenderOptions& options, std::size_t first, std::size_t last) {
    out << "| | function | location | volume | difficulty | effort | effort change | rules |\n";
    out << "|---|---|---|---:|---:|---:|---:|---|\n";
    for (std::size_t i = first; i < last; ++i) {
        const FunctionDelta& f = report.functions[i];
        const std::string rules = rules_broken_by(verdict, f);
        out << fmt::format(
            "| {} | {} | {} | {} | {} | {} | {} | {} |\n", delta::label_name(f.label),
            function_cell(f), location_cell(f, report, options), pair_cell(f, MeasureId::volume, 1),
            pair_cell(f, MeasureId::difficulty, 2), pair_cell(f, MeasureId::effort, 0),
            growth_cell(f), rules.empty() ? std::string() : cell_text(rules));
    }
}

} // namespace

void write_change_markdown(std::ostream& out, const ChangeReport& report,
                           const policy::Verdict& verdict, const RenderOptions& options) {
    const auto& t = report.totals;
    const std::size_t blocking = policy::count_blocking(verdict);
    const std::size_t warnings = verdict.findings.size() - blocking;
    const bool blocked = verdict.outcome == policy::Outcome::blocked;
    std::string summary = blocked ? fmt::format("**Tollgate: blocked** by {} finding{}", blocking,
                                                blocking == 1 ? "" : "s")
                                  : std::string("**Tollgate: pass**");
    if (warnings > 0) {
        summary += fmt::format("{} {} warning{}", blocked ? "," : " with", warnings,
                               warnings == 1 ? "" : "s");
    }
    if (report.functions.empty()) {
        summary += report.measured_files == 0
                       ? ": no C/C++ file changed, nothing to measure."
                       : ": C/C++ files changed, but no function definition was touched.";
    } else {
        const auto effort = core::compute_delta(t.base_effort, t.head_effort);
        summary += fmt::format(": {} function{} touched in {} file{}, effort {}{} ({})",
                               t.functions, t.functions == 1 ? "" : "s", report.files.size(),
                               report.files.size() == 1 ? "" : "s", effort.absolute >= 0 ? "+" : "",
                               group_thousands(effort.absolute), format_percent(effort.percent));
        const FunctionDelta& top = report.functions.front();
        const auto top_growth = top.delta(MeasureId::effort);
        if (top_growth.absolute > 0) {
            summary += fmt::format(", largest growth `{}` +{}", top.name,
                                   group_thousands(top_growth.absolute));
        }
        summary += ".";
    }
    if (report.unmeasured_lines > 0) {
        summary +=
            fmt::format(" {} changed C/C++ line{} outside functions.", report.unmeasured_lines,
                        report.unmeasured_lines == 1 ? " lies" : "s lie");
    }
    out << summary << "\n\n";
    if (!verdict.policy_change_summary.empty()) {
        out << "> [!WARNING]\n> " << cell_text(verdict.policy_change_summary) << ":\n";
        for (const auto& change : verdict.policy_changes) {
            out << "> - " << cell_text(change) << "\n";
        }
        out << "\n";
    }
    for (const auto& f : verdict.findings) {
        const bool blocks = f.blocks();
        out << "- " << (blocks ? "**blocking**" : "warning") << ": " << cell_text(f.message)
            << "\n";
    }
    if (!verdict.findings.empty()) {
        out << "\n";
    }
    if (!report.functions.empty()) {
        const std::size_t shown = std::min(options.markdown_rows, report.functions.size());
        write_table(out, report, verdict, options, 0, shown);
        if (shown < report.functions.size()) {
            const std::size_t rest = report.functions.size() - shown;
            out << fmt::format("\n<details><summary>{} more function{}</summary>\n\n", rest,
                               rest == 1 ? "" : "s");
            write_table(out, report, verdict, options, shown, report.functions.size());
            out << "\n</details>\n";
        }
    }
    out << fmt::format("\n<sub>base {} → head {} · convention {} · policy {}</sub>\n",
                       cell_text(report.base_label), cell_text(report.head_label),
                       report.convention, cell_text(verdict.policy_origin));
    std::vector<std::string> bullets;
    for (const auto& note : verdict.notes) {
        bullets.push_back("policy note: " + cell_text(note));
    }
    for (const auto& note : report.notes) {
        bullets.push_back("note: " + cell_text(note));
    }
    for (const auto& lines : report.unmeasured) {
        bullets.push_back(
            fmt::format("unmeasured `{}`: {}", lines.path, cell_text(unmeasured_text(lines))));
    }
    for (const auto& s : report.skipped) {
        bullets.push_back(fmt::format("skipped `{}` ({})", s.path, s.reason));
    }
    for (const auto& w : report.warnings) {
        bullets.push_back(fmt::format("warning ({}) `{}{}`: {}", w.side, w.path,
                                      w.line > 0 ? ":" + std::to_string(w.line) : std::string(),
                                      cell_text(w.message)));
    }
    if (!bullets.empty()) {
        out << "\n";
        for (const auto& bullet : bullets) {
            out << "- " << bullet << "\n";
        }
    }
}

} // namespace tollgate::report
