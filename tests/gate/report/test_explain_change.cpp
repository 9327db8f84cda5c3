// SPDX-License-Identifier: MIT
// explain's comparison: the difference per token between two sides of one function.
#include "gate/report/explain_change.hpp"

#include <catch2/catch.hpp>
#include <sstream>

using namespace tollgate;
using report::compare_tokens;
using report::TokenChange;
using report::TokenRole;

namespace {

core::Counts counts(std::map<std::string, std::uint64_t> operators,
                    std::map<std::string, std::uint64_t> operands) {
    core::Counts c;
    for (const auto& [token, n] : operators) {
        c.operators[token].count = n;
        c.total_operators += n;
    }
    for (const auto& [token, n] : operands) {
        c.operands[token].count = n;
        c.total_operands += n;
    }
    c.distinct_operators = c.operators.size();
    c.distinct_operands = c.operands.size();
    return c;
}

} // namespace

TEST_CASE("compare_tokens gives each token's difference, largest first", "[report]") {
    const auto base = counts({{"if", 1}, {"=", 2}, {"return", 1}}, {{"x", 3}, {"old", 2}});
    const auto head = counts({{"if", 7}, {"=", 2}, {"return", 1}}, {{"x", 3}, {"gain", 8}});
    const auto changes = compare_tokens(base, head);
    REQUIRE(changes.size() == 6);
    CHECK(changes[0] == TokenChange{"gain", TokenRole::operand, 0, 8});
    CHECK(changes[1] == TokenChange{"if", TokenRole::operator_token, 1, 7});
    CHECK(changes[2] == TokenChange{"old", TokenRole::operand, 2, 0});
    // Unchanged tokens last: operators before operands, then by token.
    CHECK(changes[3].token == "=");
    CHECK(changes[4].token == "return");
    CHECK(changes[5].token == "x");
    CHECK(report::token_difference_summary(changes, 8) == "+8 `gain`, +6 if, -2 `old`");
    CHECK(report::token_difference_summary(changes, 1) == "+8 `gain`, and 2 more");
    CHECK(report::token_difference_summary(compare_tokens(base, base), 8) == "no token changed");
}

TEST_CASE("write_explain_change_text shows an added function against nothing", "[report]") {
    report::FunctionComparison comparison;
    report::MeasuredFunction head;
    head.path = "src/a.c";
    head.start_line = 3;
    head.end_line = 5;
    head.name = "fresh";
    head.counts = counts({{"return", 1}}, {{"\x1b[31m", 1}});
    comparison.head = head;
    comparison.base_label = "revision 3f2a91c (main)";
    comparison.head_label = "working tree";
    comparison.convention = "c-family/1";
    std::ostringstream out;
    report::write_explain_change_text(out, comparison);
    const std::string text = out.str();
    CHECK(text.find("base revision 3f2a91c (main): no such function (added since)") !=
          std::string::npos);
    CHECK(text.find("what changed: +1 return, +1 `\\x1b[31m`") != std::string::npos);
    CHECK(text.find('\x1b') == std::string::npos); // the token is made visible, not obeyed
}
