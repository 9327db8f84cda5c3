// SPDX-License-Identifier: MIT
// Compare what a baseline snapshot of the base commit says about a change's touched functions
// with what parsing the base gives.
#pragma once

#include "gate/delta/function_delta.hpp"

#include <cstddef>
#include <string>
#include <vector>

namespace tollgate::delta {

// One touched function on which the snapshot and the parsed base disagree.
struct SnapshotDisagreement {
    std::string location; // "src/knot.c:1: knot(int, int)" (head side, or base when removed)
    std::string recorded; // what the snapshot gives, e.g. "n1 9 n2 2 N1 14 N2 12 (effort 1,234)"
                          // or "no such function"
    std::string parsed;   // what the parsed base gives, in the same words

    bool operator==(const SnapshotDisagreement& other) const {
        return location == other.location && recorded == other.recorded && parsed == other.parsed;
    }
};

// The comparison of a snapshot of the base commit with the parsed base.
struct SnapshotCheck {
    bool compared = false;                           // a snapshot of the base commit was compared
    std::size_t functions = 0;                       // touched functions compared
    std::vector<SnapshotDisagreement> disagreements; // empty when the snapshot agrees

    // Return a sentence naming the first disagreement: location, both values.
    std::string first_disagreement() const;
};

// Compare `recorded`, the touched functions of a change measured with the base side taken from
// a snapshot, with `parsed`, the same change with the base side parsed (the head side is the
// same in both). They disagree on a function present in one and not the other, with another
// label, or whose base side differs in n1, n2, N1, N2, the potential operands n2* or the token
// hash (which decides "unchanged"); each is compared exactly. Extents are not compared: they
// matter only through which functions are touched and how they are labelled, which are.
SnapshotCheck check_base_snapshot(const std::vector<FunctionDelta>& parsed,
                                  const std::vector<FunctionDelta>& recorded);

} // namespace tollgate::delta
