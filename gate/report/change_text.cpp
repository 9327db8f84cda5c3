// SPDX-License-Identifier: MIT
// The terminal report of a change: the table first, the verdict last, fitted to the width.
#include "gate/common/text_safety.hpp"
#include "gate/report/change_report.hpp"
#include "gate/report/marks.hpp"
#include "gate/report/measure_table.hpp"
#include "gate/report/reading_order.hpp"

#include <fmt/format.h>
#include <functional>
#include <vector>

namespace tollgate::report {

namespace {

// The function's marks in brackets after its name, or nothing.
std::string marks_text(const delta::FunctionDelta& f) {
    const std::string marks = function_marks(f);
    return marks.empty() ? std::string() : " [" + marks + "]";
}

// The function's name (with its signature when that changed), its base identity when its name or
// signature changed, then its marks.
std::string name_cell(const delta::FunctionDelta& f) {
    const std::string base = base_identity(f);
    return text::terminal_text(head_identity(f)) +
           (base.empty() ? std::string() : " (base: " + text::terminal_text(base) + ")") +
           marks_text(f);
}

using core::MeasureId;
using delta::ChangeReport;
using delta::FunctionDelta;
using text::terminal_text;

// Colours follow the verdict, never the sign of a change. The palette is Okabe and Ito's
// ("Color Universal Design", 2008; hex values from memory), safe for red-green colour
// blindness, as the nearest xterm 256-colour codes: vermillion #D55E00 ~ 166 (#d75f00),
// orange #E69F00 ~ 178 (#d7af00), sky blue #56B4E9 ~ 74 (#5fafd7). Each has a word beside it.
constexpr const char* k_blocking = "\x1b[38;5;166m";
constexpr const char* k_warning = "\x1b[38;5;178m";
constexpr const char* k_passing = "\x1b[38;5;74m";
constexpr const char* k_bold = "\x1b[1m";
constexpr const char* k_reset = "\x1b[0m";

// The words that stand beside the colours (and for them, without colour).
constexpr const char* k_block_word = "block";
constexpr const char* k_warn_word = "warn";

std::string side_value(const std::optional<delta::FunctionSide>& side, MeasureId id, int decimals) {
    return side ? format_number(core::measure_value(side->measures, id), decimals) : "-";
}

// "base -> head" for one measure of one function.
std::string pair_cell(const FunctionDelta& f, MeasureId id, int decimals) {
    return side_value(f.base, id, decimals) + " -> " + side_value(f.head, id, decimals);
}

// "+6,949 (+278%)", "+344 (new)" or "0".
std::string change_cell(const FunctionDelta& f) {
    const auto d = f.delta(MeasureId::effort);
    if (f.label == delta::DeltaLabel::unchanged || d.absolute == 0.0) {
        return "0";
    }
    return fmt::format("{}{} ({})", d.absolute > 0 ? "+" : "", group_thousands(d.absolute),
                       format_percent(d.percent));
}

std::string location_of(const std::string& path, unsigned line) {
    return terminal_text(path) + ":" + std::to_string(line);
}

// The rule ids of a group, blocking ones first (the verdict's order), each once.
std::string rules_of(const FunctionFindings& group) {
    std::string rules;
    for (const auto* finding : group.findings) {
        const std::string id = terminal_text(finding->rule_id);
        if ((", " + rules + ",").find(", " + id + ",") == std::string::npos) {
            rules += (rules.empty() ? "" : ", ") + id;
        }
    }
    return rules;
}

// Writes lines fitted to the width, painted when colour is on.
class Lines {
public:
    Lines(std::ostream& out, const RenderOptions& options)
        : m_out(out), m_options(options), m_colour(options.colour == Colour::on) {}

    // Write `line` (already safe) wrapped to the width, continuation lines indented by `indent`.
    void write(const std::string& line, std::size_t indent = 2, const char* colour = nullptr) {
        for (const auto& piece : wrap_text(line, m_options.width, indent, m_options.fit)) {
            m_out << paint(colour, piece) << "\n";
        }
    }
    std::string paint(const char* colour, const std::string& text) const {
        return m_colour && colour != nullptr ? std::string(colour) + text + k_reset : text;
    }
    std::ostream& out() { return m_out; }

private:
    std::ostream& m_out;
    const RenderOptions& m_options;
    bool m_colour;
};

void write_table(Lines& lines, const ChangeReport& report, const ReadingOrder& order,
                 const RenderOptions& options) {
    // Drop ranks document the order columns go when the terminal is narrow.
    const std::vector<TableColumn> columns = {
        {"", false, Shorten::none, 0},
        {"label", false, Shorten::none, 4},
        {"function", false, Shorten::name, 0},
        {"location", false, Shorten::location, 0},
        {"effort change", true, Shorten::none, 0},
        {"effort", true, Shorten::none, 5},
        {"volume", true, Shorten::none, 1},
        {"difficulty", true, Shorten::none, 2},
        {"rules", false, Shorten::text, 3},
    };
    std::vector<std::vector<std::string>> rows;
    std::vector<const char*> colours;
    const auto add = [&](const FunctionDelta& f, const FunctionFindings* group) {
        const Standing standing = standing_of(group);
        const auto& side = f.shown_side();
        rows.push_back({standing == Standing::blocks  ? k_block_word
                        : standing == Standing::warns ? k_warn_word
                                                      : "",
                        delta::label_name(f.label), name_cell(f),
                        location_of(side.path, side.start_line), change_cell(f),
                        pair_cell(f, MeasureId::effort, 0), pair_cell(f, MeasureId::volume, 1),
                        pair_cell(f, MeasureId::difficulty, 2),
                        group != nullptr ? rules_of(*group) : std::string()});
        colours.push_back(standing == Standing::blocks  ? k_blocking
                          : standing == Standing::warns ? k_warning
                                                        : nullptr);
    };
    for (const auto* list : {&order.blocking, &order.warning}) {
        for (const auto& group : *list) {
            if (group.delta != nullptr) {
                add(*group.delta, &group);
            }
        }
    }
    for (const auto* f : order.others) {
        add(*f, nullptr);
    }
    const auto table = layout_table(columns, rows, options.width, options.fit);
    lines.out() << lines.paint(k_bold, table.front()) << "\n";
    for (std::size_t r = 1; r < table.size(); ++r) {
        lines.out() << lines.paint(colours[r - 1], table[r]) << "\n";
    }
    const auto& t = report.totals;
    const auto effort = core::compute_delta(t.base_effort, t.head_effort);
    lines.write(fmt::format("total: {} touched in {} ({} added, {} changed, {} removed); effort "
                            "{} -> {} ({}{}, {})",
                            count_text(t.functions, "function", "functions"),
                            count_text(report.files.size(), "file", "files"),
                            group_thousands(t.added), group_thousands(t.changed),
                            group_thousands(t.removed), group_thousands(t.base_effort),
                            group_thousands(t.head_effort), effort.absolute >= 0 ? "+" : "",
                            group_thousands(effort.absolute), format_percent(effort.percent)));
}

// One function's findings under the verdict: its name and place, each finding, the command.
void write_group(Lines& lines, const FunctionFindings& group, const RenderOptions& options) {
    const bool blocks = group.standing == Standing::blocks;
    const char* colour = blocks ? k_blocking : k_warning;
    const std::string word = fmt::format("  {:<5}  ", blocks ? k_block_word : k_warn_word);
    const std::string margin(11, ' ');
    const bool fit = options.fit == Fit::to_width;
    if (group.function.empty() && group.path.empty()) {
        lines.write(word + "the whole change", 11, colour);
    } else {
        const std::string name = terminal_text(group.function);
        const std::string place = location_of(group.path, group.start_line);
        const std::string line = word + name + "  " + place;
        if (!fit || text::display_width(line) <= options.width) {
            lines.write(line, 11, colour);
        } else {
            // Too long for one line: the name (last scopes kept) above its place.
            const std::size_t room = options.width > 20 ? options.width - 11 : 9;
            lines.write(word + shorten_name(name, room + 2, 2), 11, colour);
            lines.write(margin + shorten_location(place, room), 11, colour);
        }
    }
    for (const auto* finding : group.findings) {
        lines.write(margin + terminal_text(finding_detail(*finding)), 13);
    }
    if (blocks && !group.function.empty()) {
        // A command is copied whole: when the name form does not fit, the PATH:LINE form.
        std::string command = explain_command(group.path, group.function);
        if (fit && text::display_width(margin + "why: " + terminal_text(command)) > options.width) {
            command = explain_command(group.path, std::to_string(group.start_line));
        }
        lines.write(margin + "why: " + terminal_text(command), 13);
    }
}

void write_verdict(Lines& lines, const policy::Verdict& verdict, const ReadingOrder& order,
                   const RenderOptions& options) {
    const std::size_t blocking = policy::count_blocking(verdict);
    const std::size_t warnings = verdict.findings.size() - blocking;
    const bool blocked = verdict.outcome == policy::Outcome::blocked;
    std::string line = blocked ? "verdict: BLOCKED by " +
                                     count_text(blocking, "blocking finding", "blocking findings")
                               : std::string("verdict: pass");
    if (warnings > 0) {
        line += (blocked ? ", " : " with ") + count_text(warnings, "warning", "warnings");
    }
    line += " (policy: " + verdict.policy_origin + ")";
    lines.write(terminal_text(line), 2, blocked ? k_blocking : k_passing);
    for (const auto* list : {&order.blocking, &order.warning}) {
        for (const auto& group : *list) {
            write_group(lines, group, options);
        }
    }
    for (const auto& note : verdict.notes) {
        lines.write("  note: " + terminal_text(note), 8);
    }
}

} // namespace

void write_change_text(std::ostream& out, const ChangeReport& report,
                       const policy::Verdict& verdict, const RenderOptions& options) {
    Lines lines(out, options);
    lines.write(
        terminal_text(fmt::format("tollgate: {} -> {}", report.base_label, report.head_label)), 2,
        k_bold);
    if (!verdict.policy_change_summary.empty()) {
        lines.write(terminal_text("policy: " + verdict.policy_change_summary), 2, k_warning);
        for (const auto& change : verdict.policy_changes) {
            lines.write(terminal_text("  " + change), 4, k_warning);
        }
    }
    for (const auto& note : report.notes) {
        lines.write("note: " + terminal_text(note), 6);
    }
    const ReadingOrder order = order_for_reading(report, verdict);
    if (report.functions.empty()) {
        lines.write(report.measured_files == 0
                        ? std::string("no C, C++ or Java file changed: nothing to measure")
                        : count_text(report.measured_files, "source file", "source files") +
                              " changed, but no function definition was touched");
    } else {
        write_table(lines, report, order, options);
    }
    for (const auto& unmeasured : report.unmeasured) {
        lines.write(terminal_text(fmt::format("unmeasured: {}: {}", unmeasured.path,
                                              unmeasured_text(unmeasured))),
                    4);
    }
    for (const auto& s : report.skipped) {
        lines.write(terminal_text(fmt::format("skipped: {} ({})", s.path, s.reason)), 4);
    }
    // Compiler diagnostics are counted here, before the verdict; -v and JSON list them.
    if (!report.warnings.empty()) {
        const auto summary = summarise_diagnostics(report.warnings);
        lines.write(diagnostics_count_text(summary) + "; see --report json or -v");
        const std::string hint = compile_database_hint(report, summary);
        if (!hint.empty()) {
            lines.write("  " + hint, 4);
        }
    }
    write_verdict(lines, verdict, order, options);
}

void write_diagnostics_text(std::ostream& out, const ChangeReport& report) {
    for (const auto& w : report.warnings) {
        out << terminal_text(fmt::format("warning: {} {}{}: {}", w.side, w.path,
                                         w.line > 0 ? ":" + std::to_string(w.line) : std::string(),
                                         w.message))
            << "\n";
    }
}

} // namespace tollgate::report
