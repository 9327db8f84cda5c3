// SPDX-License-Identifier: MIT
// `tollgate check` with a baseline snapshot: where a trusted snapshot comes from (the pipeline's
// --baseline file, or baseline.path in the base commit), the check of a snapshot of the base
// against the parsed base, tolerating existing findings, and --update-baseline; real temp
// repositories and the real binary.
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <cstdint>
#include <fmt/format.h>
#include <fstream>
#include <nlohmann/json.hpp>

using tollgate::test::commit_all;
using tollgate::test::git;
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
// A large growth of knot: its effort grows far past +50%.
const char* const k_hard_bloated =
    "int knot(int a, int b) {\n"
    "    int c = a * b + a * b - a / b + b % a + a * a * b;\n"
    "    for (int i = 0; i < a; ++i) { c = c * i + b - (c % (i + 1)) * a; }\n"
    "    while (c > b) { c = c / 2 - a + (b << 1) - (c & a); if (c == a) break; }\n"
    "    return c > 0 ? c * a - b : c + b * a;\n"
    "}\n";

const char* const k_ceiling_rule = "  - id: hard-to-read\n"
                                   "    kind: ceiling\n"
                                   "    measure: difficulty\n"
                                   "    ceiling: 5\n"
                                   "    level: blocking\n";
const char* const k_growth_rule = "  - id: effort-growth\n"
                                  "    kind: growth\n"
                                  "    measure: effort\n"
                                  "    max-increase-percent: 50\n"
                                  "    level: blocking\n";

std::string policy_text(const std::string& rules, bool tolerate) {
    return "tollgate-policy: 1\nrules:\n" + rules +
           "baseline:\n  path: baselines/snapshot.json\n  tolerate-existing: " +
           (tolerate ? "true\n" : "false\n");
}

// The same FNV-1a digest a snapshot carries (gate/baseline/README.md): anyone can recompute it.
std::string digest_of(nlohmann::ordered_json document) {
    document.erase("created");
    document.erase("content_digest");
    std::uint64_t hash = 0xcbf29ce484222325ull;
    for (const unsigned char c :
         document.dump(-1, ' ', false, nlohmann::ordered_json::error_handler_t::replace)) {
        hash ^= c;
        hash *= 0x100000001b3ull;
    }
    return fmt::format("fnv1a64:{:016x}", hash);
}

// Return `snapshot` relabelled as a snapshot of `commit`, its digest recomputed: the forgery of
// the issue, a snapshot of the head that says it is of the base.
std::string relabel(const std::string& snapshot, const std::string& commit) {
    auto document = nlohmann::ordered_json::parse(snapshot);
    document["commit"] = commit;
    document["content_digest"] = digest_of(document);
    return document.dump(2) + "\n";
}

struct History {
    std::string base;
    std::string head;
};

// Commit the policy and `base_text` as knot.c, then `head_text`.
History two_commits(const TempDir& dir, const std::string& policy, const std::string& base_text,
                    const std::string& head_text) {
    init_repo(dir.path());
    dir.write(".tollgate.yaml", policy);
    dir.write("knot.c", base_text);
    History h;
    h.base = commit_all(dir.path(), "base");
    dir.write("knot.c", head_text);
    h.head = commit_all(dir.path(), "head");
    return h;
}

// Write the snapshot of `rev` to `out` (outside the repository: the pipeline's cache).
void snapshot_to(const TempDir& dir, const std::string& rev, const std::string& out) {
    const auto result =
        run_tollgate("snapshot --no-pch-cache --rev " + rev + " --out " + out, dir.path());
    REQUIRE(result.exit_code == 0);
}

bool has_note(const nlohmann::json& report, const std::string& part) {
    for (const auto& note : report["notes"]) {
        if (note.get<std::string>().find(part) != std::string::npos) {
            return true;
        }
    }
    return false;
}

std::string range_of(const History& h) {
    return " --base " + h.base + " --head " + h.head + " --report json:-";
}

} // namespace

TEST_CASE("check compares a snapshot of the base commit with the parsed base",
          "[check][baseline]") {
    TempDir dir, cache;
    const auto h = two_commits(dir, policy_text(k_growth_rule, false), k_hard_base, k_hard_bloated);
    snapshot_to(dir, h.base, cache.path() + "/snapshot.json");

    SECTION("an honest snapshot agrees, and the verdict is the parsed base's") {
        const auto with = run_tollgate("check --no-pch-cache --baseline " + cache.path() +
                                           "/snapshot.json" + range_of(h),
                                       dir.path());
        REQUIRE(with.exit_code == 1);
        const auto report = nlohmann::json::parse(with.out);
        CHECK(has_note(report, "is of the base " + h.base.substr(0, 7) +
                                   " and agrees with the parsed base on every touched function "
                                   "(1 compared)"));
        const auto without = run_tollgate("check --no-pch-cache" + range_of(h), dir.path());
        REQUIRE(without.exit_code == 1);
        CHECK(report["functions"] == nlohmann::json::parse(without.out)["functions"]);
    }
    SECTION("an explicit baseline that does not exist is an error, not a silent fallback") {
        const auto missing = run_tollgate(
            "check --no-pch-cache --baseline /nonexistent/snapshot.json" + range_of(h), dir.path());
        CHECK(missing.exit_code == 2);
    }
}

TEST_CASE("check never takes a change's own snapshot as its base", "[check][baseline]") {
    // The forgery: the head's snapshot relabelled as the base's. Before the fix each of
    // these passed, the bloated function reported "unchanged".
    TempDir dir, cache;
    init_repo(dir.path());
    dir.write(".tollgate.yaml", policy_text(k_growth_rule, false));
    dir.write("knot.c", k_hard_base);
    const std::string base = commit_all(dir.path(), "base");
    dir.write("knot.c", k_hard_bloated);
    const std::string bloated = commit_all(dir.path(), "bloat");
    snapshot_to(dir, bloated, cache.path() + "/head.json");
    const std::string forged = relabel(read_text(cache.path() + "/head.json"), base);
    dir.write("baselines/snapshot.json", forged);
    const std::string head = commit_all(dir.path(), "bloat, with a baseline of my own");
    const std::string range = " --base " + base + " --head " + head + " --report json:-";

    SECTION("the policy's baseline.path is read from the base commit, not the head or checkout") {
        const auto result = run_tollgate("check --no-pch-cache" + range, dir.path());
        CHECK(result.exit_code == 1);
        const auto report = nlohmann::json::parse(result.out);
        CHECK(has_note(report, "no baseline snapshot at baselines/snapshot.json in the base "
                               "commit " +
                                   base.substr(0, 7)));
        CHECK(report["functions"][0]["label"] == "changed");
    }
    SECTION("a --baseline file that the head commit wrote into the checkout is not used") {
        // Where a pipeline restores its cache, when the cache was empty.
        const auto result = run_tollgate(
            "check --no-pch-cache --baseline baselines/snapshot.json" + range, dir.path());
        CHECK(result.exit_code == 1);
        CHECK(has_note(nlohmann::json::parse(result.out),
                       "the baseline snapshot baselines/snapshot.json is not used: it is the file "
                       "baselines/snapshot.json as the head commit " +
                           head.substr(0, 7) +
                           " adds or changes it, and a change cannot bring its own baseline (the "
                           "base was parsed)"));
    }
    SECTION("a forged --baseline from elsewhere disagrees with the parsed base and is not used") {
        // A poisoned cache: the pipeline trusts the file, the spot-check does not.
        cache.write("forged.json", forged);
        const std::string path = cache.path() + "/forged.json";
        const auto result =
            run_tollgate("check --no-pch-cache --baseline " + path + range, dir.path());
        CHECK(result.exit_code == 1);
        const std::string expected_start =
            "the baseline snapshot " + path + " disagrees with the parsed base " +
            base.substr(0, 7) +
            " on 1 of 1 touched functions and is not used, "
            "neither for the base nor for tolerating existing findings: knot.c:1: "
            "knot(int, int): the snapshot has unchanged, n1 ";
        CHECK(result.err.rfind("tollgate: warning: " + expected_start, 0) == 0);
        CHECK(result.err.find("; the base parses to changed, n1 ") != std::string::npos);
        CHECK(result.err.find("(rebuild it: tollgate snapshot --rev " + base.substr(0, 7) +
                              " --out " + path + ")") != std::string::npos);
        CHECK(has_note(nlohmann::json::parse(result.out), expected_start));
    }
    SECTION("a snapshot whose measures do not follow from its counts is refused") {
        auto document = nlohmann::ordered_json::parse(forged);
        document["functions"][0]["measures"]["effort"] = 1.0e9;
        document["content_digest"] = digest_of(document);
        cache.write("edited.json", document.dump(2) + "\n");
        const auto result = run_tollgate(
            "check --no-pch-cache --baseline " + cache.path() + "/edited.json" + range, dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err.find("/functions/0/measures/effort: 1000000000 does not follow from the "
                              "function's counts (n1 ") != std::string::npos);
    }
}

TEST_CASE("check says when its snapshot is of another commit than the base", "[check][baseline]") {
    TempDir dir, cache;
    const auto h = two_commits(dir, policy_text(k_growth_rule, false), k_hard_base, k_hard_same);
    snapshot_to(dir, h.head, cache.path() + "/snapshot.json");
    const auto result = run_tollgate("check --no-pch-cache --baseline " + cache.path() +
                                         "/snapshot.json" + range_of(h),
                                     dir.path());
    CHECK(result.exit_code == 0);
    CHECK(has_note(nlohmann::json::parse(result.out),
                   "the baseline snapshot " + cache.path() + "/snapshot.json is of commit " +
                       h.head.substr(0, 7) + ", not the base " + h.base.substr(0, 7) +
                       ": the base was parsed"));
}

namespace {

// Commit knot.c (hard) with the policy, snapshot it into baselines/ and commit the snapshot (the
// base then holds a snapshot of its parent, as on a main branch), then commit `head_text`.
History history_with_committed_baseline(const TempDir& dir, bool tolerate,
                                        const std::string& head_text) {
    init_repo(dir.path());
    dir.write(".tollgate.yaml", policy_text(k_ceiling_rule, tolerate));
    dir.write("knot.c", k_hard_base);
    commit_all(dir.path(), "knot");
    REQUIRE(run_tollgate("snapshot --no-pch-cache", dir.path()).exit_code == 0);
    History h;
    h.base = commit_all(dir.path(), "baseline snapshot");
    dir.write("knot.c", head_text);
    h.head = commit_all(dir.path(), "head");
    return h;
}

} // namespace

TEST_CASE("check parses the base when the base commit's snapshot is stale", "[check][baseline]") {
    // A tool upgrade (a new convention) or another --stroud leaves every committed snapshot
    // stale: the gate must still judge the change, not stop the pipeline.
    TempDir dir;
    const auto h = history_with_committed_baseline(dir, true, k_hard_worse);
    const auto result = run_tollgate("check --no-pch-cache --no-color --stroud 5 --base " + h.base +
                                         " --head " + h.head,
                                     dir.path());
    INFO(result.out << result.err);
    CHECK(result.exit_code == 1); // judged on the parsed base: the ceiling blocks, unexcused
    CHECK(result.err.find("tollgate: warning: the baseline snapshot baselines/snapshot.json at "
                          "base " +
                          h.base.substr(0, 7) +
                          " is not used: it was measured with Stroud number 18, this run uses 5; "
                          "the base was parsed") != std::string::npos);
    CHECK(result.out.find("tolerated") == std::string::npos);
}

TEST_CASE("check tolerates a function already above a ceiling in a trusted baseline",
          "[check][baseline]") {
    SECTION("no worse than the base commit's snapshot: reported, not blocking") {
        TempDir dir;
        const auto h = history_with_committed_baseline(dir, true, k_hard_same);
        const auto result = run_tollgate(
            "check --no-pch-cache --no-color --base " + h.base + " --head " + h.head, dir.path());
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("tolerated: the baseline has") != std::string::npos);
    }
    SECTION("worse than the baseline: blocking") {
        TempDir dir;
        const auto h = history_with_committed_baseline(dir, true, k_hard_worse);
        const auto result = run_tollgate(
            "check --no-pch-cache --no-color --base " + h.base + " --head " + h.head, dir.path());
        CHECK(result.exit_code == 1);
    }
    SECTION("tolerate-existing turned off in the policy: blocking even when no worse") {
        TempDir dir;
        const auto h = history_with_committed_baseline(dir, false, k_hard_same);
        const auto result = run_tollgate(
            "check --no-pch-cache --no-color --base " + h.base + " --head " + h.head, dir.path());
        CHECK(result.exit_code == 1);
        CHECK(result.out.find("tolerated") == std::string::npos);
    }
    SECTION("a bare repository reads it from the base commit too") {
        TempDir dir, bare;
        const auto h = history_with_committed_baseline(dir, true, k_hard_same);
        git("clone -q --bare " + dir.path() + " " + bare.path() + "/repo.git", dir.path());
        const auto result =
            run_tollgate("check --no-pch-cache --no-color --base " + h.base + " --head " + h.head,
                         bare.path() + "/repo.git");
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("tolerated: the baseline has") != std::string::npos);
    }
    SECTION("a snapshot the change adds tolerates nothing") {
        TempDir dir;
        init_repo(dir.path());
        dir.write(".tollgate.yaml", policy_text(k_ceiling_rule, true));
        dir.write("knot.c", k_hard_base);
        const std::string base = commit_all(dir.path(), "knot");
        REQUIRE(run_tollgate("snapshot --no-pch-cache", dir.path()).exit_code == 0);
        dir.write("knot.c", k_hard_same);
        const std::string head = commit_all(dir.path(), "head with its own baseline");
        const auto result = run_tollgate(
            "check --no-pch-cache --no-color --base " + base + " --head " + head, dir.path());
        CHECK(result.exit_code == 1);
        CHECK(result.out.find("tolerated") == std::string::npos);
    }
}

TEST_CASE("check --update-baseline writes the head's snapshot only after a passing run",
          "[check][baseline]") {
    TempDir dir;
    const auto h = two_commits(dir, policy_text(k_growth_rule, false), k_hard_base, k_hard_same);
    const std::string path = dir.path() + "/baselines/snapshot.json";

    SECTION("a passing change writes it, and a later check does not read it from the checkout") {
        const auto result = run_tollgate("check --no-pch-cache --update-baseline --base " + h.base +
                                             " --head " + h.head,
                                         dir.path());
        REQUIRE(result.exit_code == 0);
        CHECK(nlohmann::json::parse(read_text(path))["commit"] == h.head);
        CHECK(result.err.find("tollgate: baseline updated:") != std::string::npos);
        // The written snapshot is of h.head; a check with h.head as its base parses the base.
        dir.write("knot.c", k_hard_bloated);
        git("add knot.c", dir.path());
        git("commit -q -m next", dir.path());
        const auto next =
            run_tollgate("check --no-pch-cache --report json:- --base " + h.head, dir.path());
        CHECK(next.exit_code == 1);
        CHECK(has_note(nlohmann::json::parse(next.out),
                       "no baseline snapshot at baselines/snapshot.json in the base commit " +
                           h.head.substr(0, 7)));
    }
    SECTION("a blocked change leaves it alone") {
        dir.write("knot.c", k_hard_bloated);
        const std::string worse = commit_all(dir.path(), "worse");
        const auto result = run_tollgate("check --no-pch-cache --update-baseline --base " + h.base +
                                             " --head " + worse,
                                         dir.path());
        CHECK(result.exit_code == 1);
        CHECK_FALSE(std::ifstream(path).good());
        CHECK(result.err.find("the baseline was not updated") != std::string::npos);
    }
}

TEST_CASE("check refuses a baseline.path that leaves the repository", "[check][baseline]") {
    TempDir dir;
    const std::string policy = "tollgate-policy: 1\nrules: []\nbaseline:\n  path: ";
    SECTION("by ..") {
        const auto h = two_commits(dir, policy + "../elsewhere.json\n", k_hard_base, k_hard_same);
        const auto result = run_tollgate("check --no-pch-cache" + range_of(h), dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err ==
              "tollgate: error: baseline.path \"../elsewhere.json\" leaves the repository by "
              "\"..\" (give a path relative to the repository root, such as "
              "\"baselines/snapshot.json\", or name a snapshot elsewhere with --baseline)\n");
    }
    SECTION("as an absolute path") {
        const auto h = two_commits(dir, policy + "/tmp/snapshot.json\n", k_hard_base, k_hard_same);
        const auto result = run_tollgate("check --no-pch-cache" + range_of(h), dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err.find("baseline.path \"/tmp/snapshot.json\" is an absolute path; it is "
                              "read from the base commit") != std::string::npos);
    }
}
