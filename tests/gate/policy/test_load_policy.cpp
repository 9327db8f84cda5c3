// SPDX-License-Identifier: MIT
// load_policy: effective values of valid policies, and the exact errors of broken ones, each with
// file:line:column (1-based, counted by hand in the inputs below).
#include "gate/policy/policy.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using namespace tollgate::policy;

namespace {

// Return the messages load_policy throws for `text`, or nothing when it loads.
std::vector<std::string> problems(const std::string& text) {
    try {
        load_policy(text, ".tollgate.yaml");
    } catch (const PolicyError& e) {
        return e.messages();
    }
    return {};
}

} // namespace

TEST_CASE("load_policy reads every key of a full policy", "[policy]") {
    const Policy policy = load_policy(R"(tollgate-policy: 1
judge-with: head
noise-floor:
  volume: 40
rules:
  - id: effort-growth
    kind: growth
    measure: effort
    max-increase: 2000
    max-increase-percent: 40
  - id: new-function-volume
    kind: added-ceiling
    measure: volume
    ceiling: 1200
    level: warning
  - {id: bugs-ceiling, kind: ceiling, measure: bugs, ceiling: 0.5}
  - {id: change-effort-budget, kind: budget, measure: effort, max-total-increase: 20000}
paths:
  include: ["**"]
  exclude: ["third_party/**", "**/generated/**"]
  scopes:
    - glob: "tests/**"
      rules:
        effort-growth: {max-increase-percent: 100, max-increase: none, level: warning}
        bugs-ceiling: skip
waivers:
  - file: "src/legacy/**"
    function: "Parser::*"
    rules: [effort-growth]
    reason: "rewrite planned for Q3"
    expires: 2027-03-31
baseline:
  path: baselines/snapshot.json
  tolerate-existing: true
)",
                                      "full.yaml");
    CHECK(policy.judge_with == JudgeWith::head);
    REQUIRE(policy.noise_floor.size() == 1);
    CHECK(policy.noise_floor[0].measure == core::MeasureId::volume);
    CHECK(policy.noise_floor[0].below == 40.0);
    REQUIRE(policy.rules.size() == 4);
    CHECK(policy.rules[0].id == "effort-growth");
    CHECK(policy.rules[0].kind == RuleKind::growth);
    CHECK(policy.rules[0].measure == core::MeasureId::effort);
    CHECK(policy.rules[0].max_increase == 2000.0);
    CHECK(policy.rules[0].max_increase_percent == 40.0);
    CHECK(policy.rules[0].level == Level::blocking); // the default level
    CHECK(policy.rules[1].kind == RuleKind::added_ceiling);
    CHECK(policy.rules[1].ceiling == 1200.0);
    CHECK(policy.rules[1].level == Level::warning);
    CHECK(policy.rules[2].measure == core::MeasureId::bugs_volume); // "bugs" is V / 3000
    CHECK(policy.rules[2].ceiling == 0.5);
    CHECK(policy.rules[3].max_total_increase == 20000.0);
    CHECK(policy.paths.include == std::vector<std::string>{"**"});
    CHECK(policy.paths.exclude == std::vector<std::string>{"third_party/**", "**/generated/**"});
    REQUIRE(policy.paths.scopes.size() == 1);
    const auto& rules = policy.paths.scopes[0].rules;
    REQUIRE(rules.size() == 2);
    CHECK(rules[0].rule_id == "effort-growth");
    CHECK(rules[0].max_increase_percent == ScopedLimit{LimitSetting::set, 100});
    CHECK(rules[0].max_increase.setting == LimitSetting::remove);
    CHECK(rules[0].level == Level::warning);
    CHECK(rules[1].state == RuleSwitch::skip);
    REQUIRE(policy.waivers.size() == 1);
    CHECK(policy.waivers[0].expires == "2027-03-31");
    CHECK(policy.waivers[0].rules == std::vector<std::string>{"effort-growth"});
    CHECK(policy.baseline.path == "baselines/snapshot.json");
    CHECK(policy.baseline.tolerate_existing == Tolerance::on);
}

TEST_CASE("load_policy fills defaults for keys left out", "[policy]") {
    const Policy policy = load_policy("tollgate-policy: 1\n", "minimal.yaml");
    CHECK(policy.judge_with == JudgeWith::base);
    CHECK(policy.rules.empty());
    CHECK(policy.noise_floor.empty());
    CHECK(policy.paths.include == std::vector<std::string>{"**"});
    CHECK(policy.paths.exclude.empty());
    // Tolerating existing findings is on unless turned off: it only acts when a baseline
    // snapshot is used.
    CHECK(policy.baseline.tolerate_existing == Tolerance::on);
}

TEST_CASE("load_policy names the value to write for on and off in a scope", "[policy]") {
    const std::string rules =
        "tollgate-policy: 1\nrules: [{id: g, kind: growth, measure: effort, max-increase: 1}]\n";
    SECTION("the rule values of a scope") {
        CHECK(problems(rules + "paths:\n  scopes:\n    - {glob: \"t/**\", rules: {g: off}}\n") ==
              std::vector<std::string>{".tollgate.yaml:5:33: \"g\" must be \"skip\" or "
                                       "\"judge\", not \"off\" (write \"skip\")"});
        CHECK(problems(rules + "paths:\n  scopes:\n    - {glob: \"t/**\", rules: {g: on}}\n") ==
              std::vector<std::string>{".tollgate.yaml:5:33: \"g\" must be \"skip\" or "
                                       "\"judge\", not \"on\" (write \"judge\")"});
        CHECK(problems(rules + "paths:\n  scopes:\n    - {glob: \"t/**\", rules: {g: "
                               "{max-increase: off}}}\n") ==
              std::vector<std::string>{".tollgate.yaml:5:48: \"max-increase\" must be a number "
                                       "or \"none\", not \"off\" (write \"none\" to remove the "
                                       "limit on these paths)"});
    }
}

TEST_CASE("load_policy reports broken policies with file:line:column", "[policy]") {
    SECTION("an unknown key gets a did-you-mean") {
        CHECK(problems("tollgate-policy: 1\nrulez: []\n") ==
              std::vector<std::string>{
                  ".tollgate.yaml:2:1: unknown key \"rulez\" (did you mean \"rules\"?)"});
    }
    SECTION("an unknown key with no near name lists the expected keys") {
        CHECK(problems("tollgate-policy: 1\npaths:\n  zzzzzz: []\n") ==
              std::vector<std::string>{".tollgate.yaml:3:3: unknown key \"zzzzzz\" in \"paths\" "
                                       "(expected \"include\", \"exclude\" or \"scopes\")"});
    }
    SECTION("an unknown measure gets a did-you-mean") {
        CHECK(problems("tollgate-policy: 1\nrules:\n  - id: effort-growth\n    kind: growth\n"
                       "    measure: efort\n    max-increase: 10\n") ==
              std::vector<std::string>{
                  ".tollgate.yaml:5:14: unknown measure \"efort\" (did you mean \"effort\"?)"});
    }
    SECTION("a misspelled measure in the noise floor is an unknown key") {
        CHECK(problems("tollgate-policy: 1\nnoise-floor: {volumne: 40}\n") ==
              std::vector<std::string>{".tollgate.yaml:2:15: unknown key \"volumne\" in "
                                       "\"noise-floor\" (did you mean \"volume\"?)"});
    }
    SECTION("a value of the wrong type says what was expected") {
        CHECK(problems("tollgate-policy: 1\nrules:\n  - id: g\n    kind: growth\n"
                       "    measure: effort\n    max-increase: lots\n") ==
              std::vector<std::string>{".tollgate.yaml:6:19: \"max-increase\" must be a number "
                                       "of zero or more, not \"lots\""});
        CHECK(problems("tollgate-policy: 1\nrules: {id: g}\n") ==
              std::vector<std::string>{".tollgate.yaml:2:8: \"rules\" must be a list, not a map"});
        CHECK(problems("tollgate-policy: 1\nrules:\n  - {id: g, kind: growth, measure: effort, "
                       "max-increase-percent: 40%}\n") ==
              std::vector<std::string>{".tollgate.yaml:3:66: \"max-increase-percent\" must be a "
                                       "number of zero or more, not \"40%\" (write 40 for 40%)"});
    }
    SECTION("a limit of another kind of rule is named") {
        CHECK(problems("tollgate-policy: 1\nrules:\n  - {id: c, kind: ceiling, measure: volume, "
                       "max-increase: 3}\n") ==
              std::vector<std::string>{".tollgate.yaml:3:45: \"max-increase\" does not apply to "
                                       "a ceiling rule (expected \"ceiling\")"});
    }
    SECTION("a rule without a limit is rejected") {
        CHECK(
            problems("tollgate-policy: 1\nrules:\n  - {id: g, kind: growth, measure: effort}\n") ==
            std::vector<std::string>{".tollgate.yaml:3:5: rule \"g\" has no limit (a growth rule "
                                     "needs \"max-increase\", \"max-increase-percent\" or "
                                     "both)"});
    }
    SECTION("a bad date is rejected") {
        CHECK(problems(R"(tollgate-policy: 1
rules: [{id: g, kind: growth, measure: effort, max-increase: 1}]
waivers:
  - {file: "a/**", function: f, rules: [g], reason: r, expires: 2027-02-29}
)") == std::vector<std::string>{".tollgate.yaml:4:65: invalid date \"2027-02-29\" for "
                                "\"expires\" (expected YYYY-MM-DD, the last day the waiver "
                                "applies)"});
    }
    SECTION("a waiver without a reason is rejected") {
        CHECK(problems(R"(tollgate-policy: 1
rules: [{id: g, kind: growth, measure: effort, max-increase: 1}]
waivers:
  - file: "a/**"
    function: f
    rules: [g]
)") == std::vector<std::string>{".tollgate.yaml:4:5: a waiver has no \"reason\" (say why the "
                                "function is exempt; a waiver needs a reason)"});
    }
    SECTION("a waiver or scope naming an unknown rule gets a did-you-mean") {
        CHECK(problems(R"(tollgate-policy: 1
rules: [{id: effort-growth, kind: growth, measure: effort, max-increase: 1}]
paths:
  scopes:
    - glob: "tests/**"
      rules: {efort-growth: skip}
waivers:
  - {file: "a/**", function: f, rules: [effort-grwth], reason: r}
)") == std::vector<std::string>{".tollgate.yaml:6:15: unknown rule \"efort-growth\" (did you mean "
                                "\"effort-growth\"?)",
                                ".tollgate.yaml:8:41: unknown rule \"effort-grwth\" (did you mean "
                                "\"effort-growth\"?)"});
    }
    SECTION("a duplicate rule id names the first definition") {
        CHECK(problems(R"(tollgate-policy: 1
rules:
  - {id: g, kind: growth, measure: effort, max-increase: 1}
  - {id: g, kind: ceiling, measure: volume, ceiling: 1}
)") == std::vector<std::string>{
           ".tollgate.yaml:4:10: duplicate rule id \"g\" (first defined at line 3)"});
    }
    SECTION("a duplicate key is reported") {
        CHECK(problems("tollgate-policy: 1\njudge-with: base\njudge-with: head\n") ==
              std::vector<std::string>{".tollgate.yaml:3:1: duplicate key \"judge-with\" (first "
                                       "given at line 2)"});
    }
    SECTION("a YAML syntax error has a position") {
        // yaml-cpp stops at the block entry "-" inside the unclosed flow sequence.
        CHECK(problems("tollgate-policy: 1\nrules: [\n  - id: a\n") ==
              std::vector<std::string>{".tollgate.yaml:3:3: invalid YAML: illegal block entry"});
    }
    SECTION("a missing or wrong schema version is reported") {
        CHECK(problems("judge-with: base\n") ==
              std::vector<std::string>{".tollgate.yaml:1:1: missing key \"tollgate-policy\" "
                                       "(start the file with \"tollgate-policy: 1\", the schema "
                                       "version)"});
        CHECK(problems("tollgate-policy: 2\n") ==
              std::vector<std::string>{".tollgate.yaml:1:18: unsupported policy schema version "
                                       "\"2\" (this tollgate reads version 1)"});
        CHECK(problems("") == std::vector<std::string>{".tollgate.yaml: the policy is empty "
                                                       "(expected at least \"tollgate-policy: "
                                                       "1\")"});
    }
    SECTION("several problems are reported at once, in file order") {
        // "blocker" is three edits from "blocking": too far for a suggestion.
        const auto found = problems(R"(tollgate-policy: 1
judge-with: bsae
rules:
  - {id: g, kind: growht, measure: effort, max-increase: 1}
  - {id: h, kind: ceiling, measure: volum, ceiling: 1, level: blocker}
)");
        CHECK(found == std::vector<std::string>{
                           ".tollgate.yaml:2:13: \"judge-with\" must be \"base\" or \"head\", not "
                           "\"bsae\" (did you mean \"base\"?)",
                           ".tollgate.yaml:4:19: \"kind\" must be \"growth\", \"added-ceiling\", "
                           "\"ceiling\" or \"budget\", not \"growht\" (did you mean "
                           "\"growth\"?)",
                           ".tollgate.yaml:5:37: unknown measure \"volum\" (did you mean "
                           "\"volume\"?)",
                           ".tollgate.yaml:5:63: \"level\" must be \"blocking\" or \"warning\", "
                           "not \"blocker\""});
    }
    SECTION("the error text joins the messages one per line") {
        try {
            load_policy("tollgate-policy: 1\nrulez: 1\npathz: 2\n", "p.yaml");
            FAIL("no PolicyError");
        } catch (const UsageError& e) {
            CHECK(std::string(e.what()) ==
                  "p.yaml:2:1: unknown key \"rulez\" (did you mean \"rules\"?)\n"
                  "p.yaml:3:1: unknown key \"pathz\" (did you mean \"paths\"?)");
        }
    }
}

TEST_CASE("load_policy_file names the file it cannot read", "[policy]") {
    CHECK_THROWS_WITH(load_policy_file("/nonexistent/tollgate.yaml"),
                      "cannot read policy file \"/nonexistent/tollgate.yaml\": no such file or "
                      "directory (check the path, or run \"tollgate policy --default\" for a "
                      "start)");
}

TEST_CASE("describe_policy writes YAML that loads back to the same policy", "[policy]") {
    const Policy policy = load_policy(R"(tollgate-policy: 1
judge-with: head
noise-floor: {volume: 40.5, effort: 100}
rules:
  - {id: g, kind: growth, measure: effort, max-increase: 2000, max-increase-percent: 12.25}
  - {id: b, kind: budget, measure: time, max-total-increase: 0.1}
paths:
  include: ["src/**", "lib/*.c"]
  exclude: ["**/gen erated/**"]
  scopes:
    - {glob: "*", rules: {g: {max-increase: none, level: warning}, b: skip}}
    - {glob: "t/**", rules: {g: judge}}
waivers:
  - {file: "x/**", function: "A::*", rules: [g, b], reason: "it's: \"quoted\"", expires: 2028-02-29}
baseline: {path: "snap shot.json", tolerate-existing: false}
advisory: true
change-exemptions: accept
)",
                                      "p.yaml");
    const std::string text = describe_policy(policy);
    CHECK(load_policy(text, "described") == policy);
    SECTION("the default policy too") {
        CHECK(load_policy(describe_policy(default_policy()), "described") == default_policy());
    }
    SECTION("every default is written out") {
        const std::string minimal = describe_policy(load_policy("tollgate-policy: 1\n", "m"));
        CHECK(minimal == "tollgate-policy: 1\njudge-with: base\nadvisory: false\n"
                         "change-exemptions: refuse\nnoise-floor: {}\nrules: []\n"
                         "paths:\n  include: [\"**\"]\n  exclude: []\n  scopes: []\n"
                         "waivers: []\nbaseline:\n  tolerate-existing: true\n"
                         "inactive-code: judge\nunmeasured-lines: none\n");
    }
}

TEST_CASE("default_policy is documented and loads", "[policy]") {
    const Policy policy = default_policy();
    CHECK(policy.judge_with == JudgeWith::base);
    REQUIRE(policy.rules.size() == 4);
    CHECK(policy.rules[0].id == "effort-growth");
    CHECK(policy.rules[0].max_increase_percent == 50.0);
    CHECK(policy.paths.exclude ==
          std::vector<std::string>{"third_party/**", "vendor/**", "**/generated/**"});
    // Every rule of the built-in text carries a comment.
    CHECK(default_policy_text().find("# a changed function may not grow") != std::string::npos);
}

TEST_CASE("load_policy rejects text that is not UTF-8", "[policy]") {
    // Found by the fuzzer: a stray byte 0x88 (a continuation byte without a lead, RFC 3629).
    try {
        load_policy("tollgate-policy: 1\nbaseline: {path: snap\x88.json}\n", "p.yaml");
        FAIL("no PolicyError");
    } catch (const PolicyError& e) {
        CHECK(e.messages() == std::vector<std::string>{"p.yaml:2:22: the policy is not UTF-8 "
                                                       "text (byte 0x88; save the file as "
                                                       "UTF-8)"});
    }
    CHECK_NOTHROW(
        load_policy("tollgate-policy: 1\nwaivers: []\n# caf\xC3\xA9 \xE2\x82\xAC\n", "p"));
    CHECK_THROWS_AS(load_policy("tollgate-policy: 1\n# \xC0\xAF\n", "p"), PolicyError); // overlong
    CHECK_THROWS_AS(load_policy("tollgate-policy: 1\n# \xED\xA0\x80\n", "p"),
                    PolicyError); // surrogate
}

TEST_CASE("load_policy refuses numbers that are not finite or are negative", "[policy]") {
    // YAML 1.2 spells infinity and not-a-number ".inf", "-.inf" and ".nan" (YAML 1.2, 2009,
    // section 10.2.1.4); 1e400 overflows a double (IEEE 754 binary64 ends near 1.8e308).
    const std::string odd = GENERATE(as<std::string>{}, ".nan", ".NaN", "nan", ".inf", "-.inf",
                                     "inf", "1e400", "-1", "-0.5", "-1e400");
    const std::string column_text = "\" must be a number of zero or more, not \"" + odd + "\"";
    SECTION("as a rule's limit") {
        CHECK(
            problems("tollgate-policy: 1\nrules:\n  - id: g\n    kind: growth\n"
                     "    measure: effort\n    max-increase-percent: " +
                     odd + "\n") ==
            std::vector<std::string>{".tollgate.yaml:6:27: \"max-increase-percent" + column_text});
    }
    SECTION("as a ceiling, a budget and a scope's limit") {
        CHECK(problems("tollgate-policy: 1\nrules:\n  - {id: c, kind: ceiling, measure: volume, "
                       "ceiling: " +
                       odd + "}\n")
                  .size() == 1);
        CHECK(problems("tollgate-policy: 1\nrules:\n  - {id: b, kind: budget, measure: effort, "
                       "max-total-increase: " +
                       odd + "}\n")
                  .size() == 1);
        CHECK(problems("tollgate-policy: 1\nrules:\n  - {id: g, kind: growth, measure: effort, "
                       "max-increase: 5}\npaths:\n  scopes:\n    - glob: \"a/**\"\n"
                       "      rules: {g: {max-increase: " +
                       odd + "}}\n") ==
              std::vector<std::string>{".tollgate.yaml:7:33: \"max-increase" + column_text});
    }
    SECTION("as a noise floor") {
        CHECK(problems("tollgate-policy: 1\nnoise-floor:\n  volume: " + odd + "\n") ==
              std::vector<std::string>{".tollgate.yaml:3:11: \"noise-floor.volume" + column_text});
    }
}
