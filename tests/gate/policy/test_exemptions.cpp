// SPDX-License-Identifier: MIT
// Advisory runs and exemptions a change carries: reading trailers and marked comments as data,
// applying them only as the policy's change-exemptions says, and the policy keys themselves.
#include "gate/policy/exemptions.hpp"
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "policy_test_support.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using namespace tollgate::policy;
using tollgate::test::changed;
using tollgate::test::large_measures;
using tollgate::test::report_of;
using tollgate::test::small_measures;

namespace {

const char* const k_rules =
    "tollgate-policy: 1\n"
    "rules:\n"
    "  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 40}\n"
    "  - {id: difficulty-ceiling, kind: ceiling, measure: difficulty, ceiling: 10, "
    "level: warning}\n";

// Two functions that grow from small to large (+300% effort, difficulty 12): each breaks both
// rules.
Verdict judged() {
    JudgeOptions options;
    options.today = "2026-05-01";
    const auto report = report_of(
        {changed("Kalman::update", "src/filter.cpp", 10, small_measures(), large_measures()),
         changed("crc16", "src/crc.c", 3, small_measures(), large_measures())});
    return judge(load_policy(k_rules, "p.yaml"), report, options);
}

ExemptionClaims trailers(const std::string& message) {
    ExemptionClaims found;
    read_exemption_trailers(message, "3f2a91c", found);
    return found;
}

} // namespace

TEST_CASE("load_policy reads advisory and change-exemptions", "[policy]") {
    const Policy defaults = load_policy("tollgate-policy: 1\n", "p.yaml");
    CHECK(defaults.enforcement == Enforcement::blocking);
    CHECK(defaults.change_exemptions == ChangeExemptions::refuse);
    const Policy set =
        load_policy("tollgate-policy: 1\nadvisory: true\nchange-exemptions: accept\n", "p.yaml");
    CHECK(set.enforcement == Enforcement::advisory);
    CHECK(set.change_exemptions == ChangeExemptions::accept);
    try {
        load_policy("tollgate-policy: 1\nchange-exemptions: allow\n", "p.yaml");
        FAIL("no PolicyError");
    } catch (const PolicyError& e) {
        CHECK(e.messages() == std::vector<std::string>{"p.yaml:2:20: \"change-exemptions\" must "
                                                       "be \"refuse\" or \"accept\", not "
                                                       "\"allow\""});
    }
    CHECK(policy_difference(defaults, set) ==
          std::vector<std::string>{"advisory: false in base, true in head",
                                   "change-exemptions: refuse in base, accept in head"});
}

TEST_CASE("make_advisory reports what would block and passes", "[policy]") {
    Verdict verdict = judged();
    REQUIRE(verdict.outcome == Outcome::blocked);
    REQUIRE(count_blocking(verdict) == 2);
    make_advisory(verdict);
    CHECK(verdict.outcome == Outcome::would_block);
    CHECK(verdict.enforcement == Enforcement::advisory);
    CHECK(count_blocking(verdict) == 0);
    CHECK(count_would_block(verdict) == 2);
    CHECK(std::string(outcome_name(verdict.outcome)) == "would-block");
    SECTION("a warning stays a warning, not a would-block") {
        for (const auto& f : verdict.findings) {
            CHECK(f.would_block() == (f.level == Level::blocking));
        }
    }
    SECTION("an advisory run with nothing that would block simply passes") {
        Verdict quiet;
        make_advisory(quiet);
        CHECK(quiet.outcome == Outcome::pass);
    }
}

TEST_CASE("read_exemption_trailers reads FUNCTION (RULES): REASON", "[policy]") {
    SECTION("one trailer with two rules, the key in any case") {
        const auto found = trailers("Unroll the table\n\nThe filter needs it.\n\n"
                                    "tollgate-exemption: Kalman::* (effort-growth, "
                                    "difficulty-ceiling): reviewed with the sensor team\n");
        REQUIRE(found.claims.size() == 1);
        const auto& claim = found.claims[0];
        CHECK(claim.source == ExemptionSource::trailer);
        CHECK(claim.where == "3f2a91c");
        CHECK(claim.function == "Kalman::*");
        CHECK(claim.rules == std::vector<std::string>{"effort-growth", "difficulty-ceiling"});
        CHECK(claim.reason == "reviewed with the sensor team");
        CHECK(found.notes.empty());
    }
    SECTION("a function whose name holds parentheses") {
        const auto found =
            trailers("x\n\nTollgate-Exemption: Matrix::operator() (effort-growth): hot path\n");
        REQUIRE(found.claims.size() == 1);
        CHECK(found.claims[0].function == "Matrix::operator()");
        CHECK(found.claims[0].reason == "hot path");
    }
    SECTION("a trailer without a reason or not understood is a note, not a claim") {
        const auto found = trailers("x\n\nTollgate-Exemption: f (effort-growth):\n"
                                    "Tollgate-Exemption: everything please\n");
        CHECK(found.claims.empty());
        CHECK(found.notes ==
              std::vector<std::string>{
                  "an exemption trailer in commit 3f2a91c has no reason and is ignored (write "
                  "\"Tollgate-Exemption: FUNCTION (RULES): REASON\")",
                  "an exemption trailer in commit 3f2a91c is not understood and is ignored "
                  "(write \"Tollgate-Exemption: FUNCTION (RULES): REASON\")"});
    }
    SECTION("a change claims at most a bounded number of exemptions") {
        std::string message = "x\n\n";
        for (std::size_t i = 0; i < k_exemption_limit + 5; ++i) {
            message += "Tollgate-Exemption: f (effort-growth): again\n";
        }
        const auto found = trailers(message);
        CHECK(found.claims.size() == k_exemption_limit);
        CHECK(found.notes.size() == 1);
    }
}

TEST_CASE("read_exemption_comments reads marked comments of one function", "[policy]") {
    const std::string source = "// tollgate-exemption(effort-growth): the lookup is unrolled\n"
                               "int crc16(const char* data) {\n"
                               "    const char* text = \"tollgate-exemption(effort-growth): no\";\n"
                               "    /* tollgate-exemption(difficulty-ceiling): see RFC 1662 */\n"
                               "    return 0;\n"
                               "}\n"
                               "// tollgate-exemption(effort-growth): another function's\n";
    ExemptionClaims found;
    read_exemption_comments(source, "src/crc.c", "crc16", 2, 6, found);
    REQUIRE(found.claims.size() == 2);
    CHECK(found.claims[0].where == "src/crc.c:1"); // the comment right above the definition
    CHECK(found.claims[0].rules == std::vector<std::string>{"effort-growth"});
    CHECK(found.claims[0].reason == "the lookup is unrolled");
    CHECK(found.claims[1].where == "src/crc.c:4");
    CHECK(found.claims[1].reason == "see RFC 1662"); // the comment's end is not the reason
    CHECK(found.claims[1].function == "crc16");
    CHECK(found.claims[1].start_line == 2);
    CHECK(found.notes.empty()); // the string literal on line 3 is code, not a comment
}

TEST_CASE("apply_exemptions obeys only the policy's change-exemptions", "[policy]") {
    ExemptionClaims claims =
        trailers("x\n\nTollgate-Exemption: Kalman::* (effort-growth): \x1b]0;owned\x07 reviewed\n");
    SECTION("refused by default: the finding still blocks and says the exemption was refused") {
        Verdict verdict = judged();
        apply_exemptions(verdict, claims, ChangeExemptions::refuse);
        CHECK(verdict.outcome == Outcome::blocked);
        CHECK(count_blocking(verdict) == 2);
        REQUIRE(verdict.exemptions.size() == 1);
        CHECK(verdict.exemptions[0].state == ExemptionState::refused);
        CHECK(verdict.exemptions[0].findings == 1);
        std::size_t marked = 0;
        for (const auto& f : verdict.findings) {
            if (f.exemption == ExemptionState::refused) {
                ++marked;
                CHECK(f.function == "Kalman::update");
                CHECK(f.rule_id == "effort-growth");
                // Data, kept as written: every report escapes it for its output.
                CHECK(f.exemption_reason == "\x1b]0;owned\x07 reviewed");
                CHECK(f.blocks());
            }
        }
        CHECK(marked == 1);
    }
    SECTION("accepted: the exempted finding no longer blocks, the others still do") {
        Verdict verdict = judged();
        apply_exemptions(verdict, claims, ChangeExemptions::accept);
        CHECK(verdict.outcome == Outcome::blocked); // crc16 still blocks
        CHECK(count_blocking(verdict) == 1);
        CHECK(verdict.exemptions[0].state == ExemptionState::accepted);
        claims = trailers("x\n\nTollgate-Exemption: * (effort-growth): all of it\n");
        Verdict all = judged();
        apply_exemptions(all, claims, ChangeExemptions::accept);
        CHECK(all.outcome == Outcome::pass);
        CHECK(all.exemptions[0].findings == 2);
    }
    SECTION("an exemption names rules: another rule's finding is not covered") {
        Verdict verdict = judged();
        apply_exemptions(verdict, trailers("x\n\nTollgate-Exemption: * (no-such-rule): r\n"),
                         ChangeExemptions::accept);
        CHECK(verdict.outcome == Outcome::blocked);
        CHECK(verdict.exemptions[0].findings == 0);
    }
}
