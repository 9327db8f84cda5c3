// SPDX-License-Identifier: MIT
// write_sarif: the log validates against the OASIS SARIF 2.1.0 schema (checked with Debian's
// python3-jsonschema, a general-purpose validator) and carries one result per finding.
#include "../policy/policy_test_support.hpp"
#include "gate/policy/judge.hpp"
#include "gate/report/sarif.hpp"
#include "hostile_report.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

using namespace tollgate;
using namespace tollgate::test;

namespace {

// Return the SARIF schema: the copy in tests/fixtures/standards, else the shared folder beside
// the repository; empty when neither exists.
std::string schema_path() {
    namespace fs = std::filesystem;
    for (const fs::path& candidate :
         {fs::path(TOLLGATE_FIXTURES_DIR) / "standards" / "sarif-schema-2.1.0.json",
          fs::path(TOLLGATE_SOURCE_DIR) / ".." / "shared" / "standards" /
              "sarif-schema-2.1.0.json"}) {
        if (fs::exists(candidate)) {
            return candidate.string();
        }
    }
    return {};
}

struct Judged {
    delta::ChangeReport report;
    policy::Policy policy;
    policy::Verdict verdict;
};

Judged judged_change() {
    Judged j;
    j.report = report_of(
        {changed("Kalman::update", "src/filter file.cpp", 120, small_measures(), large_measures()),
         added("fresh", "src/a.c", 5, large_measures())});
    j.policy = policy::load_policy(R"(tollgate-policy: 1
rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 40}
  - {id: new-function-volume, kind: added-ceiling, measure: volume, ceiling: 200, level: warning}
  - {id: change-effort-budget, kind: budget, measure: effort, max-total-increase: 1000}
)",
                                   "sarif.yaml");
    policy::JudgeOptions options;
    options.today = "2026-05-01";
    j.verdict = policy::judge(j.policy, j.report, options);
    return j;
}

} // namespace

TEST_CASE("write_sarif writes one result per finding", "[sarif]") {
    const Judged j = judged_change();
    REQUIRE(j.verdict.findings.size() == 3);
    std::ostringstream out;
    report::write_sarif(out, j.report, j.verdict, j.policy);
    const auto log = nlohmann::json::parse(out.str());
    CHECK(log["version"] == "2.1.0");
    const auto& run = log["runs"][0];
    CHECK(run["tool"]["driver"]["name"] == "tollgate");
    CHECK(run["tool"]["driver"]["rules"].size() == 3);
    CHECK(run["tool"]["driver"]["rules"][1]["defaultConfiguration"]["level"] == "warning");
    CHECK(run["tool"]["driver"]["rules"][0]["fullDescription"]["text"] ==
          "A changed or moved function's effort may grow by at most +40%.");
    const auto& results = run["results"];
    REQUIRE(results.size() == 3);
    CHECK(results[0]["ruleId"] == "effort-growth");
    CHECK(results[0]["level"] == "error");
    CHECK(results[0]["ruleIndex"] == 0);
    CHECK(results[0]["message"]["text"] == j.verdict.findings[0].message);
    const auto& location = results[0]["locations"][0]["physicalLocation"];
    CHECK(location["artifactLocation"]["uri"] == "src/filter%20file.cpp");
    CHECK(location["artifactLocation"]["uriBaseId"] == "SRCROOT");
    CHECK(location["region"]["startLine"] == 120);
    CHECK(location["region"]["endLine"] == 139);
    // The budget finding is anchored on the function whose effort grew most.
    CHECK(results[1]["ruleId"] == "change-effort-budget");
    // (the added function's 0 -> 3,072 beats Kalman::update's +2,304).
    CHECK(results[1]["locations"][0]["physicalLocation"]["artifactLocation"]["uri"] == "src/a.c");
    CHECK(results[1]["locations"][0]["physicalLocation"]["region"]["startLine"] == 5);
    CHECK(results[2]["level"] == "warning");
}

TEST_CASE("write_sarif output validates against the OASIS SARIF 2.1.0 schema", "[sarif]") {
    const std::string schema = schema_path();
    if (schema.empty()) {
        WARN("SARIF schema not found: validation skipped");
        return;
    }
    const auto python = run_command("python3 -c 'import jsonschema'", ".");
    if (python.exit_code != 0) {
        WARN("python3-jsonschema is not installed: validation skipped");
        return;
    }
    TempDir dir;
    const auto validate = [&](const std::string& name, const Judged& j) {
        const std::string file = dir.path() + "/" + name;
        {
            std::ofstream out(file);
            report::write_sarif(out, j.report, j.verdict, j.policy);
        }
        const auto result =
            run_command("python3 -c 'import json,sys,jsonschema; "
                        "jsonschema.Draft4Validator(json.load(open(sys.argv[1]))).validate("
                        "json.load(open(sys.argv[2])))' " +
                            shell_quote(schema) + " " + shell_quote(file),
                        dir.path());
        INFO(result.err);
        CHECK(result.exit_code == 0);
    };
    SECTION("a log with findings") {
        validate("findings.sarif", judged_change());
    }
    SECTION("a log without findings") {
        Judged j;
        j.policy = policy::default_policy();
        policy::JudgeOptions options;
        options.today = "2026-05-01";
        j.verdict = policy::judge(j.policy, j.report, options);
        validate("empty.sarif", j);
    }
    SECTION("the validator rejects a broken log, so the check can fail") {
        TempDir broken;
        broken.write("bad.sarif", R"({"version": "2.1.0", "runs": [{"tool": {}}]})");
        const auto result =
            run_command("python3 -c 'import json,sys,jsonschema; "
                        "jsonschema.Draft4Validator(json.load(open(sys.argv[1]))).validate("
                        "json.load(open(sys.argv[2])))' " +
                            shell_quote(schema) + " bad.sarif",
                        broken.path());
        CHECK(result.exit_code != 0);
    }
}

TEST_CASE("path_to_uri percent-encodes a path", "[sarif]") {
    CHECK(report::path_to_uri("src/my file#1.c") == "src/my%20file%231.c");
    CHECK(report::path_to_uri("a-b_c.~/d.cpp") == "a-b_c.~/d.cpp");
}

TEST_CASE("write_sarif writes hostile text as a valid log", "[sarif]") {
    const auto hostile = hostile_change();
    Judged j{hostile.report, hostile.policy, hostile.verdict};
    REQUIRE(j.verdict.findings.size() > 3);
    std::ostringstream out;
    // Before: nlohmann's dump threw type_error 316 at the first Latin-1 byte.
    REQUIRE_NOTHROW(report::write_sarif(out, j.report, j.verdict, j.policy));
    const auto log = nlohmann::json::parse(out.str());
    // Locations stay exact: the URI keeps every byte, percent-encoded.
    bool latin1 = false;
    for (const auto& result : log["runs"][0]["results"]) {
        for (const auto& location : result["locations"]) {
            latin1 =
                latin1 || location["physicalLocation"]["artifactLocation"]["uri"] == "src/caf%E9.c";
        }
    }
    CHECK(latin1);
    const std::string schema = schema_path();
    if (schema.empty() || run_command("python3 -c 'import jsonschema'", ".").exit_code != 0) {
        WARN("the SARIF schema or python3-jsonschema is missing: validation skipped");
        return;
    }
    TempDir dir;
    dir.write("hostile.sarif", out.str());
    const auto result =
        run_command("python3 -c 'import json,sys,jsonschema; "
                    "jsonschema.Draft4Validator(json.load(open(sys.argv[1]))).validate("
                    "json.load(open(sys.argv[2])))' " +
                        shell_quote(schema) + " hostile.sarif",
                    dir.path());
    INFO(result.err);
    CHECK(result.exit_code == 0);
}
