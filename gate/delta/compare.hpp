// SPDX-License-Identifier: MIT
// Select the functions a change touched, pair base with head, and measure both sides.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/lexer/function_span.hpp"
#include "gate/walker/line_set.hpp"
#include "tollgate/core/measures.hpp"

#include <string>
#include <vector>

namespace tollgate::delta {

// One changed file's two sides, as lexed. Pointers are null for a missing side.
struct FileSides {
    std::string base_path;                       // empty when added
    std::string head_path;                       // empty when deleted
    const lexer::FileFunctions* base = nullptr;  // base side's functions
    const lexer::FileFunctions* head = nullptr;  // head side's functions
    const walker::LineSet* base_lines = nullptr; // deleted lines, base numbering
    const walker::LineSet* head_lines = nullptr; // added lines, head numbering
};

// Return true when `span`'s extent holds a line of `lines` (false when `lines` is null).
bool is_touched(const lexer::FunctionSpan& span, const walker::LineSet* lines);

// Return the touched functions of `files`, paired and labelled: a function is touched when its
// head extent holds an added line or its base extent holds a deleted line. Pairs are made by
// identity within a file (USR, then the fallback key, then name and signature) and then across
// files for what is left (a function moved to another file). Only touched functions are
// measured. The result is sorted with sort_deltas.
std::vector<FunctionDelta> compare_functions(const std::vector<FileSides>& files,
                                             const core::MeasureSettings& settings = {});

} // namespace tollgate::delta
