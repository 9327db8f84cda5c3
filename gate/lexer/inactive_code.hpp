// SPDX-License-Identifier: MIT
// Code the preprocessor skipped: the inactive #if/#ifdef branches of the main file.
#pragma once

#include <clang-c/Index.h>
#include <utility>
#include <vector>

namespace tollgate::lexer {

// A byte range [first, second] of the main file that the preprocessor skipped.
using SkippedRange = std::pair<unsigned, unsigned>;

// Return the ranges of `main_file` that the preprocessor of `unit` skipped (inactive #if, #ifdef,
// #elif and #else branches, directives included), in file order. libclang lists the skipped
// ranges of every file of the unit: only those of `main_file` are kept. A null `main_file`
// yields none.
std::vector<SkippedRange> skipped_ranges(CXTranslationUnit unit, CXFile main_file);

// Return true when the bytes `begin`..`end` lie inside one range of `skipped`.
bool inside_skipped(const std::vector<SkippedRange>& skipped, unsigned begin, unsigned end);

} // namespace tollgate::lexer
