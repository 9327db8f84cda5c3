// SPDX-License-Identifier: MIT
// The marks a report puts beside a function whose measures deserve a second look, the base
// identity of a function whose name or signature changed, and the changed lines no function
// holds.
#pragma once

#include "gate/delta/function_delta.hpp"

#include <string>
#include <vector>

namespace tollgate::report {

// How a function was found, as the marks show it.
struct FunctionMarks {
    bool lexical = false;      // the extent came from the lexical cross-check
    bool inactive = false;     // defined in an #if branch the preprocessor skipped (lexical too)
    bool brace_extent = false; // libclang's extent disagreed with brace matching; braces' taken
};

// Return the marks' words in a fixed order: "inactive" (else "lexical"), then "brace-extent";
// empty when none applies. The JSON reports list them under "marks".
std::vector<std::string> mark_words(const FunctionMarks& marks);

// Return the marks as text after a name, each in brackets with a leading space:
// " [inactive]", " [lexical]", " [brace extent]"; empty when none applies.
std::string mark_suffix(const FunctionMarks& marks);

// Return the marks of one side of a touched function.
FunctionMarks marks_of(const delta::FunctionSide& side);

// Return `f`'s name, with "(signature)" after it when the signature changed.
std::string head_identity(const delta::FunctionDelta& f);

// Return the base side's "NAME(SIGNATURE)" when `f`'s name or signature changed, else empty.
std::string base_identity(const delta::FunctionDelta& f);

// Return the base side's marks that the head side lacks, as JSON words (empty when none or when
// a side is missing).
std::vector<std::string> base_only_marks(const delta::FunctionDelta& f);

// Return "N changed line(s) outside functions (head lines 4-6, 12; base line 3)" for `lines`.
std::string unmeasured_text(const delta::UnmeasuredLines& lines);

} // namespace tollgate::report
