// SPDX-License-Identifier: MIT
// From a lexed function to its counts and measures.
#include "gate/cli/measure_span.hpp"

#include "gate/lexer/missing_headers.hpp"
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
    std::vector<lexer::LexWarning> all;
    for (const auto& file : files) {
        all.insert(all.end(), file.warnings.begin(), file.warnings.end());
    }
    const lexer::WarningSummary summary = lexer::summarise_missing_headers(all);
    std::vector<report::SourceWarning> warnings;
    for (const auto& w : summary.warnings) {
        warnings.push_back({w.path, w.line, w.message});
    }
    if (summary.headers_missing) {
        warnings.push_back({"", 0, lexer::include_folder_hint()}); // said once, as a note
    }
    return warnings;
}

} // namespace tollgate
