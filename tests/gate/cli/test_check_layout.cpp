// SPDX-License-Identifier: MIT
// The terminal report of the real binary on a real repository: it fits COLUMNS, compiler
// diagnostics are one line before the verdict (listed with -v on stderr, kept whole in JSON),
// and -w/--wide shows everything.
#include "gate/common/text_safety.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <sstream>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::run_command;
using tollgate::test::TempDir;

namespace {

std::vector<std::string> lines_of(const std::string& text) {
    std::vector<std::string> lines;
    std::istringstream in(text);
    for (std::string line; std::getline(in, line);) {
        lines.push_back(line);
    }
    return lines;
}

// A change to a deeply nested, long-named member in a long path that blocks, a dozen other
// functions that grow, and a missing header in two files (parse warnings on both sides).
struct History {
    std::string base, head;
};

const char* const k_name = "skyline_station::firmware::sensor_fusion::detail::"
                           "ExtendedKalmanFilterWithAdaptiveNoise::update_measurement";

History nested_history(TempDir& dir) {
    init_repo(dir.path());
    const std::string path = "src/firmware/sensor_fusion/detail/extended_kalman_filter_with_"
                             "adaptive_noise_estimation.cpp";
    const auto source = [](bool grown) {
        std::string text = "#include \"vendor_board_support_package/sensor_hal.h\"\n"
                           "namespace skyline_station { namespace firmware { namespace "
                           "sensor_fusion { namespace detail {\n"
                           "struct ExtendedKalmanFilterWithAdaptiveNoise {\n"
                           "    int update_measurement(int a);\n};\n"
                           "int ExtendedKalmanFilterWithAdaptiveNoise::update_measurement(int a) "
                           "{\n";
        text += grown ? "    if (a > 10) {\n        return a * a - 3 + a / 7;\n    }\n"
                        "    return a + 1;\n}\n"
                      : "    return a + 1;\n}\n";
        text += "}}}}\n";
        return text;
    };
    std::string many_base, many_head;
    for (int i = 0; i < 12; ++i) {
        const std::string n = std::to_string(i);
        many_base += "int helper_" + n + "(int v) {\n    return v + " + n + ";\n}\n\n";
        many_head += "int helper_" + n + "(int v) {\n    return v * v + " + n + ";\n}\n\n";
    }
    dir.write(path, source(false));
    dir.write("src/helpers.c",
              "#include \"vendor_board_support_package/sensor_hal.h\"\n" + many_base);
    dir.write(".tollgate.yaml", "tollgate-policy: 1\nrules:\n"
                                "  - {id: effort-growth, kind: growth, measure: effort, "
                                "max-increase-percent: 300}\n");
    History h;
    h.base = commit_all(dir.path(), "base");
    dir.write(path, source(true));
    dir.write("src/helpers.c",
              "#include \"vendor_board_support_package/sensor_hal.h\"\n" + many_head);
    h.head = commit_all(dir.path(), "head");
    return h;
}

tollgate::test::RunResult check(const TempDir& dir, const History& h, const std::string& env,
                                const std::string& extra) {
    return run_command(env + " " + std::string(TOLLGATE_BINARY) +
                           " check --no-pch-cache --no-color --base " + h.base + " --head " +
                           h.head + " " + extra,
                       dir.path());
}

} // namespace

TEST_CASE("check fits the terminal report to COLUMNS", "[check]") {
    TempDir dir;
    const History h = nested_history(dir);
    const auto run = check(dir, h, "COLUMNS=100", "");
    INFO(run.out << run.err);
    REQUIRE(run.exit_code == 1);
    const auto lines = lines_of(run.out);
    SECTION("no line is longer than 100 columns") {
        for (const auto& line : lines) {
            INFO(line);
            CHECK(tollgate::text::display_width(line) <= 100);
        }
    }
    SECTION("the long name keeps its last two scopes") {
        CHECK(run.out.find("ExtendedKalmanFilterWithAdaptiveNoise::update_measurement") !=
              std::string::npos);
        CHECK(run.out.find(k_name) == std::string::npos);
    }
    SECTION("diagnostics are one counted line before the verdict, with the compile database "
            "hint") {
        std::size_t counted = lines.size(), verdict = lines.size();
        for (std::size_t i = 0; i < lines.size(); ++i) {
            if (lines[i].find(" parse warnings in 2 files; see --report json or -v") !=
                std::string::npos) {
                counted = i;
            }
            if (lines[i].rfind("verdict: BLOCKED", 0) == 0) {
                verdict = i;
            }
        }
        REQUIRE(counted < lines.size());
        REQUIRE(verdict < lines.size());
        CHECK(counted < verdict);
        CHECK(run.out.find("sensor_hal.h' file not found") == std::string::npos);
        CHECK(run.out.find("2 files were parsed without a compile database: ") !=
              std::string::npos);
        CHECK(run.out.find("--compile-commands PATH") != std::string::npos); // wrapped before
    }
    SECTION("the blocked function is under the verdict with the command that explains it") {
        CHECK(run.out.find("  block  ") != std::string::npos);
        // Name and path are too long for one 100-column line: the command takes PATH:LINE.
        CHECK(run.out.find("why: tollgate explain") != std::string::npos);
    }
}

TEST_CASE("check -w shows whole names and every column; -v lists diagnostics on stderr",
          "[check]") {
    TempDir dir;
    const History h = nested_history(dir);
    const auto wide = check(dir, h, "COLUMNS=100", "-w -v");
    INFO(wide.out << wide.err);
    REQUIRE(wide.exit_code == 1);
    CHECK(wide.out.find(k_name) != std::string::npos);
    for (const char* title : {"volume", "difficulty", "rules", "label", "effort change"}) {
        CHECK(wide.out.find(title) != std::string::npos);
    }
    CHECK(wide.out.find("sensor_hal.h' file not found") == std::string::npos);
    CHECK(wide.err.find("warning: head src/helpers.c:1: 'vendor_board_support_package/"
                        "sensor_hal.h' file not found") != std::string::npos);

    SECTION("the JSON report keeps every warning and groups them by missing header") {
        const auto json_run = check(dir, h, "", "--report json:-");
        const auto doc = nlohmann::json::parse(json_run.out);
        const auto& diagnostics = doc["diagnostics"];
        CHECK(diagnostics["warnings"].get<std::size_t>() == doc["warnings"].size());
        REQUIRE(diagnostics["missing_headers"].size() >= 1);
        const auto& group = diagnostics["missing_headers"][0];
        CHECK(group["header"] == "vendor_board_support_package/sensor_hal.h");
        CHECK(group["files"].size() == 2);
        CHECK(diagnostics["compile_database"] == false);
        CHECK(diagnostics["files_without_compile_flags"] == 2);
        CHECK(diagnostics["hint"].get<std::string>().find("--compile-commands") !=
              std::string::npos);
    }
}
