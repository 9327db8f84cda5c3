// SPDX-License-Identifier: MIT
// Each distinct file (content, path and reachable headers: one cache key) is parsed at most once
// per calibrate run, however many workers race for it.
#include "gate/calibrate/lex_file_cache.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <nlohmann/json.hpp>
#include <thread>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

// A history of `commits` commits each changing two files, so that neighbouring commits share
// blobs (one's head is the next one's base) and two workers on neighbouring commits want the
// same blobs at once. Every file content is distinct (it names its file), and no file includes
// another, so distinct blobs and distinct cache keys are the same number.
std::string make_churn(const TempDir& dir, int commits) {
    const std::string repo = dir.path() + "/r";
    init_repo(repo);
    for (int c = 0; c < commits; ++c) {
        for (const char* name : {"alpha", "beta"}) {
            dir.write(fmt::format("r/src/{}.c", name),
                      fmt::format("int {0}(int x) {{\n"
                                  "    int y = x * {1};\n"
                                  "    for (int k = 0; k < {1}; ++k) {{ y += k % 3 ? k : -k; }}\n"
                                  "    return y;\n"
                                  "}}\n",
                                  name, c + 2));
        }
        commit_all(repo, fmt::format("revision {}", c));
    }
    return repo;
}

} // namespace

TEST_CASE("calibrate parses each distinct file once with several workers", "[calibrate]") {
    TempDir dir, cache;
    const std::string repo = make_churn(dir, 14);
    const auto result = run_tollgate("calibrate --no-pch-cache -j 2 --format json --cache-dir " +
                                         shell_quote(cache.path()),
                                     repo);
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
    const auto doc = nlohmann::json::parse(result.out);
    const auto& counts = doc["cache"];
    // 13 replayed commits, two files on two sides each; 2 x 14 distinct contents.
    CHECK(counts["visits"] == 52);
    CHECK(counts["distinct_blobs"] == 28);
    CHECK(counts["parses"] == counts["distinct_blobs"]);
    CHECK(counts["hits"].get<int>() + counts["parses"].get<int>() == 52);
}
