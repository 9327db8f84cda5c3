// SPDX-License-Identifier: MIT
// A set of 1-based line numbers kept as merged, sorted, inclusive ranges.
#include "gate/walker/line_set.hpp"

#include <algorithm>

namespace tollgate::walker {

LineSet::LineSet(const std::vector<LineRange>& ranges) {
    for (const LineRange& range : ranges) {
        add(range.first, range.last);
    }
}

void LineSet::add(unsigned first, unsigned last) {
    if (first == 0 || last < first) {
        return;
    }
    // The first range that could touch [first, last]: its last line reaches first - 1. Lines are
    // at least 1, so the subtractions cannot wrap.
    auto begin = std::lower_bound(
        m_ranges.begin(), m_ranges.end(), first,
        [](const LineRange& range, unsigned line) { return range.last < line - 1; });
    auto end = begin;
    while (end != m_ranges.end() && end->first - 1 <= last) {
        first = std::min(first, end->first);
        last = std::max(last, end->last);
        ++end;
    }
    begin = m_ranges.erase(begin, end);
    m_ranges.insert(begin, LineRange{first, last});
}

bool LineSet::contains(unsigned line) const {
    return meets(line, line);
}

bool LineSet::meets(unsigned first, unsigned last) const {
    if (last < first) {
        return false;
    }
    const auto found =
        std::lower_bound(m_ranges.begin(), m_ranges.end(), first,
                         [](const LineRange& range, unsigned line) { return range.last < line; });
    return found != m_ranges.end() && found->first <= last;
}

std::size_t LineSet::line_count() const {
    std::size_t count = 0;
    for (const LineRange& range : m_ranges) {
        count += range.last - range.first + 1;
    }
    return count;
}

} // namespace tollgate::walker
