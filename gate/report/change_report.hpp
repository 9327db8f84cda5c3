// SPDX-License-Identifier: MIT
// Renderers of a change report: terminal table, Markdown for merge requests, and JSON.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/policy/verdict.hpp"

#include <map>
#include <ostream>
#include <string>
#include <tuple>
#include <utility>

namespace tollgate::report {

// Whether the terminal renderer uses ANSI colour.
enum class Colour { off, on };

// The most bytes a Markdown report takes: under GitHub's 1 MiB (1,048,576 bytes) for a job
// summary and within GitLab's 1,000,000 characters for a note (both from memory).
inline constexpr std::size_t k_markdown_byte_limit = 1'000'000;

// Options the renderers share.
struct RenderOptions {
    Colour colour = Colour::off;    // terminal only
    std::size_t markdown_rows = 10; // rows shown before the rest is folded in <details>
    std::string link_template;      // e.g. "https://git.example/repo/blob/{commit}/{path}#L{line}";
                                    // empty: plain file:line text
    std::size_t markdown_bytes = k_markdown_byte_limit; // size limit of the Markdown report
};

// Write the terminal table of `report` to `out`: a header line, a prominent block when the change
// edits its policy, notes, one row per touched function (label, location, function, V, D and E as
// base -> head with percent change, rules broken), a total line, the verdict with every finding,
// skipped files and warnings. A change with no touched function writes one line for the table.
// Every text from the repository is made visible first (text::terminal_text: no control
// character or escape sequence of its own reaches the terminal); colour, when on, is ours.
void write_change_text(std::ostream& out, const delta::ChangeReport& report,
                       const policy::Verdict& verdict, const RenderOptions& options);

// Write the Markdown delta table of `report`: a one-line summary with the verdict first, the
// findings, then the table with the largest growth first, rows past `options.markdown_rows`
// folded in <details>, file:line links when a link template is given (see make_link). Renders
// as a table in GitHub-flavoured Markdown. Text from the repository renders as text (escaped,
// or in code spans; each item cut at 1,000 bytes), never as markup, links or HTML. When the
// whole would pass `options.markdown_bytes`, items are left out from the end of the least
// important list first (function rows, then notes and warnings, then findings, then policy
// differences) and a note at the top says how many of each.
void write_change_markdown(std::ostream& out, const delta::ChangeReport& report,
                           const policy::Verdict& verdict, const RenderOptions& options);

// Write `report` as JSON (schema "tollgate.check/1"), complete; invalid UTF-8 in any text is
// written as U+FFFD (text::dump_json).
void write_change_json(std::ostream& out, const delta::ChangeReport& report,
                       const policy::Verdict& verdict);

// Return the rule ids of `verdict`'s findings on function `f` (blocking ones first), joined by
// ", "; empty when the function broke no rule.
std::string rules_broken_by(const policy::Verdict& verdict, const delta::FunctionDelta& f);

// The rule ids each function broke (as rules_broken_by gives them), indexed once per verdict so
// that a table of many functions is rendered in linear time.
class RulesIndex {
public:
    // Index the findings of `verdict`.
    explicit RulesIndex(const policy::Verdict& verdict);
    // Return the rule ids `f` broke, blocking ones first, joined by ", "; empty when none.
    std::string of(const delta::FunctionDelta& f) const;

private:
    using Key = std::tuple<std::string, std::string, unsigned>; // function, path, start line
    std::map<Key, std::pair<std::string, std::string>> m_rules; // blocking, warning ids
};

// Return `value` rounded to an integer with thousands separators, e.g. "12,400" or "-3,002".
std::string group_thousands(double value);

// Return the percent change formatted as "+12%", "-3%", or "new" when there is no base value.
std::string format_percent(const std::optional<double>& percent);

// Return the link for `path` at `line` of `commit` from `link_template`, or empty when the
// template is empty: the template with every byte that cannot stand in a URL or a Markdown link
// percent-encoded (text::url_text), then {commit} and {path} replaced by their percent-encoded
// bytes (RFC 3986 unreserved characters, and "/" in the path, kept) and {line} by the number.
std::string make_link(const std::string& link_template, const std::string& commit,
                      const std::string& path, unsigned line);

} // namespace tollgate::report
