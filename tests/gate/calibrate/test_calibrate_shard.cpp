// SPDX-License-Identifier: MIT
// `tollgate calibrate --shard K/N` and `--merge`: shards run as separate processes and merged give
// exactly the report of one whole run; parts that do not belong together are refused.
#include "calibrate_test_support.hpp"
#include "gate/calibrate/shard_replay.hpp"

#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <fstream>
#include <nlohmann/json.hpp>

using tollgate::test::commit_all;
using tollgate::test::make_scripted_history;
using tollgate::test::read_text;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

// The scripted history and three more commits on top: seven replayed commits.
std::string make_longer_history(const TempDir& repo) {
    const std::string dir = repo.path() + "/r";
    make_scripted_history(dir);
    repo.write("r/src/c.c", "int k(int a) {\n    return a * 3 - 1;\n}\n");
    commit_all(dir, "add k");
    repo.write("r/src/c.c", "int k(int a) {\n    int s = 0;\n    while (a-- > 0) { s += a; }\n"
                            "    return s * 3 - 1;\n}\n");
    commit_all(dir, "grow k");
    repo.write("r/src/b.c", "int h(int a, int b) {\n    return a - b;\n}\n");
    commit_all(dir, "shrink h");
    return dir;
}

tollgate::test::RunResult calibrate(const std::string& dir, const std::string& args) {
    return run_tollgate("calibrate --no-pch-cache -j 1 " + args, dir);
}

std::string require_ok(const tollgate::test::RunResult& result) {
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
    return result.out;
}

// The report without what depends on timing and on the state of the cache folder.
nlohmann::json measured_part(nlohmann::json doc) {
    doc.erase("seconds");
    doc.erase("threads");
    doc["cache"].erase("hits");
    doc["cache"].erase("parses");
    return doc;
}

void write(const std::string& path, const std::string& text) {
    std::ofstream out(path, std::ios::binary | std::ios::trunc);
    out << text;
}

} // namespace

TEST_CASE("shard_history", "[calibrate]") {
    tollgate::walker::History history;
    history.tip_name = "main";
    for (int i = 0; i < 7; ++i) {
        tollgate::walker::HistoryCommit c;
        c.id.hex = std::string(40, static_cast<char>('a' + i));
        history.commits.push_back(c);
    }
    SECTION("the blocks of shards 1..N, in order, are the whole history") {
        for (unsigned n = 1; n <= 9; ++n) {
            std::vector<tollgate::walker::HistoryCommit> joined;
            for (unsigned k = 1; k <= n; ++k) {
                const auto block = tollgate::calibrate::shard_history(history, {k, n});
                CHECK(block.tip_name == "main");
                CHECK(block.commits.size() + 1 >= 7 / n); // nearly equal blocks
                joined.insert(joined.end(), block.commits.begin(), block.commits.end());
            }
            CHECK(joined == history.commits);
        }
    }
    SECTION("blocks are contiguous: 7 commits in 3 shards are 2, 2 and 3") {
        CHECK(tollgate::calibrate::shard_history(history, {1, 3}).commits.size() == 2);
        CHECK(tollgate::calibrate::shard_history(history, {2, 3}).commits.size() == 2);
        CHECK(tollgate::calibrate::shard_history(history, {3, 3}).commits.front().id.hex ==
              std::string(40, 'e'));
    }
}

TEST_CASE("calibrate shards merged equal one whole run", "[calibrate]") {
    TempDir repo, cache, parts;
    const std::string dir = make_longer_history(repo);
    repo.write("policy.yaml", tollgate::test::k_scripted_policy);
    const std::string policy = " --policy " + shell_quote(repo.path() + "/policy.yaml");
    const std::string cache_dir = " --cache-dir " + shell_quote(cache.path());
    const auto whole =
        nlohmann::json::parse(require_ok(calibrate(dir, "--format json" + policy + cache_dir)));
    REQUIRE(whole["commits"].size() == 7);
    const std::string whole_text = require_ok(calibrate(dir, policy + cache_dir));
    const std::string whole_suggest =
        require_ok(calibrate(dir, "--suggest 90" + policy + cache_dir));

    for (const unsigned n : {1u, 2u, 3u, 4u, 11u}) {
        DYNAMIC_SECTION("with " << n << " shards run as separate processes") {
            std::string files;
            for (unsigned k = 1; k <= n; ++k) {
                const std::string path = parts.path() + fmt::format("/part-{}-of-{}.json", k, n);
                // A cold cache for every shard, as on separate runners.
                TempDir own_cache;
                write(path,
                      require_ok(calibrate(dir, fmt::format("--shard {}/{} --cache-dir {}", k, n,
                                                            shell_quote(own_cache.path())) +
                                                    policy)));
                files += " " + shell_quote(path);
            }
            const auto merged = nlohmann::json::parse(
                require_ok(calibrate(parts.path(), "--format json --merge" + files + policy)));
            CHECK(measured_part(merged) == measured_part(whole));
            CHECK(merged["cache"]["visits"] == whole["cache"]["visits"]);
            CHECK(merged["cache"]["distinct_blobs"] == whole["cache"]["distinct_blobs"]);

            // The text report after its first line (timings, cache) and the suggested policy.
            const std::string text =
                require_ok(calibrate(parts.path(), "--merge" + files + policy));
            CHECK(text.substr(text.find('\n')) == whole_text.substr(whole_text.find('\n')));
            CHECK(require_ok(calibrate(parts.path(), "--suggest 90 --merge" + files)) ==
                  whole_suggest);
        }
    }
}

TEST_CASE("calibrate --merge refuses parts that do not belong together", "[calibrate]") {
    TempDir repo, cache, parts;
    const std::string dir = make_longer_history(repo);
    const std::string cache_dir = " --cache-dir " + shell_quote(cache.path());
    const auto part = [&](const std::string& name, const std::string& args) {
        write(parts.path() + "/" + name, require_ok(calibrate(dir, args + cache_dir)));
    };
    part("a1.json", "--shard 1/2");
    part("a2.json", "--shard 2/2");
    part("b1.json", "--shard 1/3");
    part("short2.json", "--shard 2/2 --max-commits 4");
    part("stroud2.json", "--shard 2/2 --stroud 10");

    const auto refused = [&](const std::string& args) {
        const auto result = calibrate(parts.path(), "--merge " + args);
        CHECK(result.exit_code == 2);
        CHECK(result.out.empty());
        return result.err;
    };
    SECTION("a missing shard") {
        CHECK(refused("a1.json") == "tollgate: error: shard 2/2 is missing (give all 2 parts)\n");
    }
    SECTION("a shard given twice") {
        CHECK(refused("a1.json a2.json a2.json") ==
              "tollgate: error: \"a2.json\" repeats shard 2/2 of \"a2.json\" (give each shard "
              "once)\n");
    }
    SECTION("parts of another shard count") {
        CHECK(refused("a1.json b1.json") ==
              "tollgate: error: \"b1.json\" is shard 1/3 but \"a1.json\" is shard 1/2 (merge the "
              "parts of one sharded run)\n");
    }
    SECTION("parts of different ranges") {
        CHECK(refused("a1.json short2.json") ==
              "tollgate: error: the parts disagree on max-commits: \"a1.json\" has \"300\", "
              "\"short2.json\" has \"4\" (run every shard with the same options)\n");
    }
    SECTION("parts measured with different settings") {
        CHECK(refused("a1.json stroud2.json") ==
              "tollgate: error: the parts disagree on stroud: \"a1.json\" has \"18\", "
              "\"stroud2.json\" has \"10\" (run every shard with the same options)\n");
    }
    SECTION("parts of different conventions") {
        auto doc = nlohmann::json::parse(read_text(parts.path() + "/a2.json"));
        doc["settings"]["convention"] = "c-family/1+name-operand";
        write(parts.path() + "/conv2.json", doc.dump());
        const std::string err = refused("a1.json conv2.json");
        CHECK(err.rfind("tollgate: error: the parts disagree on convention: \"a1.json\" has \"",
                        0) == 0);
        CHECK(err.find("\"conv2.json\" has \"c-family/1+name-operand\"") != std::string::npos);
    }
    SECTION("a part of another tool version") {
        auto doc = nlohmann::json::parse(read_text(parts.path() + "/a2.json"));
        doc["tool_version"] = "0.0.1";
        write(parts.path() + "/old2.json", doc.dump());
        CHECK(refused("a1.json old2.json") ==
              std::string("tollgate: error: \"old2.json\" was written by tollgate 0.0.1, this is "
                          "tollgate ") +
                  TOLLGATE_VERSION + " (run every shard and the merge with one version)\n");
    }
    SECTION("options that only the parts decide are refused, not ignored") {
        for (const std::string option :
             {"--stroud 10", "--rename-limit 5", "--compile-commands cc.json"}) {
            const std::string err = refused("a1.json a2.json " + option);
            CHECK(err.find(option.substr(0, option.find(' '))) != std::string::npos);
        }
    }
    SECTION("a whole report is not a part") {
        write(parts.path() + "/whole.json",
              require_ok(calibrate(dir, "--format json" + cache_dir)));
        CHECK(refused("whole.json") ==
              "tollgate: error: \"whole.json\" is not a partial calibrate result (schema "
              "\"tollgate.calibrate-part/2\" expected; write one with \"tollgate calibrate "
              "--shard K/N\")\n");
    }
    SECTION("--shard leaves --suggest, --suggest-block-rate and --html to the merge") {
        for (const std::string option :
             {"--suggest 90", "--suggest-block-rate 5", "--html p.html"}) {
            const auto result = calibrate(dir, "--shard 1/2 " + option + cache_dir);
            CHECK(result.exit_code == 2);
            CHECK(result.err == "tollgate: error: --shard writes a partial result: give "
                                "--suggest, --suggest-block-rate and --html to \"tollgate "
                                "calibrate --merge\" instead\n");
        }
    }
}

TEST_CASE("calibrate processes writing one cache folder at once", "[calibrate]") {
    // CI runners that share a cache folder (a self-hosted runner's disk, or a restored cache
    // several jobs write back) write the same entries at the same time.
    TempDir repo, cache;
    const std::string dir = make_longer_history(repo);
    const std::string cache_dir = shell_quote(cache.path());
    std::string command = "{ ";
    for (int i = 0; i < 3; ++i) {
        command += shell_quote(tollgate::test::tollgate_binary()) +
                   " calibrate --no-pch-cache -j 1 --format json --cache-dir " + cache_dir +
                   " > out" + std::to_string(i) + ".json 2>&1 & ";
    }
    command += "wait; }";
    REQUIRE(tollgate::test::run_command(command, dir).exit_code == 0);
    for (int i = 0; i < 3; ++i) {
        CHECK_NOTHROW(nlohmann::json::parse(read_text(dir + "/out" + std::to_string(i) + ".json")));
    }

    SECTION("no temporary file is left and every entry reads back whole") {
        for (const auto& entry : std::filesystem::recursive_directory_iterator(cache.path())) {
            CHECK(entry.path().extension() != ".part");
        }
        const auto again = nlohmann::json::parse(
            require_ok(calibrate(dir, "--format json --cache-dir " + cache_dir)));
        CHECK(again["cache"]["damaged"] == 0);
        CHECK(again["cache"]["parses"] == 0);
        CHECK(again["cache"]["hits"] == again["cache"]["visits"]);
        const auto first = nlohmann::json::parse(read_text(dir + "/out0.json"));
        CHECK(measured_part(again)["measures"] == measured_part(first)["measures"]);
    }
}
