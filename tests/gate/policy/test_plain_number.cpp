// SPDX-License-Identifier: MIT
// Numbers in printed and written policies: as a person writes them, and read back exactly.
#include "gate/policy/policy.hpp"

#include <catch2/catch.hpp>
#include <cstdlib>

using namespace tollgate;

TEST_CASE("plain_number", "[policy]") {
    SECTION("a decimal is written with the digits a person would write") {
        CHECK(policy::plain_number(53.37) == "53.37");
        CHECK(policy::plain_number(0.1) == "0.1");
        CHECK(policy::plain_number(18437.25) == "18437.25");
    }
    SECTION("a whole number has no decimals") {
        CHECK(policy::plain_number(50) == "50");
        CHECK(policy::plain_number(100000) == "100000");
    }
    SECTION("what is written reads back as exactly the same number") {
        for (double v : {53.37, 0.1 + 0.2, 1.0 / 3.0, 61.53846153846154, 2.5e-7}) {
            INFO(v);
            CHECK(std::strtod(policy::plain_number(v).c_str(), nullptr) == v);
        }
    }
}

TEST_CASE("describe_policy rounds its numbers as a person would", "[policy]") {
    const auto loaded = policy::load_policy(R"(tollgate-policy: 1
noise-floor:
  volume: 99.9
rules:
  - id: effort-growth
    kind: growth
    measure: effort
    max-increase-percent: 53.37
    level: blocking
)",
                                            "test");
    const std::string text = policy::describe_policy(loaded);
    INFO(text);
    SECTION("the limits show as written, not as 17 significant digits") {
        CHECK(text.find("max-increase-percent: 53.37\n") != std::string::npos);
        CHECK(text.find("volume: 99.9\n") != std::string::npos);
        CHECK(text.find("53.369999") == std::string::npos);
    }
    SECTION("the printed policy loads back equal") {
        CHECK(policy::load_policy(text, "printed") == loaded);
    }
}
