// SPDX-License-Identifier: MIT
// `tollgate calibrate` end to end on a scripted history: what-if counts, the lexed-file cache
// (reuse, a killed run, a damaged entry), the suggested policy, and replay equal to check.
#include "calibrate_test_support.hpp"
#include "gate/calibrate/distribution.hpp"
#include "gate/calibrate/replay.hpp"
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "gate/report/change_report.hpp"
#include "gate/walker/history.hpp"
#include "gate/walker/repository.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

using tollgate::test::make_scripted_history;
using tollgate::test::run_command;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

namespace fs = std::filesystem;

nlohmann::json calibrate_json(const std::string& dir, const std::string& args) {
    const auto result = run_tollgate("calibrate --format json --no-pch-cache " + args, dir);
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
    return nlohmann::json::parse(result.out);
}

// The measured part of a calibrate report: distributions and what-if, without timings or cache.
nlohmann::json measured_part(nlohmann::json doc) {
    doc.erase("cache");
    doc.erase("seconds");
    doc.erase("threads");
    return doc;
}

std::vector<std::string> cache_entries(const std::string& dir) {
    std::vector<std::string> out;
    for (const auto& entry : fs::recursive_directory_iterator(dir)) {
        if (entry.is_regular_file()) {
            out.push_back(entry.path().string());
        }
    }
    std::sort(out.begin(), out.end());
    return out;
}

} // namespace

TEST_CASE("calibrate what-if", "[calibrate]") {
    TempDir repo, cache;
    const auto h = make_scripted_history(repo.path() + "/r");
    const std::string dir = repo.path() + "/r";
    repo.write("policy.yaml", tollgate::test::k_scripted_policy);
    const auto doc = calibrate_json(dir, "--cache-dir " + shell_quote(cache.path()) + " --policy " +
                                             shell_quote(repo.path() + "/policy.yaml"));

    SECTION("the root commit is skipped with a note and merges count against their first parent") {
        REQUIRE(doc["commits"].size() == 4);
        CHECK(doc["commits"][0]["commit"] == h.grow);
        CHECK(doc["commits"][3]["commit"] == h.merge);
        CHECK(doc["commits"][3]["merge"] == true);
        REQUIRE(doc["notes"].size() == 1);
        CHECK(doc["notes"][0] ==
              "root commit " + h.root.substr(0, 7) + " skipped: it has no parent to compare with");
    }
    SECTION("exactly the commits that break the policy are counted, with their rules") {
        const auto& w = doc["what_if"];
        CHECK(w["judged"] == 4);
        CHECK(w["blocked"] == 1);
        CHECK(w["warned"] == 2);
        REQUIRE(w["flagged"].size() == 3);
        CHECK(w["flagged"][0]["commit"] == h.grow);
        CHECK(w["flagged"][0]["outcome"] == "blocked");
        CHECK(w["flagged"][0]["rules"] == nlohmann::json::array({"effort-growth"}));
        CHECK(w["flagged"][1]["commit"] == h.add);
        CHECK(w["flagged"][1]["outcome"] == "pass");
        CHECK(w["flagged"][1]["rules"] == nlohmann::json::array({"new-function-volume"}));
        CHECK(w["flagged"][2]["commit"] == h.merge);
        CHECK(w["flagged"][2]["rules"] == nlohmann::json::array({"new-function-volume"}));
        CHECK(w["rules"]["effort-growth"] == 1);
        CHECK(w["rules"]["new-function-volume"] == 2);
    }
    SECTION("the distributions count every changed function, the added ones apart") {
        // Changed: f in "grow f" and in "tweak f"; added: g and h.
        CHECK(doc["measures"]["effort"]["growth"]["summary"]["count"] == 2);
        CHECK(doc["measures"]["effort"]["added"]["summary"]["count"] == 2);
        const auto& largest = doc["measures"]["volume"]["added"]["largest"];
        REQUIRE(largest.size() == 2);
        CHECK(largest[0]["function"].is_string());
    }
}

TEST_CASE("calibrate percentiles in the report match Python's statistics", "[calibrate]") {
    TempDir repo, cache;
    make_scripted_history(repo.path() + "/r");
    const auto doc = calibrate_json(repo.path() + "/r", "--cache-dir " + shell_quote(cache.path()));
    for (const char* measure : {"volume", "difficulty", "effort"}) {
        for (const char* series : {"growth", "added"}) {
            const auto& s = doc["measures"][measure][series];
            const auto values = s["values"].get<std::vector<double>>();
            REQUIRE(values.size() >= 2);
            std::string list;
            for (double v : values) {
                list += fmt::format("{:.17g},", v);
            }
            const auto py = run_command(
                "python3 -c \"import statistics; q = statistics.quantiles([" + list +
                    "], n=100, method='inclusive'); print(q[49], q[74], q[89], q[94], q[98])\"",
                ".");
            REQUIRE(py.exit_code == 0);
            std::istringstream in(py.out);
            double p50, p75, p90, p95, p99;
            in >> p50 >> p75 >> p90 >> p95 >> p99;
            INFO(measure << " " << series);
            CHECK(s["summary"]["p50"].get<double>() == Approx(p50));
            CHECK(s["summary"]["p75"].get<double>() == Approx(p75));
            CHECK(s["summary"]["p90"].get<double>() == Approx(p90));
            CHECK(s["summary"]["p95"].get<double>() == Approx(p95));
            CHECK(s["summary"]["p99"].get<double>() == Approx(p99));
        }
    }
}

TEST_CASE("calibrate lexed-file cache", "[calibrate]") {
    TempDir repo, cache, fresh;
    make_scripted_history(repo.path() + "/r");
    const std::string dir = repo.path() + "/r";
    const std::string cache_arg = "--cache-dir " + shell_quote(cache.path());

    SECTION("a second run parses nothing and reports the same") {
        const auto first = calibrate_json(dir, cache_arg);
        CHECK(first["cache"]["parses"].get<int>() > 0);
        CHECK(first["cache"]["visits"].get<int>() >= first["cache"]["parses"].get<int>());
        const auto second = calibrate_json(dir, cache_arg);
        CHECK(second["cache"]["parses"] == 0);
        CHECK(second["cache"]["hits"] == second["cache"]["visits"]);
        CHECK(second["cache"]["visits"] == first["cache"]["visits"]);
        CHECK(measured_part(second) == measured_part(first));
    }
    SECTION("a run killed mid-way leaves no entry that a later run uses wrongly") {
        const auto reference = calibrate_json(dir, "--cache-dir " + shell_quote(fresh.path()));
        // The hook pauses the run after 2 cache writes, with a half-written temporary file.
        const std::string err = shell_quote(repo.path() + "/err.txt");
        const auto killed = run_command(
            "cd " + shell_quote(dir) + "; TOLLGATE_TEST_PAUSE_AFTER_CACHE_WRITES=2 " +
                std::string(TOLLGATE_BINARY) + " calibrate --no-pch-cache -j 1 " + cache_arg +
                " >/dev/null 2>" + err + " & pid=$!; for i in $(seq 1 600); do grep -q paused " +
                err + " && break; sleep 0.1; done; kill -9 $pid; { wait $pid; } 2>/dev/null; cat " +
                err,
            repo.path());
        REQUIRE(killed.out.find("paused after 2 cache writes") != std::string::npos);
        auto entries = cache_entries(cache.path());
        std::vector<std::string> json_entries;
        for (const auto& e : entries) {
            if (e.size() > 5 && e.compare(e.size() - 5, 5, ".json") == 0) {
                json_entries.push_back(e);
            }
        }
        REQUIRE(json_entries.size() == 2);
        // Damage one whole entry as a crash of another tool or a full disk might.
        {
            std::ofstream cut(json_entries[0], std::ios::trunc);
            cut << "{\"format\": \"tollgate.lexcache/3\", \"key\": ";
        }
        const auto second = calibrate_json(dir, "-j 1 " + cache_arg);
        CHECK(second["cache"]["damaged"] == 1);
        CHECK(second["cache"]["parses"].get<int>() ==
              second["cache"]["visits"].get<int>() - second["cache"]["hits"].get<int>());
        CHECK(measured_part(second) == measured_part(reference));
        const auto third = calibrate_json(dir, cache_arg);
        CHECK(third["cache"]["damaged"] == 0);
        CHECK(third["cache"]["parses"] == 0);
        CHECK(measured_part(third) == measured_part(reference));
    }
}

TEST_CASE("calibrate --suggest", "[calibrate]") {
    TempDir repo, cache;
    make_scripted_history(repo.path() + "/r");
    const std::string dir = repo.path() + "/r";
    const std::string cache_arg = "--cache-dir " + shell_quote(cache.path());
    const std::string draft = repo.path() + "/draft.yaml";
    const auto suggest = run_tollgate(
        "calibrate --no-pch-cache --suggest 90 --out " + shell_quote(draft) + " " + cache_arg, dir);
    INFO(suggest.err);
    REQUIRE(suggest.exit_code == 0);
    const auto doc = calibrate_json(dir, cache_arg);

    SECTION("the suggested policy passes tollgate policy") {
        const auto check = run_tollgate("policy " + shell_quote(draft), dir);
        INFO(check.out << check.err);
        CHECK(check.exit_code == 0);
    }
    SECTION("its limits are the 90th percentiles of the history, rounded to two decimals") {
        const auto loaded = tollgate::policy::load_policy_file(draft);
        std::size_t growth_rules = 0, added_rules = 0;
        for (const auto& rule : loaded.rules) {
            const std::string measure(tollgate::core::measure_name(rule.measure));
            const auto& m = doc["measures"][measure];
            INFO(rule.id);
            if (rule.kind == tollgate::policy::RuleKind::growth) {
                ++growth_rules;
                const double p90 = m["growth"]["summary"]["p90"].get<double>();
                REQUIRE(rule.max_increase);
                CHECK(*rule.max_increase == Approx(std::max(0.0, p90)).margin(0.005));
                REQUIRE(rule.max_increase_percent);
                CHECK(*rule.max_increase_percent ==
                      Approx(std::max(0.0, m["growth_percent"]["summary"]["p90"].get<double>()))
                          .margin(0.005));
            } else {
                ++added_rules;
                REQUIRE(rule.ceiling);
                CHECK(*rule.ceiling ==
                      Approx(m["added"]["summary"]["p90"].get<double>()).margin(0.005));
            }
        }
        CHECK(growth_rules == 3);
        CHECK(added_rules == 3);
    }
    SECTION("each limit says where it came from") {
        const std::string text = tollgate::test::read_text(draft);
        CHECK(text.find("# p90 of effort growth over 2 functions in 4 commits") !=
              std::string::npos);
    }
}

TEST_CASE("replay_history", "[calibrate]") {
    TempDir repo;
    const auto h = make_scripted_history(repo.path() + "/r");
    const std::string dir = repo.path() + "/r";

    SECTION("a replayed commit has exactly the deltas check reports for it") {
        const auto repository = tollgate::walker::Repository::open(dir);
        tollgate::walker::HistoryQuery query;
        query.range = h.root + ".." + h.grow;
        const auto history = tollgate::walker::first_parent_history(repository, query);
        REQUIRE(history.commits.size() == 1);
        tollgate::calibrate::ReplaySettings settings;
        settings.threads = 2;
        const auto replay = tollgate::calibrate::replay_history(dir, history, settings);
        REQUIRE(replay.commits.size() == 1);
        tollgate::policy::JudgeOptions options;
        options.today = "2030-01-01";
        const auto verdict = tollgate::policy::judge(tollgate::policy::default_policy(),
                                                     replay.commits[0].report, options);
        std::ostringstream replayed;
        tollgate::report::write_change_json(replayed, replay.commits[0].report, verdict);

        const auto check = run_tollgate("check --no-pch-cache --base " + h.grow + "~1 --head " +
                                            h.grow + " --report json:-",
                                        dir);
        INFO(check.err);
        REQUIRE(check.exit_code <= 1);
        const auto expected = nlohmann::json::parse(check.out);
        const auto actual = nlohmann::json::parse(replayed.str());
        REQUIRE(expected["functions"].size() == 1);
        CHECK(actual["functions"] == expected["functions"]);
        CHECK(actual["totals"] == expected["totals"]);
    }
    SECTION("results are in history order whatever the thread count") {
        const auto repository = tollgate::walker::Repository::open(dir);
        const auto history =
            tollgate::walker::first_parent_history(repository, tollgate::walker::HistoryQuery{});
        REQUIRE(history.commits.size() == 5);
        CHECK(history.tip_name == "main");
        tollgate::calibrate::ReplaySettings one, two;
        one.threads = 1;
        two.threads = 2;
        const auto a = tollgate::calibrate::replay_history(dir, history, one);
        const auto b = tollgate::calibrate::replay_history(dir, history, two);
        REQUIRE(a.commits.size() == 4);
        REQUIRE(b.commits.size() == 4);
        for (std::size_t i = 0; i < 4; ++i) {
            CHECK(a.commits[i].commit == history.commits[i + 1]);
            CHECK(b.commits[i].commit == history.commits[i + 1]);
            CHECK(a.commits[i].report.functions == b.commits[i].report.functions);
        }
    }
    SECTION("--max-commits keeps the newest commits and --since the recent ones") {
        const auto repository = tollgate::walker::Repository::open(dir);
        tollgate::walker::HistoryQuery query;
        query.max_commits = 2;
        const auto newest = tollgate::walker::first_parent_history(repository, query);
        REQUIRE(newest.commits.size() == 2);
        CHECK(newest.commits[0].id.hex == h.tweak);
        CHECK(newest.commits[1].id.hex == h.merge);
        query.max_commits = 0;
        query.since = std::int64_t{4102444800}; // 2100-01-01: after every commit
        CHECK(tollgate::walker::first_parent_history(repository, query).commits.empty());
    }
}

TEST_CASE("calibrate interrupted by SIGINT", "[calibrate]") {
    TempDir repo, cache;
    make_scripted_history(repo.path() + "/r");
    // The hook raises a real SIGINT in the process after 2 commits; with one worker no commit is
    // in flight then, so exactly 2 of the 4 are in the partial result.
    const auto result = run_command(
        "TOLLGATE_TEST_SIGINT_AFTER_COMMITS=2 " + std::string(TOLLGATE_BINARY) +
            " calibrate --no-pch-cache --format json -j 1 --cache-dir " + shell_quote(cache.path()),
        repo.path() + "/r");
    INFO(result.err);
    CHECK(result.exit_code == 130);
    CHECK(result.err.find("tollgate: interrupted: partial result of 2 commits") !=
          std::string::npos);
    const auto doc = nlohmann::json::parse(result.out);
    CHECK(doc["complete"] == false);
    CHECK(doc["commits"].size() == 2);
    CHECK(doc["notes"].back() == "interrupted: 2 of 4 commits replayed");
}
