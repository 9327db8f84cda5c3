// SPDX-License-Identifier: MIT
// The block-rate search on replays whose per-commit values are known by construction, and the
// rounding of the limits it writes.
#include "gate/calibrate/block_rate.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using calibrate::LimitKey;

namespace {

// A changed function of `path` whose effort grows from 1000 by `percent` percent (volume 500 on
// both sides, above a noise floor of 100 unless `volume` says otherwise).
delta::FunctionDelta grown(const std::string& path, double percent, double volume = 500) {
    delta::FunctionDelta f;
    f.name = "f";
    f.identity = path + ":f";
    f.label = delta::DeltaLabel::changed;
    delta::FunctionSide base;
    base.path = path;
    base.start_line = 1;
    base.measures.effort = 1000;
    base.measures.volume = volume;
    delta::FunctionSide head = base;
    head.measures.effort = 1000 + 10 * percent;
    f.base = base;
    f.head = head;
    return f;
}

// A replay of commits 1..n, commit c growing one function of src/ by c percent.
calibrate::Replay replay_of(std::size_t n) {
    calibrate::Replay replay;
    for (std::size_t c = 1; c <= n; ++c) {
        calibrate::ReplayedCommit commit;
        commit.commit.id.hex = std::string(40, static_cast<char>('a' + c % 6));
        commit.commit.subject = "edit " + std::to_string(c);
        commit.report.functions.push_back(grown("src/a.c", static_cast<double>(c)));
        replay.commits.push_back(std::move(commit));
    }
    return replay;
}

policy::Policy growth_policy() {
    return policy::load_policy(R"(tollgate-policy: 1
noise-floor:
  volume: 100
rules:
  - id: effort-growth
    kind: growth
    measure: effort
    max-increase-percent: 50
    level: blocking
paths:
  exclude: ["third_party/**"]
)",
                               "test");
}

policy::JudgeOptions options() {
    policy::JudgeOptions o;
    o.today = "2024-06-01";
    o.policy_origin = "test";
    return o;
}

} // namespace

TEST_CASE("suggest_for_block_rate", "[calibrate]") {
    SECTION("the limit is the strictest that keeps the replayed block rate at the target") {
        // 20 commits growing 1%..20%: at most 10% blocked is 2 commits, so the limit is the
        // third-largest growth, 18%, and exactly the 19% and 20% commits are blocked.
        const auto s =
            calibrate::suggest_for_block_rate(replay_of(20), growth_policy(), 10, 100, options());
        REQUIRE(s.policy.rules.size() == 1);
        REQUIRE(s.policy.rules[0].max_increase_percent);
        CHECK(*s.policy.rules[0].max_increase_percent == Approx(18));
        CHECK(s.replayed.blocked == 2);
        CHECK(s.replayed.judged == 20);
        CHECK(s.blocking.allowed == 2);
        CHECK(s.blocking.reached);
        REQUIRE(s.limits.size() == 1);
        CHECK(s.limits[0].rule_id == "effort-growth");
        CHECK(s.limits[0].key == LimitKey::max_increase_percent);
        CHECK(s.limits[0].commits_with_values == 20);
        CHECK(s.limits[0].commits_above == 2);
    }
    SECTION("a target of zero leaves every commit passing, at the largest value") {
        const auto s =
            calibrate::suggest_for_block_rate(replay_of(20), growth_policy(), 0, 100, options());
        CHECK(*s.policy.rules[0].max_increase_percent == Approx(20));
        CHECK(s.replayed.blocked == 0);
    }
    SECTION("functions outside the paths or below the noise floor do not move the limit") {
        auto replay = replay_of(20);
        replay.commits[0].report.functions.push_back(grown("third_party/z/z.c", 900));
        replay.commits[1].report.functions.push_back(grown("src/tiny.c", 700, 40));
        const auto s =
            calibrate::suggest_for_block_rate(replay, growth_policy(), 10, 100, options());
        CHECK(*s.policy.rules[0].max_increase_percent == Approx(18));
        CHECK(s.replayed.blocked == 2);
        CHECK(s.functions == 20);
    }
    SECTION("the same replay gives the same policy on every run") {
        const auto a =
            calibrate::suggest_for_block_rate(replay_of(37), growth_policy(), 5, 10, options());
        const auto b =
            calibrate::suggest_for_block_rate(replay_of(37), growth_policy(), 5, 10, options());
        CHECK(a.policy == b.policy);
    }
    SECTION("fewer commits than the documented minimum carry a small-sample warning") {
        CHECK(calibrate::suggest_for_block_rate(replay_of(20), growth_policy(), 10, 100, options())
                  .small_sample);
        CHECK_FALSE(
            calibrate::suggest_for_block_rate(replay_of(400), growth_policy(), 10, 100, options())
                .small_sample);
    }
    SECTION("a rule without any replayed value keeps its limit") {
        auto policy = growth_policy();
        policy::Rule added;
        added.id = "new-function-effort";
        added.kind = policy::RuleKind::added_ceiling;
        added.measure = core::MeasureId::effort;
        added.ceiling = 30000;
        added.level = policy::Level::warning;
        policy.rules.push_back(added);
        const auto s = calibrate::suggest_for_block_rate(replay_of(20), policy, 10, 20, options());
        CHECK(*s.policy.rules[1].ceiling == 30000);
        REQUIRE(s.limits.size() == 2);
        CHECK_FALSE(s.limits[1].searched);
    }
    SECTION("a rate outside 0..100 is refused") {
        CHECK_THROWS_WITH(
            calibrate::suggest_for_block_rate(replay_of(3), growth_policy(), 120, 10, options()),
            "rate \"120\" is out of range (give a percentage from 0 to 100)");
    }
}

TEST_CASE("readable_ceiling", "[calibrate]") {
    SECTION("below 100 a limit is rounded up to two decimals") {
        CHECK(calibrate::readable_ceiling(53.369999999999997) == 53.37);
        CHECK(calibrate::readable_ceiling(53.3701) == 53.38);
        CHECK(calibrate::readable_ceiling(0.001) == 0.01);
    }
    SECTION("from 100 up a limit is rounded up to a whole number") {
        CHECK(calibrate::readable_ceiling(18437.2) == 18438);
        CHECK(calibrate::readable_ceiling(100) == 100);
    }
    SECTION("it is never below the value and never negative") {
        for (double v : {0.07, 1.005, 99.999, 12345.678, 0.1 + 0.2}) {
            CHECK(calibrate::readable_ceiling(v) >= v);
        }
        CHECK(calibrate::readable_ceiling(-4) == 0);
    }
}
