// SPDX-License-Identifier: MIT
// Where reports go: `--report FORMAT:PATH` targets and the terminal default.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/policy/policy.hpp"
#include "gate/policy/verdict.hpp"
#include "gate/report/change_report.hpp"

#include <string>
#include <vector>

namespace tollgate {

// A report format.
enum class ReportFormat { text, markdown, json, sarif };

// One `--report FORMAT:PATH`.
struct ReportTarget {
    ReportFormat format = ReportFormat::text; // what to write
    std::string path;                         // file path, or "-" for stdout
};

// Parse `specs` ("markdown:delta.md", "json:-", "sarif:findings.sarif"). Throws UsageError naming
// the bad spec, with "did you mean" for a misspelled format.
std::vector<ReportTarget> parse_report_targets(const std::vector<std::string>& specs);

// Check before any work that every file target can be written (see check_writable). Throws
// Failure `cannot write report "PATH": REASON` for the first that cannot.
void check_report_targets(const std::vector<ReportTarget>& targets);

// Return the columns the terminal report on stdout fits in: the COLUMNS environment variable
// when it is a whole number from 20 to 10,000, else the terminal's width (TIOCGWINSZ on stdout)
// when stdout is a terminal, else 100.
std::size_t terminal_width();

// Write `report` to every target; with no target on stdout, the terminal table goes to stdout.
// Files are written whole by write_output_file (a temporary name renamed into place); a failure
// throws its Failure. Colour is used on stdout when it is a terminal, NO_COLOR is unset and
// `no_colour` is false. Text on stdout fits terminal_width(), text in a file 100 columns (unless
// `options.fit` is Fit::wide).
void write_reports(const delta::ChangeReport& report, const policy::Verdict& verdict,
                   const policy::Policy& policy, const std::vector<ReportTarget>& targets,
                   report::RenderOptions options, bool no_colour);

} // namespace tollgate
