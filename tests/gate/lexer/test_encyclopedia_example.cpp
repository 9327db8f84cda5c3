// SPDX-License-Identifier: MIT
// The encyclopedia's worked example through the whole pipeline: source text to measures.
#include "lexer_test_support.hpp"
#include "tollgate/core/measures.hpp"

#include <catch2/catch.hpp>
#include <set>

using namespace tollgate;

namespace {

// Wikipedia contributors, "Halstead complexity measures", English Wikipedia, section "Example"
// (program text seen through verbatim mirrors, see REFERENCES.md).
const char* const k_avg_program = "main()\n"
                                  "{\n"
                                  "int a, b, c, avg;\n"
                                  "scanf(\"%d %d %d\", &a, &b, &c);\n"
                                  "avg = (a+b+c)/3;\n"
                                  "printf(\"avg = %d\", avg);\n"
                                  "}\n";

lexer::FileFunctions lex_avg() {
    lexer::ParseContext context;
    context.force_language = lexer::Language::c;
    context.file_flags["avg.c"] = {"-std=c89"}; // implicit int for main
    return test::lex_snippet("avg.c", k_avg_program, context);
}

} // namespace

TEST_CASE("lex_functions reproduces the encyclopedia's avg example", "[lexer]") {
    const auto file = lex_avg();
    REQUIRE(file.functions.size() == 1);
    const auto& main_function = file.functions.front();
    CHECK(main_function.qualified_name == "main");
    CHECK(main_function.start_line == 1);
    CHECK(main_function.end_line == 7);
    const core::Counts counts = core::count_tokens(main_function.tokens);

    SECTION("the counts are the article's 12 / 7 / 27 / 15") {
        // n1 = 12, n2 = 7 (seen); N1 = 27, N2 = 15 (from memory, recomputed by counting).
        CHECK(counts.distinct_operators == 12);
        CHECK(counts.distinct_operands == 7);
        CHECK(counts.total_operators == 27);
        CHECK(counts.total_operands == 15);
    }

    SECTION("the distinct operators and operands are the article's lists") {
        // Published lists (seen): operators main () {} int scanf & = + / printf , ;
        // operands a b c avg "%d %d %d" 3 "avg = %d". Our key for `&` names its form, address-of.
        std::set<std::string> operators;
        for (const auto& [key, entry] : counts.operators) {
            operators.insert(key == "& (unary)" ? "&" : key);
        }
        const std::set<std::string> published_operators = {
            "main", "()", "{}", "int", "scanf", "&", "=", "+", "/", "printf", ",", ";"};
        CHECK(operators == published_operators);
        std::set<std::string> operands;
        for (const auto& [key, entry] : counts.operands) {
            operands.insert(key);
        }
        const std::set<std::string> published_operands = {
            "a", "b", "c", "avg", "\"%d %d %d\"", "3", "\"avg = %d\""};
        CHECK(operands == published_operands);
    }

    SECTION("the measures match the recomputed full-precision values") {
        // REFERENCES.md, "Worked example with source text" (recomputed from the seen counts).
        const core::Measures m = core::compute_measures(counts, main_function.potential_operands);
        CHECK(m.estimated_length == Approx(62.671034).margin(1e-6));
        CHECK(m.volume == Approx(178.412956).margin(1e-6));
        CHECK(m.difficulty == Approx(12.857143).margin(1e-6));
        CHECK(m.effort == Approx(2293.880857).margin(1e-6));
        CHECK(m.time == Approx(127.437825).margin(1e-6));
        CHECK(m.bugs_effort == Approx(0.057977).margin(1e-6));
        CHECK(m.bugs_volume == Approx(0.059471).margin(1e-6));
    }

    SECTION("the measures match the article's printed values within their rounding") {
        // Printed values (from memory): N^ 62.67, V 178.4, D 12.85, E 2292.44, T 127.357, B 0.05.
        // They were truncated and built from rounded intermediates (E = 12.85 x 178.4 = 2292.44),
        // so E and T get a margin of 1.5 and 0.1, the others their printed precision.
        const core::Measures m = core::compute_measures(counts, main_function.potential_operands);
        CHECK(m.estimated_length == Approx(62.67).margin(0.01));
        CHECK(m.volume == Approx(178.4).margin(0.05));
        CHECK(m.difficulty == Approx(12.85).margin(0.01));
        CHECK(m.effort == Approx(2292.44).margin(1.5));
        CHECK(m.time == Approx(127.357).margin(0.1));
        CHECK(m.bugs_effort == Approx(0.05).margin(0.01));
    }

    SECTION("main has an implicit int result and no parameters") {
        // Tollgate convention c-family/1, DESIGN.md: n2* = parameters + 1 for a non-void result.
        CHECK(main_function.potential_operands == 1);
        CHECK(file.lexically_recovered == 0);
    }
}
