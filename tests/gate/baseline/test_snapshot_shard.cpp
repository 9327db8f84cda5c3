// SPDX-License-Identifier: MIT
// `tollgate snapshot --shard K/N` and `--merge`: shards run as separate processes, merged, equal
// to one whole run byte for byte apart from the creation time; parts that do not belong together
// are refused.
#include "gate/baseline/snapshot_shard.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/shard_spec.hpp"
#include "gate/common/source.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <nlohmann/json.hpp>
#include <regex>
#include <set>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_tollgate;
using tollgate::test::TempDir;

namespace {

// A small code base (invented for the test): eight C and C++ files and a header with an inline
// member, so that every shard of three gets some files.
std::string make_tree(const TempDir& dir) {
    init_repo(dir.path());
    dir.write("include/dsp/gain.hpp", "#pragma once\n"
                                      "namespace dsp {\n"
                                      "struct Gain {\n"
                                      "    double k;\n"
                                      "    double apply(double x) const { return k * x; }\n"
                                      "    double invert() const;\n"
                                      "};\n"
                                      "}\n");
    dir.write("src/gain.cpp", "#include \"dsp/gain.hpp\"\n"
                              "double dsp::Gain::invert() const { return k == 0 ? 0 : 1 / k; }\n");
    for (int i = 0; i < 7; ++i) {
        dir.write(fmt::format("src/stage{}.c", i),
                  fmt::format("int stage{0}(int x) {{\n"
                              "    int y = x * {1} + {0};\n"
                              "    for (int k = 0; k < {1}; ++k) {{ y ^= k << {0}; }}\n"
                              "    return y > {1} ? y - {1} : y;\n"
                              "}}\n",
                              i, i + 3));
    }
    return commit_all(dir.path(), "pipeline stages");
}

std::string without_time(const std::string& text) {
    static const std::regex created("\"created\": \"[0-9TZ:-]+\"");
    return std::regex_replace(text, created, "\"created\": \"\"");
}

tollgate::test::RunResult snapshot(const TempDir& dir, const std::string& args) {
    return run_tollgate("snapshot --no-pch-cache -j 1 " + args, dir.path());
}

void require_ok(const tollgate::test::RunResult& result) {
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
}

} // namespace

TEST_CASE("shard_of_path", "[baseline]") {
    SECTION("it is the 64-bit FNV-1a digest of the path modulo the shard count") {
        // FNV-1a 64 of "a" is 0xaf63dc4c8601ec8c and of "foobar" 0x85944171f73967e8 (test
        // vectors of the FNV reference page, Fowler/Noll/Vo; from memory).
        CHECK(tollgate::shard_of_path("a", 1000) == 0xaf63dc4c8601ec8cULL % 1000);
        CHECK(tollgate::shard_of_path("foobar", 977) == 0x85944171f73967e8ULL % 977);
    }
    SECTION("one shard takes everything") {
        CHECK(tollgate::shard_of_path("src/any.c", 1) == 0);
    }
}

TEST_CASE("parse_shard_spec", "[baseline]") {
    CHECK(tollgate::parse_shard_spec("2/4", "--shard") == tollgate::ShardSpec{2, 4});
    SECTION("a shard outside 1..N is refused with the option named") {
        for (const char* bad : {"0/3", "4/3", "3", "a/b", "1/0", "-1/2", "1/5000"}) {
            try {
                tollgate::parse_shard_spec(bad, "--shard");
                FAIL("accepted " << bad);
            } catch (const tollgate::UsageError& error) {
                CHECK(std::string(error.what()) ==
                      std::string("--shard \"") + bad +
                          "\" is not K/N with 1 <= K <= N <= 4096 (e.g. \"2/4\" for the second of "
                          "four shards)");
            }
        }
    }
}

TEST_CASE("snapshot shards merged equal one whole run", "[baseline]") {
    TempDir dir;
    const std::string commit = make_tree(dir);
    require_ok(snapshot(dir, "--out whole.json"));
    const std::string whole = read_text(dir.path() + "/whole.json");

    for (const unsigned n : {1u, 2u, 3u, 5u}) {
        DYNAMIC_SECTION("with " << n << " shards run as separate processes") {
            std::string parts;
            std::set<std::string> paths;
            std::size_t functions = 0;
            for (unsigned k = 1; k <= n; ++k) {
                const std::string part = fmt::format("part-{}-of-{}.json", k, n);
                require_ok(snapshot(dir, fmt::format("--shard {}/{} --out {}", k, n, part)));
                const auto loaded = tollgate::baseline::load_snapshot_part(dir.path() + "/" + part);
                for (const auto& f : loaded.snapshot.functions) {
                    CHECK(tollgate::shard_of_path(f.path, n) == k - 1);
                    CHECK(paths.count(f.path + "#" + f.fallback_key) == 0);
                    paths.insert(f.path + "#" + f.fallback_key);
                }
                functions += loaded.snapshot.functions.size();
                parts += " " + part;
            }
            require_ok(snapshot(dir, "--merge" + parts + " --out merged.json"));
            const std::string merged = read_text(dir.path() + "/merged.json");
            CHECK(without_time(merged) == without_time(whole));
            CHECK(functions == nlohmann::json::parse(whole)["functions"].size());
        }
    }
}

TEST_CASE("snapshot --merge refuses parts that do not belong together", "[baseline]") {
    TempDir dir;
    make_tree(dir);
    require_ok(snapshot(dir, "--shard 1/2 --out a1.json"));
    require_ok(snapshot(dir, "--shard 2/2 --out a2.json"));
    require_ok(snapshot(dir, "--shard 1/3 --out b1.json"));
    require_ok(snapshot(dir, "--shard 2/2 --max-file-size 1K --out small2.json"));
    require_ok(snapshot(dir, "--shard 2/2 --include-dir src --out inc2.json"));
    dir.write("src/stage0.c", "int stage0(int x) { return x; }\n");
    commit_all(dir.path(), "simpler stage 0");
    require_ok(snapshot(dir, "--shard 2/2 --out c2.json"));

    const auto refused = [&](const std::string& args) {
        const auto result = snapshot(dir, "--merge " + args + " --out merged.json");
        CHECK(result.exit_code == 2);
        CHECK_FALSE(std::filesystem::exists(dir.path() + "/merged.json"));
        return result.err;
    };
    SECTION("a missing shard") {
        CHECK(refused("a1.json") == "tollgate: error: shard 2/2 is missing (give all 2 parts)\n");
    }
    SECTION("a shard given twice") {
        CHECK(refused("a1.json a1.json a2.json") ==
              "tollgate: error: \"a1.json\" repeats shard 1/2 of \"a1.json\" (give each shard "
              "once)\n");
    }
    SECTION("parts of another shard count") {
        CHECK(refused("a1.json b1.json") ==
              "tollgate: error: \"b1.json\" is shard 1/3 but \"a1.json\" is shard 1/2 (merge the "
              "parts of one sharded run)\n");
    }
    SECTION("parts of different commits") {
        const std::string err = refused("a1.json c2.json");
        CHECK(err.rfind("tollgate: error: the parts disagree on the commit: \"a1.json\" has \"",
                        0) == 0);
        CHECK(err.find("(run every shard on one commit with the same options)") !=
              std::string::npos);
    }
    SECTION("parts made with another file size limit or other include folders") {
        CHECK(refused("a1.json small2.json") ==
              "tollgate: error: the parts disagree on max-file-size: \"a1.json\" has \"" +
                  std::to_string(tollgate::k_default_max_file_size) +
                  "\", \"small2.json\" has \"1024\" (run every shard on one commit with the "
                  "same options)\n");
        CHECK(refused("a1.json inc2.json") ==
              "tollgate: error: the parts disagree on include-dir: \"a1.json\" has \"\", "
              "\"inc2.json\" has \"src\" (run every shard on one commit with the same "
              "options)\n");
    }
    SECTION("a part of another tool version") {
        // The part as another version would write it (the snapshot's digest made anew).
        auto older = tollgate::baseline::load_snapshot_part(dir.path() + "/a2.json");
        older.snapshot.tool_version = "0.0.1";
        tollgate::baseline::save_snapshot_part(older, dir.path() + "/old2.json");
        CHECK(refused("a1.json old2.json") ==
              std::string("tollgate: error: \"old2.json\" was written by tollgate 0.0.1, this is "
                          "tollgate ") +
                  TOLLGATE_VERSION + " (run every shard and the merge with one version)\n");
    }
    SECTION("a whole snapshot is not a part") {
        require_ok(snapshot(dir, "--out whole.json"));
        CHECK(refused("whole.json") ==
              "tollgate: error: \"whole.json\" is not a snapshot part (schema "
              "\"tollgate.snapshot-part/2\" expected) (write it again with \"tollgate snapshot "
              "--shard K/N\")\n");
    }
}

TEST_CASE("snapshot --merge refuses options that only the parts decide", "[baseline]") {
    TempDir dir;
    for (const std::string option :
         {"--stroud 10", "--compile-commands cc.json", "--include-dir include"}) {
        const auto result = snapshot(dir, "--merge a.json b.json --out s.json " + option);
        CHECK(result.exit_code == 2);
        CHECK(result.err.find(option.substr(0, option.find(' '))) != std::string::npos);
    }
}

TEST_CASE("snapshot --shard needs --out", "[baseline]") {
    TempDir dir;
    make_tree(dir);
    const auto result = snapshot(dir, "--shard 1/2");
    CHECK(result.exit_code == 2);
    CHECK(result.err == "tollgate: error: --shard writes a part, not a snapshot: give its file "
                        "with --out PATH\n");
}
