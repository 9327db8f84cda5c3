// SPDX-License-Identifier: MIT
// The Markdown report a reviewer reads in the merge request, kept under a size limit.
#include "gate/report/change_report.hpp"
#include "gate/report/markdown_parts.hpp"
#include "gate/report/reading_order.hpp"

#include <algorithm>
#include <fmt/format.h>
#include <iterator>

namespace tollgate::report {

namespace markdown {

namespace {

using Kept = std::size_t[k_lists];

const std::vector<std::string>& items(const Parts& parts, List which) {
    return parts.lists[static_cast<std::size_t>(which)];
}

std::size_t kept_of(const Kept& kept, List which) {
    return kept[static_cast<std::size_t>(which)];
}

std::string cut_note(const Parts& parts, const Kept& kept, std::size_t limit) {
    struct Named {
        List list;
        const char* one;
        const char* many;
    };
    static const Named k_names[] = {
        {List::other_rows, "row of other functions", "rows of other functions"},
        {List::diagnostics, "parse warning line", "parse warning lines"},
        {List::notes, "note or skipped file", "notes and skipped files"},
        {List::policy_notes, "policy note", "policy notes"},
        {List::warning, "function with warnings", "functions with warnings"},
        {List::policy_lines, "policy difference", "policy differences"},
        {List::blocking, "blocked function", "blocked functions"},
    };
    std::vector<std::string> cuts;
    for (const auto& name : k_names) {
        const std::size_t all = items(parts, name.list).size();
        const std::size_t left_out = all - kept_of(kept, name.list);
        if (left_out > 0) {
            cuts.push_back(group_thousands(static_cast<double>(left_out)) + " of " +
                           count_text(all, name.one, name.many));
        }
    }
    if (cuts.empty()) {
        return {};
    }
    std::string list;
    for (std::size_t i = 0; i < cuts.size(); ++i) {
        list += (i == 0 ? "" : i + 1 == cuts.size() ? " and " : ", ") + cuts[i];
    }
    return fmt::format("> [!NOTE]\n> This report is cut to stay under {} bytes: it leaves out {} "
                       "(the least important and the last listed go first). The JSON report "
                       "(`--report json:PATH`) has everything.\n\n",
                       group_thousands(static_cast<double>(limit)), list);
}

void append(std::string& out, const Parts& parts, const Kept& kept, List which, std::size_t from,
            std::size_t to) {
    const auto& list = items(parts, which);
    for (std::size_t i = from; i < std::min(to, kept_of(kept, which)); ++i) {
        out += list[i];
    }
}

} // namespace

std::string assemble(const Parts& parts, const Kept& kept, std::size_t limit) {
    std::string out = parts.heading + cut_note(parts, kept, limit);
    const auto all = static_cast<std::size_t>(-1);
    if (!parts.policy_head.empty()) {
        out += parts.policy_head;
        append(out, parts, kept, List::policy_lines, 0, all);
        out += "\n";
    }
    if (kept_of(kept, List::blocking) > 0) {
        out += parts.advisory ? "#### Would block the merge (advisory run: it passes)\n\n"
                              : "#### Blocks the merge\n\n";
        append(out, parts, kept, List::blocking, 0, all);
        out += "\n";
    }
    if (kept_of(kept, List::warning) > 0) {
        out += "#### Warnings (they do not block)\n\n";
        append(out, parts, kept, List::warning, 0, all);
        out += "\n";
    }
    append(out, parts, kept, List::policy_notes, 0, all);
    const std::size_t rows = kept_of(kept, List::other_rows);
    const std::size_t shown = std::min(parts.shown_rows, rows);
    if (rows > 0) {
        out += "#### Other touched functions\n\n";
    }
    if (shown > 0) {
        out += parts.table_head;
        append(out, parts, kept, List::other_rows, 0, shown);
        out += "\n";
    }
    if (rows > shown) {
        out += fmt::format("<details><summary>{} more function{}</summary>\n\n",
                           group_thousands(static_cast<double>(rows - shown)),
                           rows - shown == 1 ? "" : "s");
        out += parts.table_head;
        append(out, parts, kept, List::other_rows, shown, all);
        out += "\n</details>\n\n";
    }
    // Details a reviewer opens when needed: diagnostics (counted even when cut), then notes.
    if (!parts.diagnostics_head.empty()) {
        out += parts.diagnostics_head;
        append(out, parts, kept, List::diagnostics, 0, all);
        out += "\n</details>\n\n";
    }
    if (kept_of(kept, List::notes) > 0) {
        out += fmt::format("<details><summary>{}</summary>\n\n",
                           count_text(items(parts, List::notes).size(), "note or skipped file",
                                      "notes and skipped files"));
        append(out, parts, kept, List::notes, 0, all);
        out += "\n</details>\n\n";
    }
    while (out.size() >= 2 && out[out.size() - 1] == '\n' && out[out.size() - 2] == '\n') {
        out.pop_back();
    }
    return out;
}

namespace {

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
// important list first (List's order: blocking entries last). The heading, the policy
// warning's first lines and the diagnostics' count always stay.
std::string fit(const Parts& parts, std::size_t limit) {
    Kept kept{};
    for (std::size_t i = 0; i < k_lists; ++i) {
        kept[i] = parts.lists[i].size();
    }
    std::string document = assemble(parts, kept, limit);
    for (std::size_t list = 0; list < k_lists && document.size() > limit; ++list) {
        kept[list] = most_that_fit(kept[list], limit, [&](std::size_t count) {
            Kept trial;
            std::copy(std::begin(kept), std::end(kept), std::begin(trial));
            trial[list] = count;
            return assemble(parts, trial, limit).size();
        });
        document = assemble(parts, kept, limit);
        // The note's counts change its length a little: step back until it fits.
        while (document.size() > limit && kept[list] > 0) {
            --kept[list];
            document = assemble(parts, kept, limit);
        }
    }
    return document;
}

} // namespace

} // namespace markdown

void write_change_markdown(std::ostream& out, const delta::ChangeReport& report,
                           const policy::Verdict& verdict, const RenderOptions& options) {
    out << markdown::fit(markdown::make_parts(report, verdict, options), options.markdown_bytes);
}

} // namespace tollgate::report
