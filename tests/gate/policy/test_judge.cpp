// SPDX-License-Identifier: MIT
// judge: every rule kind, the noise floor, paths and their scopes, waivers and the outcome,
// on change reports built by hand from Halstead counts (see policy_test_support.hpp).
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "policy_test_support.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using namespace tollgate::policy;
using tollgate::test::added;
using tollgate::test::changed;
using tollgate::test::large_measures;
using tollgate::test::medium_measures;
using tollgate::test::removed;
using tollgate::test::report_of;
using tollgate::test::small_measures;

namespace {

Policy policy_from(const std::string& rules_and_more) {
    return load_policy("tollgate-policy: 1\n" + rules_and_more, "test.yaml");
}

JudgeOptions on_day(const std::string& today) {
    JudgeOptions options;
    options.today = today;
    options.policy_origin = "test.yaml";
    return options;
}

const JudgeOptions k_options = on_day("2026-05-01");

std::vector<std::string> messages(const Verdict& verdict) {
    std::vector<std::string> texts;
    for (const auto& finding : verdict.findings) {
        texts.push_back(finding.message);
    }
    return texts;
}

const char* const k_growth_percent = R"(rules:
  - id: effort-growth
    kind: growth
    measure: effort
    max-increase-percent: 40
)";

} // namespace

TEST_CASE("judge applies a growth rule's two limits", "[policy]") {
    // small -> large: effort 768 -> 3072, +2,304, +300% (policy_test_support.hpp).
    const auto report = report_of(
        {changed("Kalman::update", "src/filter.cpp", 120, small_measures(), large_measures())});

    SECTION("a percent limit alone gives a finding in percentage points") {
        const Verdict verdict = judge(policy_from(k_growth_percent), report, k_options);
        REQUIRE(verdict.findings.size() == 1);
        const Finding& f = verdict.findings[0];
        CHECK(f.message == "src/filter.cpp:120: Kalman::update(): effort +2,304 (+300%) exceeds "
                           "the limit +40% by 260 points (rule \"effort-growth\", blocking)");
        CHECK(f.percent);
        CHECK(f.value == Approx(300.0));
        CHECK(f.limit == 40.0);
        CHECK(f.excess == Approx(260.0));
        CHECK(f.path == "src/filter.cpp");
        CHECK(f.start_line == 120);
        CHECK(f.end_line == 139);
        CHECK(f.kind == RuleKind::growth);
        CHECK(verdict.outcome == Outcome::blocked);
    }
    SECTION("an absolute limit alone gives a finding in the measure's units") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase: 2000}
)"),
                                      report, k_options);
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].message ==
              "src/filter.cpp:120: Kalman::update(): effort +2,304 (+300%) exceeds the limit "
              "+2,000 by 304 (rule \"effort-growth\", blocking)");
        CHECK_FALSE(verdict.findings[0].percent);
        CHECK(verdict.findings[0].excess == Approx(304.0));
    }
    SECTION("with both limits set, exceeding only the absolute one is a finding") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase: 2000,
     max-increase-percent: 400}
)"),
                                      report, k_options);
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].limit == 2000.0);
    }
    SECTION("with both limits set, exceeding only the percent one is a finding") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase: 5000,
     max-increase-percent: 40}
)"),
                                      report, k_options);
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].limit == 40.0);
        CHECK(verdict.findings[0].percent);
    }
    SECTION("exceeding both limits names both in one finding") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase: 2000,
     max-increase-percent: 40, level: warning}
)"),
                                      report, k_options);
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].message ==
              "src/filter.cpp:120: Kalman::update(): effort +2,304 (+300%) exceeds the limit "
              "+2,000 by 304 and the limit +40% by 260 points (rule \"effort-growth\", "
              "warning)");
    }
    SECTION("staying within both limits gives no finding") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase: 2304,
     max-increase-percent: 300}
)"),
                                      report, k_options);
        CHECK(verdict.findings.empty());
        CHECK(verdict.outcome == Outcome::pass);
    }
}

TEST_CASE("judge applies growth only to changed and moved functions", "[policy]") {
    auto moved = changed("move_me", "src/b.c", 3, small_measures(), large_measures());
    moved.label = delta::DeltaLabel::moved;
    auto same = changed("same", "src/c.c", 3, small_measures(), large_measures());
    same.label = delta::DeltaLabel::unchanged;
    const auto report = report_of({added("fresh", "src/a.c", 1, large_measures()),
                                   removed("gone", "src/a.c", 40, large_measures()), moved, same});
    const Verdict verdict = judge(policy_from(k_growth_percent), report, k_options);
    REQUIRE(verdict.findings.size() == 1);
    CHECK(verdict.findings[0].function == "move_me");
}

TEST_CASE("judge applies an added-ceiling rule to added functions only", "[policy]") {
    const auto report =
        report_of({added("parse_all", "src/a.c", 5, large_measures()),
                   changed("grow", "src/a.c", 50, small_measures(), large_measures())});
    const Verdict verdict = judge(policy_from(R"(rules:
  - id: new-function-volume
    kind: added-ceiling
    measure: volume
    ceiling: 200
    level: warning
)"),
                                  report, k_options);
    REQUIRE(verdict.findings.size() == 1);
    // large: V = 64 log2 16 = 256.
    CHECK(verdict.findings[0].message ==
          "src/a.c:5: parse_all(): new function with volume 256 exceeds the ceiling 200 by 56 "
          "(rule \"new-function-volume\", warning)");
    CHECK(verdict.findings[0].value == Approx(256.0));
    CHECK(verdict.outcome == Outcome::pass);
}

TEST_CASE("judge applies a ceiling rule to every touched function with a head", "[policy]") {
    const auto report =
        report_of({changed("Filter::step", "src/f.cpp", 10, small_measures(), large_measures()),
                   added("fresh", "src/f.cpp", 40, large_measures()),
                   removed("gone", "src/f.cpp", 80, large_measures())});
    const Verdict verdict = judge(policy_from(R"(rules:
  - {id: difficulty-ceiling, kind: ceiling, measure: difficulty, ceiling: 10}
)"),
                                  report, k_options);
    // large: D = (8/2)(24/8) = 12; small: D = (8/2)(12/8) = 6.
    CHECK(messages(verdict) ==
          std::vector<std::string>{
              "src/f.cpp:10: Filter::step(): difficulty 12 (base 6) exceeds the ceiling 10 by 2 "
              "(rule \"difficulty-ceiling\", blocking)",
              "src/f.cpp:40: fresh(): difficulty 12 exceeds the ceiling 10 by 2 (rule "
              "\"difficulty-ceiling\", blocking)"});
}

TEST_CASE("judge sums a budget over touched functions, removals included", "[policy]") {
    // Effort: +2,304 (small -> large), +1,064 (added medium), -768 (removed small) = +2,600.
    const auto report =
        report_of({changed("grow", "src/a.c", 1, small_measures(), large_measures()),
                   added("fresh", "src/a.c", 30, medium_measures()),
                   removed("gone", "src/b.c", 5, small_measures())});
    const auto budget = [](const std::string& limit) {
        return policy_from("rules:\n  - {id: change-effort-budget, kind: budget, measure: "
                           "effort, max-total-increase: " +
                           limit + "}\n");
    };

    SECTION("a sum above the budget is one finding for the whole change") {
        const Verdict verdict = judge(budget("2000"), report, k_options);
        REQUIRE(verdict.findings.size() == 1);
        const Finding& f = verdict.findings[0];
        CHECK(f.message == "the change: effort +2,600 summed over 3 functions exceeds the "
                           "budget +2,000 by 600 (rule \"change-effort-budget\", blocking)");
        CHECK(f.path.empty());
        CHECK(f.start_line == 0);
        CHECK(f.value == Approx(2600.0));
    }
    SECTION("a removal offsets growth: +3,368 without it would exceed 3,000") {
        CHECK(judge(budget("3000"), report, k_options).findings.empty());
    }
    SECTION("the noise floor does not take functions out of a budget") {
        const Policy policy = policy_from(R"(noise-floor: {volume: 1000}
rules:
  - {id: change-effort-budget, kind: budget, measure: effort, max-total-increase: 2000}
  - {id: effort-growth, kind: growth, measure: effort, max-increase: 0}
)");
        const Verdict verdict = judge(policy, report, k_options);
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].rule_id == "change-effort-budget");
    }
}

TEST_CASE("judge ignores functions below the noise floor for per-function rules", "[policy]") {
    // small -> medium: V 128 -> 152, both under 200; small -> large: V 256 on head.
    const auto report =
        report_of({changed("tiny", "src/a.c", 1, small_measures(), medium_measures()),
                   changed("bigger", "src/a.c", 20, small_measures(), large_measures())});
    // Effort grows +38.5% (768 -> 1,064) and +300%: both above a 30% limit.
    const std::string rules = "rules:\n  - {id: effort-growth, kind: growth, measure: effort, "
                              "max-increase-percent: 30}\n";
    const Policy policy = policy_from("noise-floor:\n  volume: 200\n" + rules);
    const Verdict verdict = judge(policy, report, k_options);
    REQUIRE(verdict.findings.size() == 1);
    CHECK(verdict.findings[0].function == "bigger");
    CHECK(verdict.notes ==
          std::vector<std::string>{"1 function is below the noise floor and not judged by "
                                   "per-function rules"});
    SECTION("without a noise floor both are judged") {
        CHECK(judge(policy_from(rules), report, k_options).findings.size() == 2);
    }
}

TEST_CASE("judge keeps to the policy's include and exclude globs", "[policy]") {
    const auto grow = [](const std::string& path) {
        return changed("f", path, 1, small_measures(), large_measures());
    };
    const auto report =
        report_of({grow("src/a.c"), grow("src/deep/er/b.c"), grow("src/generated/c.c"),
                   grow("src/x/vendor/d.c"), grow("lib/e.c"), grow("srcx/f.c")});
    const Policy policy = policy_from(std::string(k_growth_percent) + R"(paths:
  include: ["src/**"]
  exclude: ["src/generated/**", "**/vendor/**"]
)");
    const Verdict verdict = judge(policy, report, k_options);
    std::vector<std::string> paths;
    for (const auto& f : verdict.findings) {
        paths.push_back(f.path);
    }
    CHECK(paths == std::vector<std::string>{"src/a.c", "src/deep/er/b.c"});
    CHECK(verdict.notes ==
          std::vector<std::string>{"4 functions are outside the policy's paths and not judged"});
}

TEST_CASE("judge applies path scopes", "[policy]") {
    const auto report =
        report_of({changed("test_grow", "tests/test_a.cpp", 7, small_measures(), large_measures()),
                   changed("grow", "src/a.cpp", 7, small_measures(), large_measures())});
    const std::string rules = R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 40}
  - {id: difficulty-ceiling, kind: ceiling, measure: difficulty, ceiling: 10}
)";

    SECTION("a relaxed limit and level apply to matched paths only") {
        const Verdict verdict = judge(policy_from(rules + R"(paths:
  scopes:
    - glob: "tests/**"
      rules:
        effort-growth: {max-increase-percent: 200, level: warning}
        difficulty-ceiling: skip
)"),
                                      report, k_options);
        CHECK(messages(verdict) ==
              std::vector<std::string>{
                  "src/a.cpp:7: grow(): effort +2,304 (+300%) exceeds the limit +40% by 260 "
                  "points (rule \"effort-growth\", blocking)",
                  "src/a.cpp:7: grow(): difficulty 12 (base 6) exceeds the ceiling 10 by 2 "
                  "(rule \"difficulty-ceiling\", blocking)",
                  "tests/test_a.cpp:7: test_grow(): effort +2,304 (+300%) exceeds the limit "
                  "+200% by 100 points (rule \"effort-growth\", warning)"});
    }
    SECTION("a limit relaxed past the growth gives no finding") {
        const Verdict verdict = judge(policy_from(rules + R"(paths:
  scopes:
    - glob: "tests/*.cpp"
      rules: {effort-growth: {max-increase-percent: 400}, difficulty-ceiling: skip}
)"),
                                      report, k_options);
        for (const auto& f : verdict.findings) {
            CHECK(f.path == "src/a.cpp");
        }
        CHECK(verdict.findings.size() == 2);
    }
    SECTION("a later scope wins over an earlier one") {
        const Verdict verdict = judge(policy_from(rules + R"(paths:
  scopes:
    - glob: "**"
      rules: {effort-growth: skip, difficulty-ceiling: skip}
    - glob: "src/**"
      rules: {effort-growth: judge}
)"),
                                      report, k_options);
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].path == "src/a.cpp");
        CHECK(verdict.findings[0].rule_id == "effort-growth");
    }
}

TEST_CASE("judge honours waivers until they expire", "[policy]") {
    const auto report = report_of(
        {changed("Parser::parse_expression", "src/legacy/parser.cpp", 40, small_measures(),
                 large_measures()),
         changed("Lexer::next", "src/legacy/lexer.cpp", 12, small_measures(), large_measures())});
    const auto with_waiver = [](const std::string& expires) {
        return policy_from(std::string(k_growth_percent) + R"(waivers:
  - file: "src/legacy/**"
    function: "Parser::*"
    rules: [effort-growth]
    reason: "rewrite planned for Q3")" +
                           (expires.empty() ? "" : "\n    expires: " + expires) + "\n");
    };

    SECTION("an active waiver exempts the matching function and is noted") {
        const Verdict verdict = judge(with_waiver("2026-05-01"), report, k_options);
        REQUIRE(verdict.findings.size() == 1);
        CHECK(verdict.findings[0].function == "Lexer::next");
        CHECK(verdict.notes ==
              std::vector<std::string>{"src/legacy/parser.cpp:40: Parser::parse_expression(): rule "
                                       "\"effort-growth\" waived (rewrite planned for Q3; until "
                                       "2026-05-01)"});
    }
    SECTION("a waiver without expiry always applies") {
        const Verdict verdict = judge(with_waiver(""), report, on_day("2099-12-31"));
        CHECK(verdict.findings.size() == 1);
    }
    SECTION("an expired waiver stops applying and is reported") {
        const Verdict verdict = judge(with_waiver("2026-04-30"), report, k_options);
        CHECK(verdict.findings.size() == 2);
        CHECK(verdict.notes ==
              std::vector<std::string>{"waiver for \"src/legacy/**\" \"Parser::*\" expired on "
                                       "2026-04-30 and no longer applies (renew it with a later "
                                       "date, or remove it)"});
    }
    SECTION("a waiver that waived nothing is reported") {
        const auto quiet = report_of({changed("Lexer::next", "src/legacy/lexer.cpp", 12,
                                              small_measures(), large_measures())});
        const Verdict verdict = judge(with_waiver("2027-01-01"), quiet, k_options);
        CHECK(verdict.notes == std::vector<std::string>{
                                   "waiver for \"src/legacy/**\" \"Parser::*\" waived nothing in "
                                   "this change (remove it once the code it covers is gone)"});
    }
    SECTION("a waiver covers only the rules it names") {
        const Policy policy = policy_from(R"(rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 40}
  - {id: difficulty-ceiling, kind: ceiling, measure: difficulty, ceiling: 10}
waivers:
  - {file: "src/legacy/*.cpp", function: "Parser::*", rules: [difficulty-ceiling], reason: r}
)");
        const Verdict verdict = judge(policy, report, k_options);
        std::vector<std::string> found;
        for (const auto& f : verdict.findings) {
            found.push_back(f.function + " " + f.rule_id);
        }
        CHECK(found == std::vector<std::string>{"Lexer::next effort-growth",
                                                "Lexer::next difficulty-ceiling",
                                                "Parser::parse_expression effort-growth"});
    }
}

TEST_CASE("judge decides the outcome from the findings' levels", "[policy]") {
    const auto report =
        report_of({changed("grow", "src/a.c", 1, small_measures(), large_measures())});
    SECTION("warnings only pass") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: g, kind: growth, measure: effort, max-increase: 0, level: warning}
  - {id: c, kind: ceiling, measure: volume, ceiling: 1, level: warning}
)"),
                                      report, k_options);
        CHECK(verdict.findings.size() == 2);
        CHECK(verdict.outcome == Outcome::pass);
    }
    SECTION("one blocking finding blocks, and blocking findings come first") {
        const Verdict verdict = judge(policy_from(R"(rules:
  - {id: g, kind: growth, measure: effort, max-increase: 0, level: warning}
  - {id: c, kind: ceiling, measure: volume, ceiling: 1, level: blocking}
)"),
                                      report, k_options);
        REQUIRE(verdict.findings.size() == 2);
        CHECK(verdict.findings[0].level == Level::blocking);
        CHECK(verdict.findings[1].level == Level::warning);
        CHECK(verdict.outcome == Outcome::blocked);
        CHECK(verdict.policy_origin == "test.yaml");
    }
    SECTION("an empty report passes") {
        CHECK(judge(default_policy(), report_of({}), k_options).outcome == Outcome::pass);
    }
}

TEST_CASE("judge tolerates ceiling findings already in the baseline", "[policy]") {
    const auto report =
        report_of({changed("old", "src/a.c", 1, large_measures(), large_measures()),
                   changed("worse", "src/a.c", 30, small_measures(), large_measures())});
    JudgeOptions options = k_options;
    options.baseline_lookup = [](const std::string& identity) -> std::optional<core::Measures> {
        if (identity == "c:@old()" || identity == "c:@worse()") {
            // "worse" had D = 6 in the baseline, "old" D = 12 already.
            return identity == "c:@old()" ? large_measures() : small_measures();
        }
        return std::nullopt;
    };
    const std::string rules =
        "rules:\n  - {id: difficulty-ceiling, kind: ceiling, measure: difficulty, ceiling: 10}\n";
    SECTION("with tolerate-existing on, a finding no worse than the baseline does not block") {
        const Verdict verdict =
            judge(policy_from(rules + "baseline: {tolerate-existing: true}\n"), report, options);
        REQUIRE(verdict.findings.size() == 2);
        CHECK(verdict.findings[0].function == "worse");
        CHECK_FALSE(verdict.findings[0].tolerated);
        CHECK(verdict.findings[1].tolerated);
        CHECK(verdict.findings[1].message ==
              "src/a.c:1: old(): difficulty 12 (base 12) exceeds the ceiling 10 by 2 (rule "
              "\"difficulty-ceiling\", blocking, tolerated: the baseline has 12)");
        CHECK(verdict.outcome == Outcome::blocked);
    }
    SECTION("with tolerate-existing off, the lookup is not used") {
        const Verdict verdict =
            judge(policy_from(rules + "baseline: {tolerate-existing: false}\n"), report, options);
        for (const auto& f : verdict.findings) {
            CHECK_FALSE(f.tolerated);
        }
    }
}

TEST_CASE("judge needs today's date", "[policy]") {
    const auto report = report_of({});
    CHECK_THROWS_WITH(judge(default_policy(), report, on_day("")),
                      "cannot judge waivers without today's date: \"\" is not YYYY-MM-DD (set "
                      "TOLLGATE_TODAY=YYYY-MM-DD)");
    CHECK_THROWS_AS(judge(default_policy(), report, on_day("2026-13-01")), UsageError);
}

TEST_CASE("format_amount writes amounts for reviewers", "[policy]") {
    CHECK(format_amount(18400.4, Sign::always) == "+18,400");
    CHECK(format_amount(-1234567, Sign::always) == "-1,234,567");
    CHECK(format_amount(41.26, Sign::as_is) == "41.3");
    CHECK(format_amount(0.0523, Sign::as_is) == "0.0523");
    CHECK(format_amount(0, Sign::always) == "0");
}
