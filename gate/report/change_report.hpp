// SPDX-License-Identifier: MIT
// Renderers of a change report: terminal table, Markdown for merge requests, and JSON.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/policy/verdict.hpp"
#include "gate/report/terminal_layout.hpp"

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
    std::size_t width = 100;                            // terminal only: columns the output fits in
    Fit fit = Fit::to_width; // terminal only: Fit::wide shows every column and whole names
};

// Write every compiler diagnostic of `report`, one line each ("warning: head src/a.c:3: ..."),
// made safe for a terminal: what `-v` shows on stderr, never on the report's stdout.
void write_diagnostics_text(std::ostream& out, const delta::ChangeReport& report);

// Write the terminal report of `report` to `out`, the verdict last where a terminal shows it:
// a header line, a prominent block when the change edits its policy, notes, the table (status
// "block" or "warn", label, function, location, effort change, effort, volume, difficulty, rules;
// functions with a blocking finding first, then those with warnings, then the rest in report
// order), a total line, skipped files, one line counting the compiler diagnostics (and how to
// give a compile database when files had none), then the verdict with each function's findings
// grouped under it and the command that explains it. Everything fits `options.width` columns
// unless `options.fit` is Fit::wide: long names are shortened from the left keeping their last
// two scopes, columns dropped in the order volume, difficulty, rules, label, effort, and other
// lines wrapped. Colour, when on, follows the verdict: rows with a blocking finding in
// vermillion, with warnings in orange, a pass in sky blue (Okabe and Ito's colour-blind-safe
// palette, nearest 256-colour codes), each with its word ("block", "warn", "BLOCKED", "pass").
// Every text from the repository is made visible first (text::terminal_text); colour is ours.
void write_change_text(std::ostream& out, const delta::ChangeReport& report,
                       const policy::Verdict& verdict, const RenderOptions& options);

// Write the Markdown report of `report`: a level-3 heading with the verdict in words and a
// symbol, one sentence naming base, head, policy and totals, the policy-change warning when the
// change edits its policy, then "Blocks the merge": one entry per function with a blocking
// finding (whatever its growth; its findings listed under it, and the `tollgate explain`
// command), then "Warnings" the same way, policy notes, then "Other touched functions": a table
// of the rest, largest growth first, rows past `options.markdown_rows` folded in <details>;
// then folded: the compiler diagnostics (counted, grouped by missing header) and the notes and
// skipped files. File:line links when a link template is given (see make_link). Text from the
// repository renders as text (escaped, or in code spans; each item cut at 1,000 bytes), never as
// markup, links or HTML. When the whole would pass `options.markdown_bytes`, items are left out
// from the end of the least important list first (other functions' rows, diagnostics, notes and
// skipped files, policy notes, warning entries, policy differences, and blocking entries last)
// and a note at the top says how many of each.
void write_change_markdown(std::ostream& out, const delta::ChangeReport& report,
                           const policy::Verdict& verdict, const RenderOptions& options);

// Write `report` as JSON (schema "tollgate.check/1"), complete; invalid UTF-8 in any text is
// written as U+FFFD (text::dump_json). Beside every warning, "diagnostics" sums them up: counts,
// the warnings grouped by missing header, and how many files had no compile database entry.
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

// Return the marks that say how `f` was measured when it is not the parser's ordinary result,
// joined with ", ": "parser stopped", then the shown side's marks ("inactive" or "lexical",
// "brace extent"), then "base: WORD" for each mark only the base side has; or an empty
// string. Each renderer shows them beside the name in its own brackets.
std::string function_marks(const delta::FunctionDelta& f);

// Return the percent change formatted as "+12%", "-3%", or "new" when there is no base value.
std::string format_percent(const std::optional<double>& percent);

// Return the link for `path` at `line` of `commit` from `link_template`, or empty when the
// template is empty: the template with every byte that cannot stand in a URL or a Markdown link
// percent-encoded (text::url_text), then {commit} and {path} replaced by their percent-encoded
// bytes (RFC 3986 unreserved characters, and "/" in the path, kept) and {line} by the number.
std::string make_link(const std::string& link_template, const std::string& commit,
                      const std::string& path, unsigned line);

} // namespace tollgate::report
