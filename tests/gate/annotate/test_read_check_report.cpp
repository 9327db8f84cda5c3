// SPDX-License-Identifier: MIT
// The reader of check's JSON report: the inverse of the JSON writer.
#include "gate/annotate/read_check_report.hpp"
#include "gate/annotate/sample_change.hpp"
#include "gate/common/errors.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

using tollgate::annotate::parse_check_report;
using tollgate::test::check_json;
using tollgate::test::sample_change;

TEST_CASE("parse_check_report", "[annotate]") {
    SECTION("a report read back writes the same JSON again") {
        auto change = sample_change({{"Kalman::update", "src/filter.cpp", 120, 1000, 18400},
                                     {"crc16", "src/crc.c", 7, 900, 300},
                                     {"ring_push", "src/ring.c", 31, 0, 420}},
                                    true);
        change.report.notes.push_back("base chosen as the merge base of HEAD and main");
        change.report.skipped.push_back({"logo.png", "binary"});
        change.report.warnings.push_back({"head", "src/crc.c", 3, "unknown type name"});
        change.verdict.notes.push_back("waiver \"legacy\" expired on 2024-01-31");
        change.verdict.policy_changes.push_back("rules.effort-growth.limit: 50 -> 80");
        change.verdict.policy_change_summary = "the change edits its policy";
        change.report.functions[1].head->lexical = true;
        change.report.functions[1].head->measures.n1 = 12;
        change.report.functions[1].head->measures.bugs_effort = 0.057977;
        const std::string written = check_json(change);
        const auto read = parse_check_report(written, "check.json");
        CHECK(read.report.functions == change.report.functions);
        CHECK(read.verdict.findings == change.verdict.findings);
        CHECK(check_json(read) == written);
    }
    SECTION("a working-tree head (commit null) reads as an empty commit") {
        auto change = sample_change({{"f", "a.c", 1, 10, 20}}, false, "");
        const auto read = parse_check_report(check_json(change), "check.json");
        CHECK(read.report.head_commit.empty());
    }
    SECTION("a file that is not JSON is a usage error naming it") {
        CHECK_THROWS_WITH(parse_check_report("<html>", "out/check.json"),
                          "report \"out/check.json\" is not JSON (give the file that \"tollgate "
                          "check --report json:PATH\" wrote)");
    }
    SECTION("another schema is refused") {
        CHECK_THROWS_WITH(parse_check_report(R"({"schema": "tollgate.snapshot/1"})", "s.json"),
                          "report \"s.json\" has schema \"tollgate.snapshot/1\", expected "
                          "\"tollgate.check/1\"");
    }
    SECTION("a missing or mistyped field is named by its path") {
        auto document =
            nlohmann::json::parse(check_json(sample_change({{"f", "a.c", 1, 10, 20}}, true)));
        document["functions"][0]["head"]["line"] = "twelve";
        CHECK_THROWS_WITH(parse_check_report(document.dump(), "c.json"),
                          "report \"c.json\": $.functions[0].head.line should be a count");
        document.erase("verdict");
        CHECK_THROWS_WITH(parse_check_report(document.dump(), "c.json"),
                          "report \"c.json\": $.verdict should be a value");
    }
    SECTION("an unknown outcome lists the known ones") {
        auto document = nlohmann::json::parse(check_json(sample_change({}, false)));
        document["verdict"]["outcome"] = "maybe";
        CHECK_THROWS_WITH(parse_check_report(document.dump(), "c.json"),
                          "report \"c.json\": $.verdict.outcome should be one of \"pass\", "
                          "\"blocked\", \"would-block\"");
    }
    SECTION("an advisory run and a claimed exemption read back as written") {
        auto change = sample_change({{"Kalman::update", "src/filter.cpp", 120, 1000, 18400}}, true);
        REQUIRE_FALSE(change.verdict.findings.empty());
        auto& finding = change.verdict.findings[0];
        finding.exemption = tollgate::policy::ExemptionState::refused;
        finding.exemption_source = tollgate::policy::ExemptionSource::comment;
        finding.exemption_reason = "clamps the sensor range";
        finding.exemption_where = "src/filter.cpp:119";
        tollgate::policy::ClaimedExemption claim;
        claim.source = tollgate::policy::ExemptionSource::comment;
        claim.where = "src/filter.cpp:119";
        claim.function = "Kalman::update";
        claim.path = "src/filter.cpp";
        claim.start_line = 120;
        claim.rules = {finding.rule_id};
        claim.reason = "clamps the sensor range";
        claim.findings = 1;
        change.verdict.exemptions.push_back(claim);
        tollgate::policy::make_advisory(change.verdict);
        const std::string written = check_json(change);
        const auto read = parse_check_report(written, "check.json");
        CHECK(read.verdict.outcome == tollgate::policy::Outcome::would_block);
        CHECK(read.verdict.findings == change.verdict.findings);
        CHECK(read.verdict.exemptions == change.verdict.exemptions);
        CHECK(check_json(read) == written);
    }
}
