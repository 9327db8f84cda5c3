// SPDX-License-Identifier: MIT
// Renderers of a change report: terminal table, Markdown for merge requests, and JSON.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/policy/verdict.hpp"

#include <ostream>
#include <string>

namespace tollgate::report {

// Whether the terminal renderer uses ANSI colour.
enum class Colour { off, on };

// Options the renderers share.
struct RenderOptions {
    Colour colour = Colour::off;    // terminal only
    std::size_t markdown_rows = 10; // rows shown before the rest is folded in <details>
    std::string link_template;      // e.g. "https://git.example/repo/blob/{commit}/{path}#L{line}";
                                    // empty: plain file:line text
};

// Write the terminal table of `report` to `out`: a header line, a prominent block when the change
// edits its policy, notes, one row per touched function (label, location, function, V, D and E as
// base -> head with percent change, rules broken), a total line, the verdict with every finding,
// skipped files and warnings. A change with no touched function writes one line for the table.
void write_change_text(std::ostream& out, const delta::ChangeReport& report,
                       const policy::Verdict& verdict, const RenderOptions& options);

// Write the Markdown delta table of `report`: a one-line summary with the verdict first, the
// findings, then the table with the largest growth first,
// rows past `options.markdown_rows` folded in <details>, file:line links when a link template is
// given. Renders as a table in GitHub-flavoured Markdown.
void write_change_markdown(std::ostream& out, const delta::ChangeReport& report,
                           const policy::Verdict& verdict, const RenderOptions& options);

// Write `report` as JSON (schema "tollgate.check/1").
void write_change_json(std::ostream& out, const delta::ChangeReport& report,
                       const policy::Verdict& verdict);

// Return the rule ids of `verdict`'s findings on function `f` (blocking ones first), joined by
// ", "; empty when the function broke no rule.
std::string rules_broken_by(const policy::Verdict& verdict, const delta::FunctionDelta& f);

// Return `value` rounded to an integer with thousands separators, e.g. "12,400" or "-3,002".
std::string group_thousands(double value);

// Return the percent change formatted as "+12%", "-3%", or "new" when there is no base value.
std::string format_percent(const std::optional<double>& percent);

// Return the link for `path` at `line` of `commit` from `link_template` ({commit}, {path},
// {line} replaced), or empty when the template is empty.
std::string make_link(const std::string& link_template, const std::string& commit,
                      const std::string& path, unsigned line);

} // namespace tollgate::report
