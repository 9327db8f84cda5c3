// SPDX-License-Identifier: MIT
// Every changed line is seen: changed lines outside functions in every report, the policy's
// "unmeasured-lines" limit, and how "inactive-code" judges functions of skipped #if branches.
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::run_tollgate;
using tollgate::test::RunResult;
using tollgate::test::TempDir;

namespace {

// A repository with `base` then `head` as the file `path` (and `policy` as .tollgate.yaml in
// both when given); return "--base X --head Y".
std::string scripted(const TempDir& dir, const std::string& path, const std::string& base,
                     const std::string& head, const std::string& policy = "") {
    init_repo(dir.path());
    if (!policy.empty()) {
        dir.write(".tollgate.yaml", policy);
    }
    dir.write(path, base);
    const std::string base_id = commit_all(dir.path(), "base");
    dir.write(path, head);
    const std::string head_id = commit_all(dir.path(), "head");
    return "--base " + base_id + " --head " + head_id + " --no-pch-cache";
}

RunResult check(const TempDir& dir, const std::string& range, const std::string& report) {
    return run_tollgate("check " + range + " --report " + report + ":-", dir.path());
}

const char* const k_config_base = "#include <string.h>\n"
                                  "#define RETRIES 3\n"
                                  "static const char *names[] = { \"a\", \"b\" };\n"
                                  "\n"
                                  "int retries(void) { return RETRIES; }\n";

// Lines 2 and 3 edited, a comment and a blank line added: only the code lines count.
const char* const k_config_head = "#include <string.h>\n"
                                  "#define RETRIES 5\n"
                                  "static const char *names[] = { \"a\", \"b\", \"c\" };\n"
                                  "/* retry policy */\n"
                                  "\n"
                                  "\n"
                                  "int retries(void) { return RETRIES; }\n";

const char* const k_growth_policy = "tollgate-policy: 1\n"
                                    "rules:\n"
                                    "  - id: effort-growth\n"
                                    "    kind: growth\n"
                                    "    measure: effort\n"
                                    "    max-increase-percent: 10\n"
                                    "    level: blocking\n";

const char* const k_probe_base = "#ifdef WITH_PROBE\n"
                                 "int probe(int v) { return v; }\n"
                                 "#endif\n";

const char* const k_probe_head = "#ifdef WITH_PROBE\n"
                                 "int probe(int v) { return v * 2 + (v > 3 ? v - 1 : v + 1); }\n"
                                 "#endif\n";

} // namespace

TEST_CASE("check lists changed lines outside every function in every report", "[check]") {
    TempDir dir;
    const std::string range = scripted(dir, "config.c", k_config_base, k_config_head);
    // git diff -U0 of the two versions: base lines 2-3 became head lines 2-6; of those, head
    // lines 2 and 3 and base lines 2 and 3 hold code (lines 4-6 are a comment and blanks).

    SECTION("JSON: per file, with the ranges of each side") {
        const auto result = check(dir, range, "json");
        REQUIRE(result.exit_code == 0);
        const auto report = nlohmann::json::parse(result.out);
        CHECK(report["functions"].empty());
        CHECK(report["unmeasured_lines"] == 4);
        REQUIRE(report["unmeasured"].size() == 1);
        const auto& file = report["unmeasured"][0];
        CHECK(file["file"] == "config.c");
        CHECK(file["count"] == 4);
        CHECK(file["head_lines"] == nlohmann::json::parse("[[2, 3]]"));
        CHECK(file["base_lines"] == nlohmann::json::parse("[[2, 3]]"));
    }
    SECTION("text: one line per file") {
        const auto result = check(dir, range, "text");
        REQUIRE(result.exit_code == 0);
        CHECK(result.out.find("unmeasured: config.c: 4 changed lines outside functions (head "
                              "lines 2-3; base lines 2-3)\n") != std::string::npos);
    }
    SECTION("Markdown: in the headline and as a folded note") {
        const auto result = check(dir, range, "markdown");
        REQUIRE(result.exit_code == 0);
        CHECK(result.out.find(" · 4 changed C/C++ lines outside functions · ") !=
              std::string::npos);
        CHECK(result.out.find("- unmeasured `config.c`: 4 changed lines outside functions (head "
                              "lines 2-3; base lines 2-3)") != std::string::npos);
    }
    SECTION("SARIF: a note on the file") {
        const auto result = check(dir, range, "sarif");
        REQUIRE(result.exit_code == 0);
        const auto log = nlohmann::json::parse(result.out);
        const auto& results = log["runs"][0]["results"];
        REQUIRE(results.size() == 1);
        CHECK(results[0]["ruleId"] == "unmeasured-lines");
        CHECK(results[0]["level"] == "note");
        CHECK(results[0]["locations"][0]["physicalLocation"]["region"]["startLine"] == 2);
    }
}

TEST_CASE("check counts no line for a comment-only edit outside functions", "[check]") {
    TempDir dir;
    const std::string range = scripted(dir, "note.c", "/* one */\nint f(void) { return 1; }\n",
                                       "/* one, and\n   two */\n\nint f(void) { return 1; }\n");
    const auto result = check(dir, range, "json");
    REQUIRE(result.exit_code == 0);
    const auto report = nlohmann::json::parse(result.out);
    CHECK(report["unmeasured_lines"] == 0);
    CHECK(report["unmeasured"].empty());
}

TEST_CASE("check judges unmeasured lines against the policy's limit", "[check][policy]") {
    TempDir dir;
    SECTION("a blocking limit blocks the change") {
        const std::string range =
            scripted(dir, "config.c", k_config_base, k_config_head,
                     "tollgate-policy: 1\nunmeasured-lines: {limit: 3, level: blocking}\n");
        const auto result = check(dir, range, "json");
        CHECK(result.exit_code == 1);
        const auto findings = nlohmann::json::parse(result.out)["verdict"]["findings"];
        REQUIRE(findings.size() == 1);
        CHECK(findings[0]["rule"] == "unmeasured-lines");
        CHECK(findings[0]["kind"] == "unmeasured-lines");
        CHECK(findings[0]["measure"].is_null());
        CHECK(findings[0]["value"] == 4);
        CHECK(findings[0]["message"] ==
              "the change: 4 changed C/C++ lines outside every measured function (config.c 4) "
              "exceed the limit 3 by 1 (policy \"unmeasured-lines\", blocking)");
    }
    SECTION("a warning level passes with the finding") {
        const std::string range =
            scripted(dir, "config.c", k_config_base, k_config_head,
                     "tollgate-policy: 1\nunmeasured-lines: {limit: 3, level: warning}\n");
        const auto result = check(dir, range, "json");
        CHECK(result.exit_code == 0);
        CHECK(nlohmann::json::parse(result.out)["verdict"]["findings"].size() == 1);
    }
    SECTION("within the limit there is no finding") {
        const std::string range =
            scripted(dir, "config.c", k_config_base, k_config_head,
                     "tollgate-policy: 1\nunmeasured-lines: {limit: 4, level: blocking}\n");
        const auto result = check(dir, range, "json");
        CHECK(result.exit_code == 0);
        CHECK(nlohmann::json::parse(result.out)["verdict"]["findings"].empty());
    }
}

TEST_CASE("check judges a function of a skipped #if branch as the policy says", "[check][policy]") {
    TempDir dir;
    SECTION("by default like any other function, marked in every report") {
        const std::string range =
            scripted(dir, "probe.c", k_probe_base, k_probe_head, k_growth_policy);
        const auto json_result = check(dir, range, "json");
        CHECK(json_result.exit_code == 1);
        const auto report = nlohmann::json::parse(json_result.out);
        REQUIRE(report["functions"].size() == 1);
        CHECK(report["functions"][0]["label"] == "changed");
        CHECK(report["functions"][0]["head"]["marks"] == nlohmann::json::array({"inactive"}));
        const auto text = check(dir, range, "text");
        CHECK(text.out.find("probe [inactive]") != std::string::npos);
        const auto markdown = check(dir, range, "markdown");
        CHECK(markdown.out.find("`probe` (inactive) at ") != std::string::npos);
        const auto sarif = nlohmann::json::parse(check(dir, range, "sarif").out);
        CHECK(sarif["runs"][0]["results"][0]["properties"]["marks"] ==
              nlohmann::json::array({"inactive"}));
    }
    SECTION("warn: its findings do not block") {
        const std::string range = scripted(dir, "probe.c", k_probe_base, k_probe_head,
                                           std::string(k_growth_policy) + "inactive-code: warn\n");
        const auto result = check(dir, range, "json");
        CHECK(result.exit_code == 0);
        const auto findings = nlohmann::json::parse(result.out)["verdict"]["findings"];
        REQUIRE(findings.size() == 1);
        CHECK(findings[0]["level"] == "warning");
    }
    SECTION("skip: not judged, and a note says so") {
        const std::string range = scripted(dir, "probe.c", k_probe_base, k_probe_head,
                                           std::string(k_growth_policy) + "inactive-code: skip\n");
        const auto result = check(dir, range, "json");
        CHECK(result.exit_code == 0);
        const auto verdict = nlohmann::json::parse(result.out)["verdict"];
        CHECK(verdict["findings"].empty());
        CHECK(verdict["notes"][0] == "1 function is in #if branches the preprocessor skipped and "
                                     "not judged (policy: inactive-code: skip)");
    }
}
