// SPDX-License-Identifier: MIT
// judge on zero and degenerate values: growth from a zero base (where a percentage is undefined),
// and every other rule kind audited for the same hole.
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "policy_test_support.hpp"

#include <catch2/catch.hpp>
#include <cmath>

using namespace tollgate;
using namespace tollgate::policy;
using tollgate::test::changed;
using tollgate::test::large_measures;
using tollgate::test::measures_of;
using tollgate::test::report_of;

namespace {

Policy policy_from(const std::string& rules_and_more) {
    return load_policy("tollgate-policy: 1\n" + rules_and_more, "test.yaml");
}

JudgeOptions options() {
    JudgeOptions o;
    o.today = "2026-05-01";
    o.policy_origin = "test.yaml";
    return o;
}

// `void f() {}`: operators void, f, ( ), { } and no operand, so n2 = 0 and D = E = 0
// (Halstead 1977: D = (n1/2)(N2/n2); core gives 0 for n2 = 0, see core/README.md).
core::Measures empty_function() {
    return measures_of(4, 0, 4, 0);
}

} // namespace

TEST_CASE("judge treats growth from a zero base as growth", "[policy]") {
    REQUIRE(empty_function().effort == 0.0);
    REQUIRE(large_measures().effort == 3072.0);
    const auto report =
        report_of({changed("stub", "src/stub.c", 7, empty_function(), large_measures())});

    SECTION("a percent limit allows no growth from zero: judged by the absolute growth") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 50}
)"),
                                      report, options());
        REQUIRE(verdict.findings.size() == 1);
        const Finding& f = verdict.findings[0];
        CHECK(f.message == "src/stub.c:7: stub(): effort +3,072 (from 0) exceeds the limit +50%, "
                           "which allows no growth from a zero base (rule \"effort-growth\", "
                           "blocking)");
        CHECK_FALSE(f.percent);
        CHECK(f.value == 3072.0);
        CHECK(f.limit == 0.0);
        CHECK(f.excess == 3072.0);
        CHECK(std::isfinite(f.value));
        CHECK(verdict.outcome == Outcome::blocked);
    }
    SECTION("with an absolute limit too, both are named and the absolute one gives the value") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase: 1000,
     max-increase-percent: 50}
)"),
                                      report, options());
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].message ==
              "src/stub.c:7: stub(): effort +3,072 (from 0) exceeds the limit +1,000 by 2,072 and "
              "the limit +50%, which allows no growth from a zero base (rule \"effort-growth\", "
              "blocking)");
        CHECK(verdict.findings[0].limit == 1000.0);
    }
    SECTION("an absolute limit that is not exceeded still leaves the percent limit to fire") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase: 5000,
     max-increase-percent: 50}
)"),
                                      report, options());
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].value == 3072.0);
    }
    SECTION("zero to zero is no growth, and no finding") {
        const auto flat = report_of(
            {changed("stub", "src/stub.c", 7, empty_function(), measures_of(5, 0, 6, 0))});
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 50}
)"),
                                      flat, options());
        CHECK(verdict.findings.empty());
    }
    SECTION("a shrink to zero is no growth") {
        const auto shrunk =
            report_of({changed("stub", "src/stub.c", 7, large_measures(), empty_function())});
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 0}
)"),
                                      shrunk, options());
        CHECK(verdict.findings.empty());
    }
    SECTION("the built-in policy blocks it") {
        const Verdict verdict = judge(default_policy(), report, options());
        CHECK(verdict.outcome == Outcome::blocked);
    }
}

TEST_CASE("judge has no zero-base hole in ceilings, budgets and tolerated findings", "[policy]") {
    const auto report =
        report_of({changed("stub", "src/stub.c", 7, empty_function(), large_measures())});

    SECTION("a ceiling judges the head value whatever the base") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-ceiling, kind: ceiling, measure: effort, ceiling: 3000}
)"),
                                      report, options());
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].message ==
              "src/stub.c:7: stub(): effort 3,072 (base 0) exceeds the ceiling 3,000 by 72 (rule "
              "\"effort-ceiling\", blocking)");
    }
    SECTION("a budget counts growth from zero in full") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: budget, kind: budget, measure: effort, max-total-increase: 3000}
)"),
                                      report, options());
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].value == 3072.0);
    }
    SECTION("a baseline value of zero tolerates nothing") {
        JudgeOptions o = options();
        o.baseline_lookup = [](const std::string&) -> std::optional<core::Measures> {
            return empty_function();
        };
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-ceiling, kind: ceiling, measure: effort, ceiling: 0}
baseline: {tolerate-existing: true}
)"),
                                      report, o);
        REQUIRE(verdict.findings.size() == 1);
        CHECK_FALSE(verdict.findings[0].tolerated);
        CHECK(verdict.outcome == Outcome::blocked);
    }
    SECTION("a baseline value that is not a finite number tolerates nothing") {
        const double odd = GENERATE(std::nan(""), HUGE_VAL);
        JudgeOptions o = options();
        o.baseline_lookup = [odd](const std::string&) -> std::optional<core::Measures> {
            core::Measures m = large_measures();
            m.effort = odd;
            return m;
        };
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-ceiling, kind: ceiling, measure: effort, ceiling: 100}
baseline: {tolerate-existing: true}
)"),
                                      report, o);
        REQUIRE(verdict.findings.size() == 1);
        CHECK_FALSE(verdict.findings[0].tolerated);
    }
}

TEST_CASE("judge applies the noise floor to values that are not numbers", "[policy]") {
    core::Measures odd = large_measures();
    odd.volume = std::nan("");
    const auto report = report_of({changed("odd", "src/odd.c", 1, odd, odd)});
    const Verdict verdict = judge(policy_from(R"(noise-floor: {volume: 100}
rules:
  - {id: effort-ceiling, kind: ceiling, measure: effort, ceiling: 100}
)"),
                                  report, options());
    CHECK(verdict.findings.size() == 1);
}
