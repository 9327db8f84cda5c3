// SPDX-License-Identifier: MIT
// Out-of-line members of classes declared in headers, found through in-memory headers.
#include "lexer_test_support.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;

namespace {

const char* const k_public_header = R"(#pragma once
#include "detail.hpp"
namespace station {
class Gauge {
public:
    Gauge(int scale);
    ~Gauge();
    Gauge& operator+=(const Gauge& other);
    explicit operator double() const;
    int reading() const;
    static Gauge zero();
    template <typename T> T scaled(T value) const;
private:
    detail::Raw m_raw;
};
}
)";

const char* const k_detail_header = R"(#pragma once
namespace station { namespace detail { struct Raw { int scale; int value; }; } }
)";

const char* const k_source = R"(#include <gauge.hpp>
namespace station {

Gauge::Gauge(int scale) : m_raw{scale, 0} {}

Gauge::~Gauge() { m_raw.value = 0; }

Gauge& Gauge::operator+=(const Gauge& other)
{
    m_raw.value += other.m_raw.value;
    return *this;
}

Gauge::operator double() const { return m_raw.value * 1.0; }

int Gauge::reading() const { return m_raw.value * m_raw.scale; }

Gauge Gauge::zero() { return Gauge(1); }

template <typename T>
T Gauge::scaled(T value) const
{
    return value * static_cast<T>(m_raw.scale);
}

template double Gauge::scaled<double>(double) const;
}
)";

} // namespace

TEST_CASE("lex_functions finds out-of-line members of classes declared in headers", "[lexer]") {
    // common practice, no source: out-of-line members only parse with their class's header.
    const std::vector<SourceFile> files = {
        {"lib/include/gauge.hpp", k_public_header},
        {"lib/src/detail.hpp", k_detail_header},
        {"lib/src/gauge.cpp", k_source},
    };
    const lexer::ParseContext context = lexer::make_parse_context(files);
    const std::vector<std::string> expected_dirs = {"", "lib/include"};
    CHECK(context.include_dirs == expected_dirs);
    REQUIRE(context.headers.size() == 2);
    lexer::Lexer lexer;
    const auto result = lexer.lex_functions(files[2], context);
    INFO("first warning: " << (result.warnings.empty() ? "" : result.warnings[0].message));
    CHECK(result.warnings.empty());
    CHECK(result.lexically_recovered == 0);

    SECTION("every member is listed with its qualified name and line") {
        std::vector<std::string> names;
        for (const auto& function : result.functions) {
            names.push_back(function.qualified_name);
            CHECK(function.mode == lexer::ExtentMode::syntax_tree);
            CHECK_FALSE(function.usr.empty());
        }
        const std::vector<std::string> expected = {
            "station::Gauge::Gauge",      "station::Gauge::~Gauge",
            "station::Gauge::operator+=", "station::Gauge::operator double",
            "station::Gauge::reading",    "station::Gauge::zero",
            "station::Gauge::scaled",
        };
        CHECK(names == expected);
    }
    SECTION("extents run from the first declaration token to the closing brace") {
        const auto& plus = test::function_named(result, "station::Gauge::operator+=");
        CHECK(plus.start_line == 8);
        CHECK(plus.end_line == 12);
        const auto& scaled = test::function_named(result, "station::Gauge::scaled");
        CHECK(scaled.start_line == 20); // the template header
        CHECK(scaled.end_line == 24);
        CHECK(scaled.tokens.front().key == "template");
    }
    SECTION("signatures, keys and potential operands follow the declarations") {
        const auto& plus = test::function_named(result, "station::Gauge::operator+=");
        CHECK(plus.signature == "const station::Gauge &");
        CHECK(plus.fallback_key == "station::Gauge::operator+=(const station::Gauge &)#0");
        CHECK(plus.potential_operands == 2);
        CHECK(test::function_named(result, "station::Gauge::Gauge").potential_operands == 1);
        CHECK(test::function_named(result, "station::Gauge::~Gauge").potential_operands == 0);
        CHECK(test::function_named(result, "station::Gauge::operator double").potential_operands ==
              1);
        CHECK(test::function_named(result, "station::Gauge::zero").potential_operands == 1);
        CHECK(test::function_named(result, "station::Gauge::scaled").potential_operands == 2);
    }
    SECTION("member names and fields are classified through the header") {
        const auto& reading = test::function_named(result, "station::Gauge::reading");
        CHECK(test::count_key(reading.tokens, "m_raw", core::Role::operand_token) == 2);
        CHECK(test::count_key(reading.tokens, "Gauge", core::Role::operator_token) == 1);
        CHECK(test::token_spelled(reading.tokens, "reading").form == "defined function");
    }
}
