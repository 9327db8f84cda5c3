// SPDX-License-Identifier: MIT
// A set of 1-based line numbers kept as merged, sorted, inclusive ranges.
#pragma once

#include <cstddef>
#include <vector>

namespace tollgate::walker {

// An inclusive range of 1-based line numbers.
struct LineRange {
    unsigned first = 0; // first line of the range (1-based)
    unsigned last = 0;  // last line of the range (inclusive, >= first)

    bool operator==(const LineRange& other) const {
        return first == other.first && last == other.last;
    }
    bool operator!=(const LineRange& other) const { return !(*this == other); }
};

// Changed lines of one side of one file: sorted, non-overlapping, non-adjacent ranges.
class LineSet {
public:
    LineSet() = default;

    // Build a set from `ranges` in any order; overlapping and adjacent ranges are merged, and
    // ranges with `last` < `first` or `first` == 0 are ignored.
    explicit LineSet(const std::vector<LineRange>& ranges);

    // Add lines `first` through `last` (inclusive), merging with neighbours. Does nothing when
    // `last` < `first` or `first` is 0.
    void add(unsigned first, unsigned last);

    // Add the single line `line` (1-based). Does nothing for 0.
    void add(unsigned line) { add(line, line); }

    // Return true when `line` is in the set; false for an empty set.
    bool contains(unsigned line) const;

    // Return true when any line of `first`..`last` (inclusive) is in the set; false for an empty
    // set or an empty range (`last` < `first`).
    bool meets(unsigned first, unsigned last) const;

    // Return the merged ranges in ascending order; empty when no line is set.
    const std::vector<LineRange>& ranges() const { return m_ranges; }

    // Return true when no line is set.
    bool empty() const { return m_ranges.empty(); }

    // Return the number of lines in the set (0 when empty).
    std::size_t line_count() const;

    bool operator==(const LineSet& other) const { return m_ranges == other.m_ranges; }
    bool operator!=(const LineSet& other) const { return !(*this == other); }

private:
    std::vector<LineRange> m_ranges; // sorted by first line, disjoint and non-adjacent
};

} // namespace tollgate::walker
