// SPDX-License-Identifier: MIT
// `tollgate check` on functions that grow from an effort of zero (an empty body), under the
// built-in policy and each ready policy: real temp repositories and the real binary.
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_tollgate;
using tollgate::test::TempDir;

namespace {

// Two empty functions: no operand, so n2 = 0 and D = E = 0 (core/README.md: D = 0 for n2 = 0).
const char* const k_base = "int g_a, g_b, g_c;\n"
                           "void small_stub(void) {}\n"
                           "void large_stub(void) {}\n";

// The same two, filled in: small_stub reaches an effort of about 5,000 (volume about 200, above
// every ready policy's noise floor, and growth below every absolute limit), large_stub about
// 660,000 (above every absolute limit).
std::string head_text() {
    std::string text = "int g_a, g_b, g_c;\n"
                       "void small_stub(void) {\n"
                       "    int x = g_a * g_b + g_c;\n"
                       "    int y = x - g_a / g_b;\n"
                       "    if (x > y) { x = y * g_c; }\n"
                       "    g_a = x + y;\n"
                       "}\n"
                       "void large_stub(void) {\n"
                       "    int x = 0, y = 1, z = 2;\n";
    for (int i = 0; i < 24; ++i) {
        const std::string n = std::to_string(i);
        text += "    x = x * g_a + y / (g_b + " + n + ") - z % (g_c + " + n + ");\n";
        text += "    if (x > y + " + n + ") { y = y + x * g_c; } else { z = z - x; }\n";
    }
    return text + "    g_a = x + y + z;\n}\n";
}

struct Outcome {
    int exit_code = -1;
    nlohmann::json report; // check's JSON report
};

// Commit the empty functions (with `policy_file` as .tollgate.yaml unless empty), then their
// filled-in versions, and check the second commit against the first.
Outcome check_growth(const std::string& policy_file) {
    TempDir dir;
    init_repo(dir.path());
    if (!policy_file.empty()) {
        dir.write(".tollgate.yaml",
                  read_text(std::string(TOLLGATE_SOURCE_DIR) + "/policies/" + policy_file));
    }
    dir.write("src/stub.c", k_base);
    const std::string base = commit_all(dir.path(), "empty stubs");
    dir.write("src/stub.c", head_text());
    const std::string head = commit_all(dir.path(), "stubs filled in");
    const auto result = run_tollgate(
        "check --no-pch-cache --report json:- --base " + base + " --head " + head, dir.path());
    INFO(result.err);
    Outcome outcome;
    outcome.exit_code = result.exit_code;
    outcome.report = nlohmann::json::parse(result.out);
    return outcome;
}

// Return the first finding of `rule` on `function`, or null.
nlohmann::json finding(const Outcome& outcome, const std::string& rule,
                       const std::string& function) {
    for (const auto& f : outcome.report["verdict"]["findings"]) {
        if (f["rule"] == rule && f["function"] == function) {
            return f;
        }
    }
    return nullptr;
}

bool from_zero(const nlohmann::json& f) {
    return f.is_object() && f["message"].get<std::string>().find(
                                "which allows no growth from a zero base") != std::string::npos;
}

} // namespace

TEST_CASE("check blocks an empty function that grows, under the built-in and ready policies",
          "[check][policy]") {
    SECTION("the built-in policy: its percent limit blocks both") {
        const Outcome outcome = check_growth("");
        CHECK(outcome.exit_code == 1);
        CHECK(from_zero(finding(outcome, "effort-growth", "small_stub")));
        CHECK(from_zero(finding(outcome, "effort-growth", "large_stub")));
        CHECK(finding(outcome, "effort-growth", "large_stub")["level"] == "blocking");
    }
    SECTION("starter.yaml: its percent limit would block the growth its absolute limit allows") {
        // The starter policy starts advisory: what would block is reported, the change passes.
        const Outcome outcome = check_growth("starter.yaml");
        CHECK(outcome.exit_code == 0);
        CHECK(outcome.report["verdict"]["outcome"] == "would-block");
        CHECK(finding(outcome, "effort-growth", "small_stub")["would_block"] == true);
        CHECK(from_zero(finding(outcome, "effort-growth", "small_stub")));
        CHECK(from_zero(finding(outcome, "effort-growth", "large_stub")));
    }
    SECTION("strict.yaml: its percent limit blocks the growth its absolute limit allows") {
        const Outcome outcome = check_growth("strict.yaml");
        CHECK(outcome.exit_code == 1);
        CHECK(from_zero(finding(outcome, "effort-growth", "small_stub")));
        CHECK(finding(outcome, "effort-growth", "small_stub")["level"] == "blocking");
        // The volume of an empty function is not zero (V = N log2 n = 10): an ordinary percent.
        CHECK_FALSE(from_zero(finding(outcome, "volume-growth", "small_stub")));
    }
    SECTION("legacy.yaml: the absolute limit blocks the large one, the percent rule warns") {
        const Outcome outcome = check_growth("legacy.yaml");
        CHECK(outcome.exit_code == 1);
        CHECK(finding(outcome, "effort-growth", "large_stub")["level"] == "blocking");
        CHECK(finding(outcome, "effort-growth", "small_stub") == nullptr);
        const auto warned = finding(outcome, "effort-growth-percent", "small_stub");
        CHECK(from_zero(warned));
        CHECK(warned["level"] == "warning");
    }
}
