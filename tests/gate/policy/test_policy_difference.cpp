// SPDX-License-Identifier: MIT
// policy_difference: the readable lines that show how head's policy differs from base's.
#include "gate/policy/policy.hpp"

#include <catch2/catch.hpp>

using namespace tollgate::policy;

namespace {

const char* const k_base = R"(tollgate-policy: 1
rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 40}
  - {id: size-ceiling, kind: ceiling, measure: volume, ceiling: 1200, level: warning}
paths:
  exclude: ["third_party/**"]
)";

} // namespace

TEST_CASE("policy_difference lists what head changes", "[policy]") {
    const Policy base = load_policy(k_base, "base");
    SECTION("equal policies give no lines") {
        CHECK(policy_difference(base, load_policy(k_base, "head")).empty());
    }
    SECTION("changed, added and removed settings each get a line") {
        const Policy head = load_policy(R"(tollgate-policy: 1
judge-with: head
rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 80,
     max-increase: 5000}
  - {id: new-budget, kind: budget, measure: effort, max-total-increase: 9000}
paths:
  exclude: ["third_party/**", "src/**"]
waivers:
  - {file: "src/**", function: "*", rules: [effort-growth], reason: "just this once"}
)",
                                        "head");
        CHECK(policy_difference(base, head) ==
              std::vector<std::string>{
                  "judge-with: base in base, head in head",
                  "paths.exclude: [\"third_party/**\"] in base, [\"third_party/**\", \"src/**\"] "
                  "in head",
                  "rules[\"effort-growth\"].max-increase-percent: 40 in base, 80 in head",
                  "rules[\"size-ceiling\"]: only in base (kind ceiling, measure volume, level "
                  "warning, ceiling 1200)",
                  "rules[\"effort-growth\"].max-increase: not set in base, 5000 in head",
                  "rules[\"new-budget\"]: only in head (kind budget, measure effort, level "
                  "blocking, max-total-increase 9000)",
                  "waivers[\"src/**\" \"*\"]: only in head (rules [\"effort-growth\"], reason "
                  "\"just this once\", expires never)"});
    }
    SECTION("an override turning a rule off is shown") {
        const Policy head = load_policy(std::string(k_base) + R"(  scopes:
    - {glob: "src/**", rules: {effort-growth: skip}}
)",
                                        "head");
        CHECK(policy_difference(base, head) ==
              std::vector<std::string>{"paths.scopes[\"src/**\"]: only in head (glob "
                                       "\"src/**\", effort-growth skip)"});
    }
}
