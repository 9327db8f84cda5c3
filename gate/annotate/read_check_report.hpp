// SPDX-License-Identifier: MIT
// Read a check's JSON report ("tollgate.check/1") back into the report model, so that the
// Markdown renderer can render it again for a comment.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/policy/verdict.hpp"

#include <string>

namespace tollgate::annotate {

// A change report and its verdict, as a check wrote them.
struct CheckedChange {
    delta::ChangeReport report; // the touched functions and totals
    policy::Verdict verdict;    // the findings and the outcome
};

// Parse `text`, the JSON that "tollgate check --report json:PATH" writes; `name` names it in
// messages. Throws UsageError when it is not such a report (wrong schema, missing or mistyped
// field), naming the field.
CheckedChange parse_check_report(const std::string& text, const std::string& name);

// Read and parse the report at `path`. Throws UsageError when it cannot be read or parsed.
CheckedChange read_check_report(const std::string& path);

} // namespace tollgate::annotate
