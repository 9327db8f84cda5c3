// SPDX-License-Identifier: MIT
// The pieces of the Markdown report: heading, per-function entries, table rows, folded details.
#include "gate/report/markdown_parts.hpp"

#include "gate/common/text_safety.hpp"
#include "gate/report/marks.hpp"
#include "gate/report/measure_table.hpp"
#include "gate/report/reading_order.hpp"

#include <algorithm>
#include <fmt/format.h>

namespace tollgate::report::markdown {

namespace {

using core::MeasureId;
using delta::ChangeReport;
using delta::FunctionDelta;
using text::MarkdownPlace;

// The most bytes one piece of data (a name, a path, a message) shows in the Markdown report;
// the JSON report keeps it whole.
constexpr std::size_t k_item_bytes = 1000;

// Files named per missing header before "and N more".
constexpr std::size_t k_files_per_header = 5;

// Symbols beside the words: they read the same in any colour vision and without colour.
constexpr const char* k_block_symbol = "\xE2\x9B\x94"; // U+26D4 NO ENTRY
constexpr const char* k_warn_symbol = "\xE2\x9A\xA0";  // U+26A0 WARNING SIGN
constexpr const char* k_pass_symbol = "\xE2\x9C\x93";  // U+2713 CHECK MARK

std::string shortened(const std::string& data) {
    return text::clip(text::to_valid_utf8(data), k_item_bytes);
}

// Data as Markdown text that renders as itself (no markup, links or HTML of its own).
std::string data_text(const std::string& data) {
    return text::markdown_text(shortened(data));
}

// Data as a code span.
std::string data_code(const std::string& data, MarkdownPlace place) {
    return text::markdown_code(shortened(data), place);
}

std::string side_value(const std::optional<delta::FunctionSide>& side, MeasureId id, int decimals) {
    return side ? format_number(core::measure_value(side->measures, id), decimals) : "–";
}

std::string pair_text(const FunctionDelta& f, MeasureId id, int decimals) {
    return side_value(f.base, id, decimals) + " → " + side_value(f.head, id, decimals);
}

std::string growth_text(const FunctionDelta& f) {
    const auto d = f.delta(MeasureId::effort);
    if (f.label == delta::DeltaLabel::unchanged || d.absolute == 0.0) {
        return "0";
    }
    return fmt::format("{}{} ({})", d.absolute > 0 ? "+" : "", group_thousands(d.absolute),
                       format_percent(d.percent));
}

std::string location_text(const std::string& path, unsigned line, const std::string& commit,
                          const RenderOptions& options) {
    const std::string text = data_text(path) + ":" + std::to_string(line);
    if (path.size() > k_item_bytes) {
        return text; // a link to a shortened path would lead elsewhere
    }
    const std::string link =
        make_link(options.link_template, commit.empty() ? "HEAD" : commit, path, line);
    return link.empty() ? text : "[" + text + "](" + link + ")";
}

std::string commit_of(const FunctionDelta* f, const ChangeReport& report) {
    return f == nullptr || f->head ? report.head_commit : report.base_commit;
}

// The function's marks in parentheses after its name, or nothing.
std::string marks_text(const FunctionDelta& f) {
    const std::string marks = function_marks(f);
    return marks.empty() ? std::string() : " (" + marks + ")";
}

// The function's name in a code span (with its signature when that changed), its base identity
// when its name or signature changed, then its marks.
std::string name_text(const FunctionDelta& f, MarkdownPlace place) {
    const std::string base = base_identity(f);
    return data_code(head_identity(f), place) +
           (base.empty() ? std::string() : " (base: " + data_code(base, place) + ")") +
           marks_text(f);
}

constexpr const char* k_table_head =
    "| | function | location | effort change | effort | volume | difficulty |\n"
    "|---|---|---|---:|---:|---:|---:|\n";

std::string table_row(const FunctionDelta& f, const ChangeReport& report,
                      const RenderOptions& options) {
    const auto& side = f.shown_side();
    return fmt::format("| {} | {} | {} | {} | {} | {} | {} |\n", delta::label_name(f.label),
                       name_text(f, MarkdownPlace::table_cell),
                       location_text(side.path, side.start_line, commit_of(&f, report), options),
                       growth_text(f), pair_text(f, MeasureId::effort, 0),
                       pair_text(f, MeasureId::volume, 1), pair_text(f, MeasureId::difficulty, 2));
}

// One function's entry: symbol, name, place and effort; its findings and, when it blocks, the
// command that explains it, as a list under it.
std::string entry(const FunctionFindings& group, const ChangeReport& report,
                  const RenderOptions& options) {
    const bool blocks = group.standing == Standing::blocks;
    std::string out = std::string("- ") + (blocks ? k_block_symbol : k_warn_symbol) + " ";
    if (group.function.empty() && group.path.empty()) {
        out += "the whole change\n";
    } else {
        out += (group.delta != nullptr ? name_text(*group.delta, MarkdownPlace::inline_text)
                                       : data_code(group.function, MarkdownPlace::inline_text)) +
               " at " +
               location_text(group.path, group.start_line, commit_of(group.delta, report), options);
        if (group.delta != nullptr) {
            const auto d = group.delta->delta(MeasureId::effort);
            out += " — effort " + pair_text(*group.delta, MeasureId::effort, 0);
            if (group.delta->base && group.delta->head) {
                out += fmt::format(" ({}{}, {})", d.absolute >= 0 ? "+" : "",
                                   group_thousands(d.absolute), format_percent(d.percent));
            }
        }
        out += "\n";
    }
    for (const auto* finding : group.findings) {
        out += "  - " + data_text(finding_detail(*finding)) + "\n";
    }
    if (blocks && !group.function.empty()) {
        out += "  - why: " +
               data_code(explain_command(group.path, group.function), MarkdownPlace::inline_text) +
               "\n";
    }
    return out;
}

std::string heading(const ChangeReport& report, const policy::Verdict& verdict,
                    const ReadingOrder& order) {
    const std::size_t blocking = policy::count_blocking(verdict);
    const std::size_t warnings = verdict.findings.size() - blocking;
    std::vector<std::string> counts;
    std::string out;
    if (verdict.outcome == policy::Outcome::blocked) {
        out = fmt::format("### {} Tollgate blocks this change", k_block_symbol);
        std::size_t functions = 0;
        bool whole = false;
        for (const auto& group : order.blocking) {
            if (group.function.empty() && group.path.empty()) {
                whole = true;
            } else {
                ++functions;
            }
        }
        if (functions > 0) {
            counts.push_back(count_text(functions, "function", "functions") +
                             " over a blocking limit");
        }
        if (whole) {
            counts.emplace_back("the whole change over its budget");
        }
    } else {
        out = fmt::format("### {} Tollgate passes this change", k_pass_symbol);
    }
    if (warnings > 0) {
        counts.push_back(count_text(warnings, "warning", "warnings"));
    }
    for (std::size_t i = 0; i < counts.size(); ++i) {
        out += (i == 0 ? ": " : ", ") + counts[i];
    }
    out += "\n\n" + data_code(report.base_label, MarkdownPlace::inline_text) + " → " +
           data_code(report.head_label, MarkdownPlace::inline_text) + " · ";
    if (report.functions.empty()) {
        out += report.measured_files == 0
                   ? std::string("no C, C++ or Java file changed, nothing to measure")
                   : std::string("source files changed, but no function definition was touched");
    } else {
        const auto& t = report.totals;
        const auto effort = core::compute_delta(t.base_effort, t.head_effort);
        out += fmt::format("{} touched in {} · effort {} → {} ({}{}, {})",
                           count_text(t.functions, "function", "functions"),
                           count_text(report.files.size(), "file", "files"),
                           group_thousands(t.base_effort), group_thousands(t.head_effort),
                           effort.absolute >= 0 ? "+" : "", group_thousands(effort.absolute),
                           format_percent(effort.percent));
    }
    if (report.unmeasured_lines > 0) {
        out += " · " +
               count_text(report.unmeasured_lines, "changed C/C++ line", "changed C/C++ lines") +
               " outside functions";
    }
    out += " · policy " + data_text(verdict.policy_origin) + " · convention " +
           data_text(report.convention) + "\n\n";
    return out;
}

std::string place_of(const delta::ChangeWarning& w) {
    return w.path + (w.line > 0 ? ":" + std::to_string(w.line) : std::string());
}

void add_diagnostics(Parts& parts, const ChangeReport& report) {
    if (report.warnings.empty()) {
        return;
    }
    const auto summary = summarise_diagnostics(report.warnings);
    parts.diagnostics_head =
        "<details><summary>" + text::html_text(diagnostics_count_text(summary)) + "</summary>\n\n";
    const std::string hint = compile_database_hint(report, summary);
    if (!hint.empty()) {
        parts.diagnostics_head += data_text(hint) + "\n\n";
    }
    auto& items = parts.lists[static_cast<std::size_t>(List::diagnostics)];
    for (const auto& group : summary.missing_headers) {
        std::string files;
        for (std::size_t i = 0; i < group.files.size() && i < k_files_per_header; ++i) {
            files += (i == 0 ? "" : ", ") + data_code(group.files[i], MarkdownPlace::inline_text);
        }
        if (group.files.size() > k_files_per_header) {
            files += " and " +
                     group_thousands(static_cast<double>(group.files.size() - k_files_per_header)) +
                     " more";
        }
        items.push_back("- " + data_code(group.header, MarkdownPlace::inline_text) +
                        " not found: " + count_text(group.warnings, "warning", "warnings") +
                        ", in " + files + "\n");
    }
    for (const auto* w : summary.rest) {
        items.push_back("- " + data_code(place_of(*w), MarkdownPlace::inline_text) + " (" +
                        data_text(w->side) + "): " + data_text(w->message) + "\n");
    }
}

} // namespace

Parts make_parts(const ChangeReport& report, const policy::Verdict& verdict,
                 const RenderOptions& options) {
    Parts parts;
    const ReadingOrder order = order_for_reading(report, verdict);
    parts.heading = heading(report, verdict, order);
    parts.table_head = k_table_head;
    const auto list = [&parts](List which) -> std::vector<std::string>& {
        return parts.lists[static_cast<std::size_t>(which)];
    };
    if (!verdict.policy_change_summary.empty()) {
        parts.policy_head = "> [!WARNING]\n> " + data_text(verdict.policy_change_summary) + ":\n";
        for (const auto& change : verdict.policy_changes) {
            list(List::policy_lines).push_back("> - " + data_text(change) + "\n");
        }
    }
    for (const auto& group : order.blocking) {
        list(List::blocking).push_back(entry(group, report, options));
    }
    for (const auto& group : order.warning) {
        list(List::warning).push_back(entry(group, report, options));
    }
    for (const auto& note : verdict.notes) {
        list(List::policy_notes).push_back("Policy note: " + data_text(note) + "\n\n");
    }
    for (const auto* f : order.others) {
        list(List::other_rows).push_back(table_row(*f, report, options));
    }
    parts.shown_rows = std::min(options.markdown_rows, order.others.size());
    add_diagnostics(parts, report);
    for (const auto& note : report.notes) {
        list(List::notes).push_back("- note: " + data_text(note) + "\n");
    }
    for (const auto& lines : report.unmeasured) {
        list(List::notes)
            .push_back("- unmeasured " + data_code(lines.path, MarkdownPlace::inline_text) + ": " +
                       data_text(unmeasured_text(lines)) + "\n");
    }
    for (const auto& s : report.skipped) {
        list(List::notes)
            .push_back("- skipped " + data_code(s.path, MarkdownPlace::inline_text) + " (" +
                       data_text(s.reason) + ")\n");
    }
    return parts;
}

} // namespace tollgate::report::markdown
