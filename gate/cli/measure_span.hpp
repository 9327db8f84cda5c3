// SPDX-License-Identifier: MIT
// From a lexed function to its counts and measures (the core stage, applied).
#pragma once

#include "gate/lexer/function_span.hpp"
#include "gate/report/measure_table.hpp"
#include "tollgate/core/measures.hpp"

#include <vector>

namespace tollgate {

// Count and measure `span` with `settings`.
report::MeasuredFunction measure_span(const lexer::FunctionSpan& span,
                                      const core::MeasureSettings& settings);

// Turn the lexer's warnings of `files` into report warnings, in file order, summarised per
// missing header (see lexer::summarise_missing_headers); when a header was missing, a last
// warning without a path says how to supply include folders.
std::vector<report::SourceWarning> collect_warnings(const std::vector<lexer::FileFunctions>& files);

} // namespace tollgate
