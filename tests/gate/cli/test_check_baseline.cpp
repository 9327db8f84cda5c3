// SPDX-License-Identifier: MIT
// `tollgate check` with a baseline snapshot: reuse of the base's measures, grandfathering, and
// --update-baseline; real temp repositories and the real binary.
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <nlohmann/json.hpp>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_tollgate;
using tollgate::test::TempDir;

namespace {

// A function whose difficulty is already high in the base: D = (n1/2)(N2/n2) grows with
// repeated operands.
const char* const k_hard_base = "int knot(int a, int b) {\n"
                                "    return a * b + a * b - a / b + b % a + a * a * b;\n"
                                "}\n";
// The same function with one more token: difficulty grows a little (harder than the base).
const char* const k_hard_worse = "int knot(int a, int b) {\n"
                                 "    return a * b + a * b - a / b + b % a + a * a * b * b;\n"
                                 "}\n";
// The same tokens, reformatted: touched by the diff, no worse.
const char* const k_hard_same = "int knot(int a, int b) {\n"
                                "    return a * b + a * b - a / b\n"
                                "        + b % a + a * a * b;\n"
                                "}\n";

std::string policy_text(bool grandfather) {
    return std::string("tollgate-policy: 1\n"
                       "rules:\n"
                       "  - id: hard-to-read\n"
                       "    kind: ceiling\n"
                       "    measure: difficulty\n"
                       "    ceiling: 5\n"
                       "    level: blocking\n"
                       "baseline:\n"
                       "  path: baselines/snapshot.json\n"
                       "  grandfather: ") +
           (grandfather ? "true\n" : "false\n");
}

struct History {
    std::string base;
    std::string head;
};

// Commit `base_text` with the policy, snapshot it into baselines/, then commit `head_text`.
History history_with_baseline(const TempDir& dir, bool grandfather, const std::string& head_text) {
    init_repo(dir.path());
    dir.write(".tollgate.yaml", policy_text(grandfather));
    dir.write("knot.c", k_hard_base);
    History h;
    h.base = commit_all(dir.path(), "base");
    const auto snap = run_tollgate("snapshot --no-pch-cache", dir.path());
    REQUIRE(snap.exit_code == 0);
    dir.write("knot.c", head_text);
    h.head = commit_all(dir.path(), "head"); // commits the snapshot too; it is not C/C++
    return h;
}

} // namespace

TEST_CASE("check takes the base's measures from a snapshot of the base commit",
          "[check][baseline]") {
    TempDir dir;
    const auto h = history_with_baseline(dir, true, k_hard_worse);
    const std::string range = " --base " + h.base + " --head " + h.head + " --report json:-";
    const auto with = run_tollgate("check --no-pch-cache" + range, dir.path());
    const auto without = run_tollgate(
        "check --no-pch-cache --baseline /nonexistent/snapshot.json" + range, dir.path());
    REQUIRE(with.exit_code == 1);
    const auto report = nlohmann::json::parse(with.out);
    bool reused = false;
    for (const auto& note : report["notes"]) {
        reused = reused || note.get<std::string>().find("base-side measures come from the "
                                                        "baseline snapshot") != std::string::npos;
    }
    CHECK(reused);
    // The explicit missing baseline is an error, not a silent fallback.
    CHECK(without.exit_code == 2);
    // Re-parsing the base gives the same measures as the snapshot: compare with no baseline.
    TempDir plain_policy;
    plain_policy.write("p.yaml", "tollgate-policy: 1\nrules: []\n");
    const auto reparsed = run_tollgate(
        "check --no-pch-cache --policy " + plain_policy.path() + "/p.yaml" + range, dir.path());
    REQUIRE(reparsed.exit_code == 0);
    const auto reference = nlohmann::json::parse(reparsed.out);
    REQUIRE(report["functions"].size() == 1);
    CHECK(report["functions"][0]["base"]["measures"] ==
          reference["functions"][0]["base"]["measures"]);
}

TEST_CASE("check grandfathers a function already above a ceiling in the baseline",
          "[check][baseline]") {
    SECTION("no worse than the baseline: reported, not blocking") {
        TempDir dir;
        const auto h = history_with_baseline(dir, true, k_hard_same);
        const auto result = run_tollgate(
            "check --no-pch-cache --no-color --base " + h.base + " --head " + h.head, dir.path());
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("grandfathered: the baseline has") != std::string::npos);
    }
    SECTION("worse than the baseline: blocking") {
        TempDir dir;
        const auto h = history_with_baseline(dir, true, k_hard_worse);
        const auto result = run_tollgate(
            "check --no-pch-cache --no-color --base " + h.base + " --head " + h.head, dir.path());
        CHECK(result.exit_code == 1);
    }
    SECTION("grandfathering turned off in the policy: blocking even when no worse") {
        TempDir dir;
        const auto h = history_with_baseline(dir, false, k_hard_same);
        const auto result = run_tollgate(
            "check --no-pch-cache --no-color --base " + h.base + " --head " + h.head, dir.path());
        CHECK(result.exit_code == 1);
        CHECK(result.out.find("grandfathered") == std::string::npos);
    }
}

TEST_CASE("check --update-baseline writes the head's snapshot only after a passing run",
          "[check][baseline]") {
    TempDir dir;
    const auto h = history_with_baseline(dir, true, k_hard_same);
    const std::string path = dir.path() + "/baselines/snapshot.json";
    const std::string before = read_text(path);
    REQUIRE(nlohmann::json::parse(before)["commit"] == h.base);

    SECTION("a passing change updates it to the head commit") {
        const auto result = run_tollgate("check --no-pch-cache --update-baseline --base " + h.base +
                                             " --head " + h.head,
                                         dir.path());
        REQUIRE(result.exit_code == 0);
        CHECK(nlohmann::json::parse(read_text(path))["commit"] == h.head);
        CHECK(result.err.find("tollgate: baseline updated:") != std::string::npos);
    }
    SECTION("a blocked change leaves it alone") {
        dir.write("knot.c", k_hard_worse);
        const std::string worse = commit_all(dir.path(), "worse");
        const auto result = run_tollgate("check --no-pch-cache --update-baseline --base " + h.base +
                                             " --head " + worse,
                                         dir.path());
        CHECK(result.exit_code == 1);
        CHECK(read_text(path) == before);
        CHECK(result.err.find("the baseline was not updated") != std::string::npos);
    }
}
