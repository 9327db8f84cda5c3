// SPDX-License-Identifier: MIT
// From a lexed function to its counts and measures.
#include "gate/cli/measure_span.hpp"

#include "tollgate/core/counts.hpp"

namespace tollgate {

report::MeasuredFunction measure_span(const lexer::FunctionSpan& span,
                                      const core::MeasureSettings& settings) {
    report::MeasuredFunction measured;
    measured.path = span.path;
    measured.start_line = span.start_line;
    measured.end_line = span.end_line;
    measured.name = span.qualified_name;
    measured.signature = span.signature;
    measured.lexical = span.mode == lexer::ExtentMode::lexical;
    measured.inactive = span.inactive;
    measured.brace_extent = span.brace_extent;
    measured.counts = core::count_tokens(span.tokens);
    measured.measures = core::compute_measures(measured.counts, span.potential_operands, settings);
    return measured;
}

std::vector<report::SourceWarning>
collect_warnings(const std::vector<lexer::FileFunctions>& files) {
    std::vector<report::SourceWarning> warnings;
    for (const auto& file : files) {
        for (const auto& w : file.warnings) {
            warnings.push_back({w.path, w.line, w.message});
        }
    }
    return warnings;
}

} // namespace tollgate
