// SPDX-License-Identifier: MIT
// `tollgate calibrate --shard K/N` and `--merge` keep to the scope of one whole run: the policy's
// paths and noise floor and the vendored folders are chosen for the whole history, the merge
// suggests for a block rate as a whole run does, and parts made under another scope are refused.
#include "sixty_commit_history.hpp"

#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <fstream>
#include <nlohmann/json.hpp>

using tollgate::test::make_sixty_commit_history;
using tollgate::test::read_text;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

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

TEST_CASE("calibrate shards keep to the scope of one whole run", "[calibrate]") {
    TempDir repo, cache, parts;
    const std::string dir = repo.path() + "/r";
    make_sixty_commit_history(dir);
    const std::string common =
        "calibrate --no-pch-cache -j 1 --max-commits 0 --cache-dir " + shell_quote(cache.path());
    const std::string whole_policy = parts.path() + "/whole.yaml";
    const auto whole = nlohmann::json::parse(require_ok(run_tollgate(
        common + " --format json --suggest-block-rate 5 --out " + shell_quote(whole_policy), dir)));
    // The scenario's vendored folder is found, left out and counted (else this proves nothing).
    REQUIRE(whole["scope"]["vendored"].size() == 1);
    REQUIRE(whole["scope"]["vendored"][0]["changed_files"] > 0);

    const auto shard = [&](const std::string& name, const std::string& args) {
        const std::string path = parts.path() + "/" + name;
        write(path, require_ok(run_tollgate(common + " " + args, dir)));
        return " " + shell_quote(path);
    };
    const std::string files = shard("p1.json", "--shard 1/2") + shard("p2.json", "--shard 2/2");

    SECTION("merged, they report, count the vendored folder and suggest as the whole run") {
        const std::string merged_policy = parts.path() + "/merged.yaml";
        const auto merged = nlohmann::json::parse(
            require_ok(run_tollgate("calibrate --format json --suggest-block-rate 5 --out " +
                                        shell_quote(merged_policy) + " --merge" + files,
                                    parts.path())));
        CHECK(measured_part(merged) == measured_part(whole));
        CHECK(read_text(merged_policy) == read_text(whole_policy));
    }
    SECTION("a part measured with the vendored folder kept is refused") {
        const std::string kept = shard("kept2.json", "--shard 2/2 --keep-vendored");
        const auto result = run_tollgate(
            "calibrate --merge" + shard("k1.json", "--shard 1/2") + kept, parts.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err.rfind("tollgate: error: the parts disagree on keep-vendored: ", 0) == 0);
    }
    SECTION("a part measured with another file size limit is refused") {
        const std::string small = shard("small2.json", "--shard 2/2 --max-file-size 1K");
        const auto result = run_tollgate(
            "calibrate --merge" + files.substr(0, files.find(" ", 1)) + small, parts.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err.rfind("tollgate: error: the parts disagree on max-file-size: ", 0) == 0);
    }
    SECTION("a part measured under a draft policy is refused beside one without") {
        repo.write("draft.yaml", "tollgate-policy: 1\npaths:\n  include: [\"src/**\"]\nrules:\n"
                                 "  - id: effort-growth\n    kind: growth\n    measure: effort\n"
                                 "    max-increase-percent: 50\n    level: blocking\n");
        const std::string draft = " --policy " + shell_quote(repo.path() + "/draft.yaml");
        const std::string drafted = shard("d2.json", "--shard 2/2" + draft);
        const auto result = run_tollgate(
            "calibrate --merge" + files.substr(0, files.find(" ", 1)) + drafted, parts.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err.rfind("tollgate: error: the parts disagree on draft-policy: ", 0) == 0);

        SECTION("and --policy at the merge must be the shards' own draft") {
            const auto other = run_tollgate("calibrate --merge" + files + draft, parts.path());
            CHECK(other.exit_code == 2);
            CHECK(other.err == "tollgate: error: --policy \"" + repo.path() +
                                   "/draft.yaml\" is not the policy the parts were measured "
                                   "with (give the same --policy to every shard)\n");
        }
    }
}
