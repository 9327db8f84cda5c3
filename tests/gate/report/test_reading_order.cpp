// SPDX-License-Identifier: MIT
// Findings grouped per function in reading order, and compiler diagnostics summed up.
#include "../policy/policy_test_support.hpp"
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "gate/report/reading_order.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;

TEST_CASE("order_for_reading groups findings per function, blocking ones first", "[report]") {
    // Measures from policy_test_support (E: small 768, medium 1,064, large 3,072; D 6, 7, 12):
    // update grows most and breaks a blocking and a warning rule; crc16 only a warning rule;
    // ring and add break nothing; the budget breaks for the whole change.
    auto report = test::report_of({
        test::changed("ring::push", "src/ring.cpp", 5, test::small_measures(),
                      test::medium_measures()),
        test::changed("Kalman::update", "src/filter.cpp", 120, test::small_measures(),
                      test::large_measures()),
        test::changed("crc16", "src/crc.c", 3, test::large_measures(), test::large_measures()),
        test::added("add", "src/math.c", 9, test::small_measures()),
    });
    delta::sort_deltas(report.functions);
    delta::compute_totals(report);
    const auto policy = policy::load_policy(R"(tollgate-policy: 1
rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 100}
  - {id: difficulty-ceiling, kind: ceiling, measure: difficulty, ceiling: 10, level: warning}
  - {id: change-budget, kind: budget, measure: effort, max-total-increase: 1000}
)",
                                            "team.yaml");
    policy::JudgeOptions options;
    options.today = "2026-05-01";
    const auto verdict = policy::judge(policy, report, options);
    const auto order = report::order_for_reading(report, verdict);

    REQUIRE(order.blocking.size() == 2);
    CHECK(order.blocking[0].function == "Kalman::update");
    CHECK(order.blocking[0].delta == &report.functions[0]);
    REQUIRE(order.blocking[0].findings.size() == 2); // one entry, both of its rules
    CHECK(order.blocking[0].findings[0]->rule_id == "effort-growth");
    CHECK(order.blocking[0].findings[1]->rule_id == "difficulty-ceiling");
    CHECK(order.blocking[1].function.empty()); // the whole change, last
    CHECK(order.blocking[1].findings[0]->rule_id == "change-budget");
    REQUIRE(order.warning.size() == 1);
    CHECK(order.warning[0].function == "crc16");
    CHECK(order.warning[0].standing == report::Standing::warns);
    REQUIRE(order.others.size() == 2);
    CHECK(order.others[0]->name == "add"); // report order: +768 before +296
    CHECK(order.others[1]->name == "ring::push");

    SECTION("finding_detail leaves out the place the entry already shows") {
        CHECK(report::finding_detail(*order.blocking[0].findings[0]).rfind("effort +", 0) == 0);
        CHECK(report::finding_detail(*order.blocking[1].findings[0]).rfind("effort +", 0) == 0);
        policy::Finding odd;
        odd.message = "something else entirely";
        CHECK(report::finding_detail(odd) == "something else entirely");
    }
}

TEST_CASE("explain_command quotes what a shell would read", "[report]") {
    CHECK(report::explain_command("src/filter.cpp", "Kalman::update") ==
          "tollgate explain src/filter.cpp:Kalman::update");
    CHECK(report::explain_command("src/flags.cpp", "operator|") ==
          "tollgate explain 'src/flags.cpp:operator|'");
    // POSIX shell single quotes: nothing inside is special; a quote is closed, escaped, reopened.
    CHECK(report::explain_command("src/$(touch x)'.c", "f") ==
          "tollgate explain 'src/$(touch x)'\\''.c:f'");
    // The quoted command, run through a real shell, gives back the argument unchanged.
    const auto echoed = test::run_command(
        "printf '%s' " + report::explain_command("src/$(touch x)'.c", "f").substr(17), ".");
    CHECK(echoed.out == "src/$(touch x)'.c:f");
}

TEST_CASE("summarise_diagnostics groups warnings by missing header", "[report]") {
    // clang's wording (from memory, and as the lexer passes it on): "'NAME' file not found".
    CHECK(report::missing_header_of("'sensor_hal.h' file not found") == "sensor_hal.h");
    CHECK(report::missing_header_of(
              "in \"include/station.h\": 'boost/optional.hpp' file not found") ==
          "boost/optional.hpp");
    CHECK(report::missing_header_of("'x.h' file not found with <angled> include; use \"quotes\" "
                                    "instead") == "x.h");
    CHECK(report::missing_header_of("unknown type name 'uint8'").empty());
    // The lexer's own wording of a missing or refused include (gate/lexer/parse_diagnostics.cpp).
    CHECK(report::missing_header_of("include \"hal.h\" not found (only the revision's files, the "
                                    "system include folders and those of a compile database "
                                    "given with --compile-commands are read)") == "hal.h");
    CHECK(report::missing_header_of("in \"inc/x.h\": include \"cfg.h\" not found (...)") ==
          "cfg.h");

    const std::vector<delta::ChangeWarning> warnings = {
        {"head", "src/a.c", 1, "'hal.h' file not found"},
        {"base", "src/a.c", 1, "'hal.h' file not found"},
        {"head", "src/b.c", 2, "'hal.h' file not found"},
        {"head", "src/b.c", 0, "in \"inc/x.h\": 'cfg.h' file not found"},
        {"head", "src/c.c", 9, "unknown type name 'u8'"},
        {"head", "src/c.c", 0, "12 more errors"},
    };
    const auto summary = report::summarise_diagnostics(warnings);
    CHECK(summary.warnings == 5 + 12);
    CHECK(summary.files == 3);
    REQUIRE(summary.missing_headers.size() == 2);
    CHECK(summary.missing_headers[0].header == "hal.h");
    CHECK(summary.missing_headers[0].warnings == 3);
    CHECK(summary.missing_headers[0].files == std::vector<std::string>{"src/a.c", "src/b.c"});
    CHECK(summary.missing_headers[1].header == "cfg.h");
    CHECK(summary.rest.size() == 2);
    CHECK(report::diagnostics_count_text(summary) == "17 parse warnings in 3 files");

    SECTION("the compile database hint is given once there are warnings and files without one") {
        delta::ChangeReport report;
        report.warnings = warnings;
        report.files_without_compile_flags = 3;
        CHECK(report::compile_database_hint(report, summary) ==
              "3 files were parsed without a compile database: to parse with the build's flags, "
              "give one with --compile-commands PATH (CMake writes it with "
              "-DCMAKE_EXPORT_COMPILE_COMMANDS=ON); or name the folders of headers not in the "
              "repository with --include-dir DIR");
        report.compile_database = true;
        report.files_without_compile_flags = 1;
        CHECK(report::compile_database_hint(report, summary)
                  .rfind("1 file had no entry in the compile database: ", 0) == 0);
        report.files_without_compile_flags = 0;
        // Every file had flags, but headers were missing: how to name their folders.
        CHECK(report::compile_database_hint(report, summary) == report::include_folder_hint());
        report.files_without_compile_flags = 2;
        CHECK(report::compile_database_hint(report, report::summarise_diagnostics({})).empty());
    }
}
