// SPDX-License-Identifier: MIT
// Counting distinct and total operators and operands.
#include "tollgate/core/counts.hpp"

namespace tollgate::core {

Counts count_tokens(const TokenList& tokens) {
    Counts counts;
    for (const Token& token : tokens) {
        auto& table = token.role == Role::operator_token ? counts.operators : counts.operands;
        TableEntry& entry = table[token.key];
        if (entry.count == 0) {
            entry.form = token.form;
        }
        ++entry.count;
        if (token.basis == Basis::previous_token || token.basis == Basis::lexical) {
            ++entry.guessed;
        }
    }
    counts.distinct_operators = counts.operators.size();
    counts.distinct_operands = counts.operands.size();
    for (const auto& [key, entry] : counts.operators) {
        counts.total_operators += entry.count;
    }
    for (const auto& [key, entry] : counts.operands) {
        counts.total_operands += entry.count;
    }
    return counts;
}

Counts counts_from_totals(std::uint64_t n1, std::uint64_t n2, std::uint64_t N1, std::uint64_t N2) {
    Counts counts;
    counts.distinct_operators = n1;
    counts.distinct_operands = n2;
    counts.total_operators = N1;
    counts.total_operands = N2;
    return counts;
}

} // namespace tollgate::core
