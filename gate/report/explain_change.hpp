// SPDX-License-Identifier: MIT
// `tollgate explain --base/--change`: one function's operators and operands before and after,
// side by side, with the difference per token.
#pragma once

#include "gate/report/measure_table.hpp"
#include "tollgate/core/counts.hpp"

#include <cstdint>
#include <optional>
#include <ostream>
#include <string>
#include <vector>

namespace tollgate::report {

// Whether a token was counted as an operator or an operand.
enum class TokenRole { operator_token, operand };

// One distinct token's occurrences on both sides.
struct TokenChange {
    std::string token;                          // the token's text as counted
    TokenRole role = TokenRole::operator_token; // operator or operand
    std::uint64_t base = 0;                     // occurrences in base (0: absent)
    std::uint64_t head = 0;                     // occurrences in head (0: absent)

    // Return head - base.
    long long difference() const {
        return static_cast<long long>(head) - static_cast<long long>(base);
    }
    bool operator==(const TokenChange& other) const {
        return token == other.token && role == other.role && base == other.base &&
               head == other.head;
    }
};

// Return every distinct token of `base` or `head`, the largest difference first (growth before
// shrinkage of the same size), then operators before operands, then by token. Tokens whose
// counts are equal come last.
std::vector<TokenChange> compare_tokens(const core::Counts& base, const core::Counts& head);

// Return the changed tokens of `changes` (in its order) as one phrase, at most `limit` of them:
// "+6 if, +8 `gain`, -1 `x`" (operands in backticks, operators bare), with ", and N more" when
// some are left out; "no token changed" when none did. The text is the function's own: callers
// escape it for their output.
std::string token_difference_summary(const std::vector<TokenChange>& changes, std::size_t limit);

// The two sides of one function as `explain` compares them.
struct FunctionComparison {
    std::optional<MeasuredFunction> base; // the function at the base revision; none: added
    std::optional<MeasuredFunction> head; // the function at the head; none: removed
    std::string base_label;               // e.g. "revision 3f2a91c (main)"
    std::string head_label;               // e.g. "working tree"
    std::string convention;               // counting-convention fingerprint
    std::string base_match;               // how the base side was found, e.g. "same name and
                                          // signature"; empty when there is none
};

// Write `comparison` as text: the function and both sources, the summary of the difference, the
// operator and operand tables side by side (changed tokens only, with a count of the unchanged
// ones) and the measures on both sides with their difference. Repository text is made safe for
// a terminal.
void write_explain_change_text(std::ostream& out, const FunctionComparison& comparison);

// Write `comparison` as JSON (schema "tollgate.explain-change/1"): both sides' functions, every
// token with both counts and the difference, and the summary.
void write_explain_change_json(std::ostream& out, const FunctionComparison& comparison);

} // namespace tollgate::report
