// SPDX-License-Identifier: MIT
// `tollgate calibrate --suggest-block-rate` end to end on a scripted 60-commit history that
// bundles a test framework: the vendored folder is left out unparsed, the suggestion keeps to
// the block rate, and `calibrate --policy` on the written file reproduces it.
#include "gate/policy/policy.hpp"
#include "sixty_commit_history.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

using tollgate::test::k_vendored_folder;
using tollgate::test::make_sixty_commit_history;
using tollgate::test::run_command;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

std::size_t count_of(const std::string& text, const std::string& part) {
    std::size_t count = 0;
    for (auto at = text.find(part); at != std::string::npos; at = text.find(part, at + 1)) {
        ++count;
    }
    return count;
}

} // namespace

namespace {

// The scripted history and one suggestion run, made once for every section below.
struct BlockRateRun {
    TempDir repo, cache;
    std::string dir, draft, common;
    tollgate::test::RunResult run;
    nlohmann::json doc;

    BlockRateRun() {
        dir = repo.path() + "/r";
        make_sixty_commit_history(dir);
        common = "calibrate --no-pch-cache --max-commits 0 --format json --cache-dir " +
                 shell_quote(cache.path());
        draft = repo.path() + "/draft.yaml";
        run = run_tollgate(common + " --suggest-block-rate 5 --out " + shell_quote(draft), dir);
        if (run.exit_code == 0) {
            doc = nlohmann::json::parse(run.out);
        }
    }
};

const BlockRateRun& block_rate_run() {
    static const BlockRateRun shared;
    return shared;
}

} // namespace

TEST_CASE("calibrate --suggest-block-rate", "[calibrate]") {
    const auto& fixture = block_rate_run();
    const auto& run = fixture.run;
    const auto& dir = fixture.dir;
    const auto& draft = fixture.draft;
    const auto& common = fixture.common;
    INFO(run.err);
    REQUIRE(run.exit_code == 0);
    const auto& doc = fixture.doc;
    const auto& suggestion = doc["suggestion"];

    SECTION("the vendored folder is listed, left out, and none of its functions counted") {
        REQUIRE(doc["scope"]["vendored"].size() == 1);
        const auto& folder = doc["scope"]["vendored"][0];
        CHECK(folder["path"] == k_vendored_folder);
        CHECK(folder["excluded"] == true);
        CHECK(folder["changed_files"] == 20); // every third of 60 edits
        CHECK(folder["commits"] == 20);
        CHECK(doc["scope"]["policy"] == "built-in default");
        for (const auto& [measure, series] : doc["measures"].items()) {
            for (const auto& kind : {"growth", "added"}) {
                for (const auto& largest : series[kind]["largest"]) {
                    INFO(measure << " " << kind);
                    CHECK(largest["file"] == "src/engine.c");
                }
            }
        }
    }
    SECTION("the replayed block rate is at or under 5% of the 60 commits") {
        CHECK(suggestion["judged"] == 60);
        CHECK(suggestion["blocked"].get<int>() <= 3);
        CHECK(suggestion["block_rate"].get<double>() <= 5.0);
        CHECK(suggestion["block_target_reached"] == true);
        // The search is the strictest that fits: the history has commits above the limit.
        CHECK(suggestion["blocked"].get<int>() >= 1);
    }
    SECTION("the sample size is reported with a small-sample warning under 100 commits") {
        CHECK(suggestion["sample"]["commits"] == 60);
        CHECK(suggestion["sample"]["functions"].get<int>() >= 60);
        CHECK(suggestion["small_sample"] == true);
        CHECK(run.err.find("tollgate: warning: small sample: 60 commits and ") !=
              std::string::npos);
    }
    SECTION("the written policy passes tollgate policy and keeps the noise floor and excludes") {
        const auto check = run_tollgate("policy " + shell_quote(draft), dir);
        INFO(check.out << check.err);
        CHECK(check.exit_code == 0);
        const auto written = tollgate::policy::load_policy_file(draft);
        const auto defaults = tollgate::policy::default_policy();
        CHECK(written.noise_floor == defaults.noise_floor);
        const auto& exclude = written.paths.exclude;
        CHECK(std::find(exclude.begin(), exclude.end(), std::string(k_vendored_folder) + "/**") !=
              exclude.end());
        for (const auto& kept : defaults.paths.exclude) {
            CHECK(std::find(exclude.begin(), exclude.end(), kept) != exclude.end());
        }
    }
    SECTION("calibrate --policy on the written file reproduces the replayed rates") {
        const auto again = run_tollgate(common + " --policy " + shell_quote(draft), dir);
        INFO(again.err);
        REQUIRE(again.exit_code == 0);
        const auto what_if = nlohmann::json::parse(again.out)["what_if"];
        CHECK(what_if["judged"] == suggestion["judged"]);
        CHECK(what_if["blocked"] == suggestion["blocked"]);
        CHECK(what_if["warned"] == suggestion["warned"]);
    }
    SECTION("--keep-vendored measures the bundled folder too") {
        const auto kept = run_tollgate(common + " --keep-vendored", dir);
        INFO(kept.err);
        REQUIRE(kept.exit_code == 0);
        const auto kept_doc = nlohmann::json::parse(kept.out);
        CHECK(kept_doc["scope"]["vendored"][0]["excluded"] == false);
        CHECK(count_of(kept.out, "\"file\": \"tests/vendor/minicheck/runner.c\"") > 0);
    }
}

TEST_CASE("calibrate --progress", "[calibrate]") {
    TempDir repo, cache;
    const std::string dir = repo.path() + "/r";
    make_sixty_commit_history(dir);
    const std::string command =
        "calibrate --no-pch-cache --max-commits 0 --cache-dir " + shell_quote(cache.path());

    SECTION("a non-terminal gets a line per interval (here every commit) and a closing line") {
        const auto run = run_command("TOLLGATE_PROGRESS_SECONDS=0 " +
                                         shell_quote(tollgate::test::tollgate_binary()) + " " +
                                         command + " --progress always",
                                     dir);
        INFO(run.err);
        REQUIRE(run.exit_code == 0);
        CHECK(count_of(run.err, "calibrate: ") == 61);
        CHECK(run.err.find("calibrate: 60/60 commits, ") != std::string::npos);
        CHECK(run.err.find(" left\n") != std::string::npos);
        CHECK(run.err.find("calibrate: 60/60 commits in ") != std::string::npos);
        CHECK(run.err.find('\r') == std::string::npos);
    }
    SECTION("never writes no progress") {
        const auto run = run_command("TOLLGATE_PROGRESS_SECONDS=0 " +
                                         shell_quote(tollgate::test::tollgate_binary()) + " " +
                                         command + " --progress never",
                                     dir);
        REQUIRE(run.exit_code == 0);
        CHECK(count_of(run.err, "calibrate: ") == 0);
    }
}

TEST_CASE("snapshot and check --progress", "[calibrate]") {
    const auto& fixture = block_rate_run();
    const std::string binary =
        "TOLLGATE_PROGRESS_SECONDS=0 " + shell_quote(tollgate::test::tollgate_binary());
    TempDir out;

    SECTION("snapshot reports every file of the commit to a non-terminal, then closes") {
        // Two C files at the tip: src/engine.c and the vendored runner.c.
        const auto run = run_command(binary + " snapshot --no-pch-cache --progress always --out " +
                                         shell_quote(out.path() + "/s.json"),
                                     fixture.dir);
        INFO(run.err);
        REQUIRE(run.exit_code == 0);
        CHECK(count_of(run.err, "snapshot: ") == 3);
        CHECK(run.err.find("snapshot: 2/2 files, ") != std::string::npos);
        CHECK(run.err.find("snapshot: 2/2 files in ") != std::string::npos);
    }
    SECTION("check reports every file side it parses to a non-terminal, then closes") {
        // HEAD~3..HEAD changes both files: four sides.
        const auto run = run_command(binary + " check --no-pch-cache --base HEAD~3 --progress "
                                              "always",
                                     fixture.dir);
        INFO(run.err);
        CHECK(count_of(run.err, "check: ") == 5);
        CHECK(run.err.find("check: 4/4 file sides in ") != std::string::npos);
    }
}
