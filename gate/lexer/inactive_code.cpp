// SPDX-License-Identifier: MIT
// Code the preprocessor skipped: the inactive #if/#ifdef branches of the main file.
#include "gate/lexer/inactive_code.hpp"

#include "gate/lexer/clang_handles.hpp"

#include <algorithm>

namespace tollgate::lexer {

std::vector<SkippedRange> skipped_ranges(CXTranslationUnit unit, CXFile main_file) {
    std::vector<SkippedRange> ranges;
    if (main_file == nullptr) {
        return ranges;
    }
    SourceRangeListHandle all(clang_getAllSkippedRanges(unit));
    for (unsigned i = 0; all && i < all->count; ++i) {
        CXFile file = nullptr;
        unsigned from = 0;
        unsigned to = 0;
        clang_getSpellingLocation(clang_getRangeStart(all->ranges[i]), &file, nullptr, nullptr,
                                  &from);
        // Header ranges come back too; in-memory files all compare equal under
        // clang_File_isEqual, so the handles themselves are compared.
        if (file != main_file) {
            continue;
        }
        clang_getSpellingLocation(clang_getRangeEnd(all->ranges[i]), nullptr, nullptr, nullptr,
                                  &to);
        ranges.emplace_back(from, to);
    }
    std::sort(ranges.begin(), ranges.end());
    return ranges;
}

bool inside_skipped(const std::vector<SkippedRange>& skipped, unsigned begin, unsigned end) {
    return std::any_of(skipped.begin(), skipped.end(), [&](const SkippedRange& range) {
        return begin >= range.first && end <= range.second;
    });
}

} // namespace tollgate::lexer
