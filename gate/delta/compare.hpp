// SPDX-License-Identifier: MIT
// Select the functions a change touched, pair base with head, and measure both sides.
#pragma once

#include "gate/baseline/snapshot.hpp"
#include "gate/delta/function_delta.hpp"
#include "gate/lexer/function_span.hpp"
#include "gate/walker/line_set.hpp"
#include "tollgate/core/measures.hpp"

#include <string>
#include <vector>

namespace tollgate::delta {

// One function of one side: lexed in this run (tokens, measured only when touched) or taken
// from a baseline snapshot of that commit (measured already). Exactly one pointer is set.
struct SideFunction {
    const lexer::FunctionSpan* span = nullptr;          // lexed now
    const baseline::SnapshotFunction* stored = nullptr; // recorded in a snapshot

    const std::string& usr() const { return span ? span->usr : stored->usr; }
    const std::string& fallback_key() const {
        return span ? span->fallback_key : stored->fallback_key;
    }
    const std::string& qualified_name() const {
        return span ? span->qualified_name : stored->qualified_name;
    }
    const std::string& signature() const { return span ? span->signature : stored->signature; }
    const std::string& path() const { return span ? span->path : stored->path; }
    const std::string& token_hash() const { return span ? span->token_hash : stored->token_hash; }
    unsigned start_line() const { return span ? span->start_line : stored->start_line; }
    unsigned end_line() const { return span ? span->end_line : stored->end_line; }
    lexer::ExtentMode mode() const { return span ? span->mode : stored->mode; }
    bool inactive() const { return span ? span->inactive : stored->inactive; }
    bool brace_extent() const { return span ? span->brace_extent : stored->brace_extent; }
};

// Return the functions of `file` as side functions (empty for null).
std::vector<SideFunction> side_functions(const lexer::FileFunctions* file);

// Return the functions `snapshot` recorded for `path` as side functions (empty when none).
std::vector<SideFunction> side_functions(const baseline::Snapshot& snapshot,
                                         const std::string& path);

// One changed file's two sides. An empty list is a missing side (or a file without functions).
struct FileSides {
    std::string base_path;                       // empty when added
    std::string head_path;                       // empty when deleted
    std::vector<SideFunction> base;              // base side's functions
    std::vector<SideFunction> head;              // head side's functions
    const walker::LineSet* base_lines = nullptr; // deleted lines, base numbering
    const walker::LineSet* head_lines = nullptr; // added lines, head numbering
};

// Return true when `function`'s extent holds a line of `lines` (false when `lines` is null).
bool is_touched(const SideFunction& function, const walker::LineSet* lines);

// Return the touched functions of `files`, paired and labelled: a function is touched when its
// head extent holds an added line or its base extent holds a deleted line. Pairs are made by
// identity within a file (USR, then the fallback key, then name and signature) and then across
// files for what is left (a function moved to another file). Only touched functions are
// measured. The result is sorted with sort_deltas.
std::vector<FunctionDelta> compare_functions(const std::vector<FileSides>& files,
                                             const core::MeasureSettings& settings = {});

} // namespace tollgate::delta
