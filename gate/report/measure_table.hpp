// SPDX-License-Identifier: MIT
// Renderers for `tollgate measure` and `tollgate explain`: text tables and JSON.
#pragma once

#include "gate/report/terminal_layout.hpp"
#include "tollgate/core/counts.hpp"
#include "tollgate/core/measures.hpp"

#include <ostream>
#include <string>
#include <vector>

namespace tollgate::report {

// One measured function, as the reports show it.
struct MeasuredFunction {
    std::string path;            // repository-relative path
    unsigned start_line = 0;     // first line of the definition
    unsigned end_line = 0;       // last line of the definition
    std::string name;            // qualified name
    std::string signature;       // parameter types
    bool lexical = false;        // extent came from the lexical cross-check
    bool parser_stopped = false; // the parser stopped on its file: measured lexically
    bool inactive = false;       // defined in an #if branch the preprocessor skipped
    bool brace_extent = false;   // extent taken from brace matching (the parse disagreed)
    core::Counts counts;         // per-token tables and n1, n2, N1, N2
    core::Measures measures;     // every measure
};

// A warning shown under the table.
struct SourceWarning {
    std::string path;    // repository-relative path; empty for a note about the whole run
    unsigned line = 0;   // 0 when not tied to a line
    std::string message; // lowercase sentence
};

// Which columns the measure table shows.
enum class Columns { essential, all };

// Write the per-function table with a total line to `out`, fitted to `width` columns unless
// `fit` is Fit::wide (see layout_table: locations and names shortened from the left, then
// measure columns dropped from the right of the list, E last of all and never). An empty list
// writes a one-line "no functions" message instead of an empty table.
void write_measure_text(std::ostream& out, const std::vector<MeasuredFunction>& functions,
                        const std::vector<SourceWarning>& warnings, Columns columns,
                        const std::string& source_label, std::size_t width = 100,
                        Fit fit = Fit::to_width);

// Write the functions as JSON (schema "tollgate.measure/1") to `out`.
void write_measure_json(std::ostream& out, const std::vector<MeasuredFunction>& functions,
                        const std::vector<SourceWarning>& warnings, const std::string& source_label,
                        const std::string& convention);

// Write one function's operator and operand tables and its measures as text.
void write_explain_text(std::ostream& out, const MeasuredFunction& function,
                        const std::string& source_label, const std::string& convention,
                        double stroud);

// Write one function's tables and measures as JSON (schema "tollgate.explain/1").
void write_explain_json(std::ostream& out, const MeasuredFunction& function,
                        const std::string& source_label, const std::string& convention);

// Return `value` with `decimals` places and thousands separators ("12,400", "1,234.5"): the one
// way the terminal and Markdown reports write a measure.
std::string format_number(double value, int decimals);

} // namespace tollgate::report
