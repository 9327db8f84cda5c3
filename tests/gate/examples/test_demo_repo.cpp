// SPDX-License-Identifier: MIT
// The demo scenario: examples/make_demo_repo.sh builds the invented skyline-sensors history, and
// the real binary blocks its first pull request, passes its second and blocks its third (Java).
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <string>

using tollgate::test::run_command;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

const std::string k_builder = std::string(TOLLGATE_SOURCE_DIR) + "/examples/make_demo_repo.sh";

} // namespace

TEST_CASE("make_demo_repo.sh builds a history the gate blocks once and passes once", "[examples]") {
    TempDir dir;
    const std::string repo = dir.path() + "/skyline";
    const auto built =
        run_command("bash " + shell_quote(k_builder) + " " + shell_quote(repo), dir.path());
    INFO(built.err);
    REQUIRE(built.exit_code == 0);
    // main, and one branch per pull request, each one commit ahead of main.
    CHECK(run_command("git rev-list --count main..filter-outliers", repo).out == "1\n");
    CHECK(run_command("git rev-list --count main..crc-simplify", repo).out == "1\n");
    CHECK(run_command("git rev-list --count main..decoder-resync", repo).out == "1\n");

    SECTION("the filter's bloated update step is blocked by the repository's policy") {
        const auto result = run_tollgate(
            "check --base main --head filter-outliers --report json:- --no-color", repo);
        INFO(result.err);
        REQUIRE(result.exit_code == 1);
        const auto report = nlohmann::json::parse(result.out);
        REQUIRE(report["functions"].size() == 1);
        CHECK(report["functions"][0]["function"] == "skyline::FusionFilter::update");
        CHECK(report["functions"][0]["label"] == "changed");
    }
    SECTION("the simpler CRC passes") {
        const auto result =
            run_tollgate("check --base main --head crc-simplify --report text:-", repo);
        INFO(result.err);
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("skyline_crc16") != std::string::npos);
        CHECK(result.out.find("verdict: pass") != std::string::npos);
    }
    SECTION("the Java ground station's bloated decoder is blocked by the same policy") {
        const auto result = run_tollgate(
            "check --base main --head decoder-resync --report json:- --no-color", repo);
        INFO(result.err);
        REQUIRE(result.exit_code == 1);
        const auto report = nlohmann::json::parse(result.out);
        REQUIRE(report["functions"].size() == 1);
        CHECK(report["functions"][0]["function"] == "com.skyline.ground.FrameDecoder.decode");
        CHECK(report["functions"][0]["label"] == "changed");
        CHECK(report["convention"] == "c-family/2, java/1");
    }
    SECTION("the builder refuses a folder that is not empty") {
        const auto again =
            run_command("bash " + shell_quote(k_builder) + " " + shell_quote(repo), dir.path());
        CHECK(again.exit_code == 2);
        CHECK(again.err.find("is not empty") != std::string::npos);
    }
}
