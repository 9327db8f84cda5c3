// SPDX-License-Identifier: MIT
// The Markdown delta table a reviewer reads in the merge request, kept under a size limit.
#include "gate/common/text_safety.hpp"
#include "gate/report/change_report.hpp"
#include "gate/report/measure_table.hpp"

#include <fmt/format.h>

namespace tollgate::report {

namespace {

using core::MeasureId;
using delta::ChangeReport;
using delta::FunctionDelta;
using text::MarkdownPlace;

// The most bytes one piece of data (a name, a path, a message) shows in the Markdown report;
// the JSON report keeps it whole.
constexpr std::size_t k_item_bytes = 1000;

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

std::string plural(std::size_t count, const char* one, const char* many) {
    return fmt::format("{} {}", group_thousands(static_cast<double>(count)),
                       count == 1 ? one : many);
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
    const std::string text = data_text(side.path) + ":" + std::to_string(side.start_line);
    if (side.path.size() > k_item_bytes) {
        return text; // a link to a shortened path would lead elsewhere
    }
    const std::string commit = f.head ? report.head_commit : report.base_commit;
    const std::string link = make_link(options.link_template, commit.empty() ? "HEAD" : commit,
                                       side.path, side.start_line);
    return link.empty() ? text : "[" + text + "](" + link + ")";
}

constexpr const char* k_table_head =
    "| | function | location | volume | difficulty | effort | effort change | rules |\n"
    "|---|---|---|---:|---:|---:|---:|---|\n";

std::string table_row(const FunctionDelta& f, const ChangeReport& report, const RulesIndex& rules,
                      const RenderOptions& options) {
    return fmt::format("| {} | {} | {} | {} | {} | {} | {} | {} |\n", delta::label_name(f.label),
                       data_code(f.name, MarkdownPlace::table_cell) +
                           (f.parser_stopped() ? " (parser stopped)" : ""),
                       location_cell(f, report, options), pair_cell(f, MeasureId::volume, 1),
                       pair_cell(f, MeasureId::difficulty, 2), pair_cell(f, MeasureId::effort, 0),
                       growth_cell(f), data_text(rules.of(f)));
}

// The report in pieces, every list in order of importance, so that the least important items
// can be left out from the end when the whole would be too large.
struct Parts {
    std::string summary;                   // the first paragraph
    std::string policy_head;               // the policy-change warning's first lines, or empty
    std::vector<std::string> policy_lines; // one line per policy difference
    std::vector<std::string> findings;     // one list item per finding
    std::vector<std::string> rows;         // one table row per function, largest growth first
    std::size_t shown_rows = 0;            // rows before the rest is folded
    std::string footer;                    // the line under the table
    std::vector<std::string> bullets;      // notes, skipped files, warnings
};

// How many items of each list go into the document.
struct Kept {
    std::size_t policy_lines = 0;
    std::size_t findings = 0;
    std::size_t rows = 0;
    std::size_t bullets = 0;
};

std::string cut_note(const Parts& parts, const Kept& kept, std::size_t limit) {
    std::vector<std::string> cuts;
    const auto count_cut = [&cuts](std::size_t kept_count, std::size_t all, const char* one,
                                   const char* many) {
        if (kept_count < all) {
            cuts.push_back(fmt::format("{} of {}",
                                       group_thousands(static_cast<double>(all - kept_count)),
                                       plural(all, one, many)));
        }
    };
    count_cut(kept.rows, parts.rows.size(), "function row", "function rows");
    count_cut(kept.bullets, parts.bullets.size(), "note or warning", "notes and warnings");
    count_cut(kept.findings, parts.findings.size(), "finding", "findings");
    count_cut(kept.policy_lines, parts.policy_lines.size(), "policy difference",
              "policy differences");
    if (cuts.empty()) {
        return {};
    }
    std::string list;
    for (std::size_t i = 0; i < cuts.size(); ++i) {
        list += (i == 0 ? "" : i + 1 == cuts.size() ? " and " : ", ") + cuts[i];
    }
    return fmt::format("> [!NOTE]\n> This report is cut to stay under {} bytes: it leaves out {} "
                       "(the least growth and the last listed go first). The JSON report "
                       "(`--report json:PATH`) has everything.\n\n",
                       group_thousands(static_cast<double>(limit)), list);
}

std::string assemble(const Parts& parts, const Kept& kept, std::size_t limit) {
    std::string out = parts.summary + "\n\n" + cut_note(parts, kept, limit);
    if (!parts.policy_head.empty()) {
        out += parts.policy_head;
        for (std::size_t i = 0; i < kept.policy_lines; ++i) {
            out += parts.policy_lines[i];
        }
        out += "\n";
    }
    for (std::size_t i = 0; i < kept.findings; ++i) {
        out += parts.findings[i];
    }
    if (kept.findings > 0) {
        out += "\n";
    }
    const std::size_t shown = std::min(parts.shown_rows, kept.rows);
    if (shown > 0) {
        out += k_table_head;
        for (std::size_t i = 0; i < shown; ++i) {
            out += parts.rows[i];
        }
    }
    if (kept.rows > shown) {
        const std::size_t rest = kept.rows - shown;
        out += fmt::format("\n<details><summary>{} more function{}</summary>\n\n", rest,
                           rest == 1 ? "" : "s");
        out += k_table_head;
        for (std::size_t i = shown; i < kept.rows; ++i) {
            out += parts.rows[i];
        }
        out += "\n</details>\n";
    }
    out += parts.footer;
    if (kept.bullets > 0) {
        out += "\n";
        for (std::size_t i = 0; i < kept.bullets; ++i) {
            out += parts.bullets[i];
        }
    }
    return out;
}

// Return the largest count in [0, `all`] for which `size_with(count)` stays within `limit`
// (the size grows with the count), or 0 when none does.
template <typename SizeWith>
std::size_t most_that_fit(std::size_t all, std::size_t limit, SizeWith size_with) {
    std::size_t low = 0, high = all;
    while (low < high) {
        const std::size_t middle = low + (high - low + 1) / 2;
        if (size_with(middle) <= limit) {
            low = middle;
        } else {
            high = middle - 1;
        }
    }
    return low;
}

// Assemble the document within `limit` bytes, leaving out items from the end of the least
// important list first: function rows, then notes and warnings, then findings, then policy
// differences. The fixed parts (summary, footer, note) always stay.
std::string fit(const Parts& parts, std::size_t limit) {
    Kept kept{parts.policy_lines.size(), parts.findings.size(), parts.rows.size(),
              parts.bullets.size()};
    std::string document = assemble(parts, kept, limit);
    for (std::size_t Kept::*list :
         {&Kept::rows, &Kept::bullets, &Kept::findings, &Kept::policy_lines}) {
        if (document.size() <= limit) {
            break;
        }
        kept.*list = most_that_fit(kept.*list, limit, [&](std::size_t count) {
            Kept trial = kept;
            trial.*list = count;
            return assemble(parts, trial, limit).size();
        });
        document = assemble(parts, kept, limit);
        // The note's counts change its length a little: step back until it fits.
        while (document.size() > limit && kept.*list > 0) {
            --(kept.*list);
            document = assemble(parts, kept, limit);
        }
    }
    return document;
}

} // namespace

void write_change_markdown(std::ostream& out, const ChangeReport& report,
                           const policy::Verdict& verdict, const RenderOptions& options) {
    Parts parts;
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
                       ? ": no C, C++ or Java file changed, nothing to measure."
                       : ": source files changed, but no function definition was touched.";
    } else {
        const auto effort = core::compute_delta(t.base_effort, t.head_effort);
        summary += fmt::format(": {} function{} touched in {} file{}, effort {}{} ({})",
                               t.functions, t.functions == 1 ? "" : "s", report.files.size(),
                               report.files.size() == 1 ? "" : "s", effort.absolute >= 0 ? "+" : "",
                               group_thousands(effort.absolute), format_percent(effort.percent));
        const FunctionDelta& top = report.functions.front();
        const auto top_growth = top.delta(MeasureId::effort);
        if (top_growth.absolute > 0) {
            summary += fmt::format(", largest growth {} +{}",
                                   data_code(top.name, MarkdownPlace::inline_text),
                                   group_thousands(top_growth.absolute));
        }
        summary += ".";
    }
    parts.summary = summary;
    if (!verdict.policy_change_summary.empty()) {
        parts.policy_head = "> [!WARNING]\n> " + data_text(verdict.policy_change_summary) + ":\n";
        for (const auto& change : verdict.policy_changes) {
            parts.policy_lines.push_back("> - " + data_text(change) + "\n");
        }
    }
    for (const auto& f : verdict.findings) {
        parts.findings.push_back(std::string("- ") + (f.blocks() ? "**blocking**" : "warning") +
                                 ": " + data_text(f.message) + "\n");
    }
    const RulesIndex rules(verdict);
    for (const auto& f : report.functions) {
        parts.rows.push_back(table_row(f, report, rules, options));
    }
    parts.shown_rows = std::min(options.markdown_rows, report.functions.size());
    parts.footer = fmt::format("\n<sub>base {} → head {} · convention {} · policy {}</sub>\n",
                               data_text(report.base_label), data_text(report.head_label),
                               data_text(report.convention), data_text(verdict.policy_origin));
    for (const auto& note : verdict.notes) {
        parts.bullets.push_back("- policy note: " + data_text(note) + "\n");
    }
    for (const auto& note : report.notes) {
        parts.bullets.push_back("- note: " + data_text(note) + "\n");
    }
    for (const auto& s : report.skipped) {
        parts.bullets.push_back("- skipped " + data_code(s.path, MarkdownPlace::inline_text) +
                                " (" + data_text(s.reason) + ")\n");
    }
    for (const auto& w : report.warnings) {
        const std::string place =
            w.path + (w.line > 0 ? ":" + std::to_string(w.line) : std::string());
        parts.bullets.push_back("- warning (" + data_text(w.side) + ") " +
                                data_code(place, MarkdownPlace::inline_text) + ": " +
                                data_text(w.message) + "\n");
    }
    out << fit(parts, options.markdown_bytes);
}

} // namespace tollgate::report
