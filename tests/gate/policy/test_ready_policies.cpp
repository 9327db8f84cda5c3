// SPDX-License-Identifier: MIT
// The ready policy files under policies/ load, and hold the values their comments describe.
#include "gate/policy/policy.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using namespace tollgate::policy;

namespace {

Policy ready(const char* name) {
    return load_policy_file(std::string(TOLLGATE_SOURCE_DIR) + "/policies/" + name);
}

const Rule& rule(const Policy& policy, const std::string& id) {
    for (const auto& r : policy.rules) {
        if (r.id == id) {
            return r;
        }
    }
    FAIL("no rule " << id);
    throw std::logic_error("unreachable");
}

} // namespace

TEST_CASE("the ready policies load with their documented values", "[policy]") {
    SECTION("starter") {
        const Policy policy = ready("starter.yaml");
        CHECK(policy.judge_with == JudgeWith::base);
        CHECK(policy.noise_floor == std::vector<NoiseFloor>{{core::MeasureId::volume, 100}});
        CHECK(rule(policy, "effort-growth").max_increase_percent == 50.0);
        CHECK(rule(policy, "effort-growth").max_increase == 20000.0);
        CHECK(rule(policy, "new-function-volume").level == Level::warning);
        REQUIRE(policy.paths.scopes.size() == 1);
        CHECK(policy.paths.scopes[0].glob == "tests/**");
        CHECK(policy.waivers.empty());
    }
    SECTION("strict") {
        const Policy policy = ready("strict.yaml");
        CHECK(rule(policy, "effort-growth").max_increase_percent == 25.0);
        CHECK(rule(policy, "difficulty-ceiling").ceiling == 30.0);
        CHECK(rule(policy, "difficulty-ceiling").level == Level::blocking);
        CHECK(rule(policy, "bugs-ceiling").measure == core::MeasureId::bugs_volume);
        CHECK(rule(policy, "change-effort-budget").max_total_increase == 50000.0);
    }
    SECTION("legacy") {
        const Policy policy = ready("legacy.yaml");
        CHECK(policy.baseline.tolerate_existing == Tolerance::on);
        CHECK_FALSE(rule(policy, "effort-growth").max_increase_percent.has_value());
        CHECK(rule(policy, "effort-growth-percent").level == Level::warning);
        CHECK(policy.paths.include == std::vector<std::string>{"src/**", "lib/**", "include/**"});
        REQUIRE(policy.waivers.size() == 1);
        CHECK(policy.waivers[0].expires == "2027-06-30");
        CHECK(policy.waivers[0].rules ==
              std::vector<std::string>{"effort-growth", "difficulty-ceiling"});
    }
}
