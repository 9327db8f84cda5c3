// SPDX-License-Identifier: MIT
// Halstead's four base counts of one function, with the per-token tables behind them.
#pragma once

#include "tollgate/core/token.hpp"

#include <cstdint>
#include <map>
#include <string>

namespace tollgate::core {

// The occurrences of one distinct operator or operand.
struct TableEntry {
    std::uint64_t count = 0;   // how many times the key occurs
    std::string form;          // the form it was counted as (first seen), empty when unambiguous
    std::uint64_t guessed = 0; // occurrences whose form the previous token decided (the syntax
                               // tree could not), so a reader knows how sure the split is
    bool operator==(const TableEntry& other) const {
        return count == other.count && form == other.form && guessed == other.guessed;
    }
};

// Counts n1, n2, N1, N2 and the tables they come from. Tables are ordered by key.
struct Counts {
    std::uint64_t distinct_operators = 0;        // n1
    std::uint64_t distinct_operands = 0;         // n2
    std::uint64_t total_operators = 0;           // N1
    std::uint64_t total_operands = 0;            // N2
    std::map<std::string, TableEntry> operators; // key -> occurrences
    std::map<std::string, TableEntry> operands;  // key -> occurrences

    bool operator==(const Counts& other) const {
        return distinct_operators == other.distinct_operators &&
               distinct_operands == other.distinct_operands &&
               total_operators == other.total_operators && total_operands == other.total_operands &&
               operators == other.operators && operands == other.operands;
    }
};

// Count the operators and operands of `tokens`. An empty list gives all-zero counts.
Counts count_tokens(const TokenList& tokens);

// Build counts from the four published numbers alone (no tables), for formula checks.
Counts counts_from_totals(std::uint64_t n1, std::uint64_t n2, std::uint64_t N1, std::uint64_t N2);

} // namespace tollgate::core
