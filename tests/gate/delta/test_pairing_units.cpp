// SPDX-License-Identifier: MIT
// The pairing passes' helpers and the count of code lines, on values built by hand.
#include "gate/delta/pairing.hpp"
#include "gate/delta/unmeasured_lines.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using delta::SideFunction;

namespace {

lexer::FunctionSpan span_with(const std::string& name, const std::vector<std::string>& keys) {
    lexer::FunctionSpan span;
    span.qualified_name = name;
    for (const auto& key : keys) {
        core::Token token;
        token.key = key;
        token.spelling = key;
        token.role =
            key == "x" || key == "1" ? core::Role::operand_token : core::Role::operator_token;
        span.tokens.push_back(token);
    }
    return span;
}

} // namespace

TEST_CASE("unqualified_name keeps the last component", "[delta]") {
    CHECK(delta::unqualified_name("a::B::f") == "f");
    CHECK(delta::unqualified_name("f") == "f");
    CHECK(delta::unqualified_name("ns::TEST_F(ns::Fix, Works)") == "TEST_F(ns::Fix, Works)");
    CHECK(delta::unqualified_name("Box<a::b>::put") == "put");
}

TEST_CASE("token_similarity is the Dice coefficient of the counted tokens", "[delta]") {
    // Dice, L. R., "Measures of the amount of ecologic association between species", Ecology
    // 26(3), 1945: 2 |A n B| / (|A| + |B|), here over multisets.
    const auto a = span_with("f", {"int", "f", "()", "{}", "return", "x", ";"});
    const auto same = span_with("g", {"return", "x", ";", "int", "f", "()", "{}"});
    const auto edited = span_with("f", {"int", "f", "()", "{}", "return", "1", ";"});
    const auto none = span_with("h", {"void", "h"});
    CHECK(delta::token_similarity({&a, nullptr}, {&same, nullptr}) == 1.0);
    CHECK(delta::token_similarity({&a, nullptr}, {&edited, nullptr}) == Approx(12.0 / 14.0));
    CHECK(delta::token_similarity({&a, nullptr}, {&none, nullptr}) == 0.0);
    SECTION("a function read from a snapshot has no tokens to compare") {
        baseline::SnapshotFunction stored;
        CHECK(delta::token_similarity({nullptr, &stored}, {&a, nullptr}) == 0.0);
    }
}

TEST_CASE("code_lines marks the lines that hold more than blanks and comments", "[delta]") {
    // ISO/IEC 14882:2017 [lex.comment], [lex.string]: comment markers inside a string or a raw
    // string are characters of the string; a raw string may span lines.
    const std::string text = "int a;\n"                  // 1 code
                             "\n"                        // 2 blank
                             "   // note\n"              // 3 comment
                             "/* one\n"                  // 4 comment
                             "   two */\n"               // 5 comment
                             "const char* s = \"/*\";\n" // 6 code
                             "auto r = R\"x(\n"          // 7 code
                             "// inside\n"               // 8 code (in the raw string)
                             ")x\";\n"                   // 9 code
                             "int n = 1'000; /* c */\n"  // 10 code
                             "#define X 1\n"             // 11 code
                             "  \\\n"                    // 12 a lone continuation
                             "char q = '\\'';\n";        // 13 code
    const auto code = delta::code_lines(text);
    REQUIRE(code.size() == 14);
    const std::vector<bool> expected = {false, true, false, false, false, false, true,
                                        true,  true, true,  true,  true,  false, true};
    CHECK(code == expected);
}

TEST_CASE("unmeasured_lines counts changed code lines outside every function", "[delta]") {
    const std::string head = "#define LIMIT 12\n"      // 1
                             "int f(void) {\n"         // 2
                             "  return LIMIT;\n"       // 3
                             "}\n"                     // 4
                             "// a comment\n"          // 5
                             "static int table[2];\n"; // 6
    lexer::FunctionSpan f;
    f.start_line = 2;
    f.end_line = 4;
    const std::vector<SideFunction> functions = {{&f, nullptr}};
    const walker::LineSet changed({{1, 1}, {3, 3}, {5, 6}});
    delta::FileSides sides;
    sides.head = functions;
    sides.head_lines = &changed;
    const auto lines = delta::unmeasured_lines("limits.c", sides, nullptr, &head);
    CHECK(lines.path == "limits.c");
    CHECK(lines.count == 2);
    CHECK(lines.head == std::vector<std::pair<unsigned, unsigned>>{{1, 1}, {6, 6}});
    CHECK(lines.base.empty());
}
