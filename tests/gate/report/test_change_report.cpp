// SPDX-License-Identifier: MIT
// Approval tests of the change-report renderers: the output for a fixed report is compared with
// the reviewed files in tests/approved/. Set TOLLGATE_APPROVE=1 to rewrite them after a reviewed
// change of format (then read the diff before committing).
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "gate/report/change_report.hpp"
#include "support/temp_repo.hpp"
#include "tollgate/core/counts.hpp"

#include <catch2/catch.hpp>
#include <cstdlib>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

using namespace tollgate;

namespace {

delta::FunctionSide side(const std::string& path, unsigned line, std::uint64_t n1, std::uint64_t n2,
                         std::uint64_t N1, std::uint64_t N2) {
    delta::FunctionSide s;
    s.path = path;
    s.start_line = line;
    s.end_line = line + 9;
    s.token_hash = std::to_string(n1 * 1000 + n2 * 100 + N1 * 10 + N2);
    s.measures = core::compute_measures(core::counts_from_totals(n1, n2, N1, N2), 2);
    return s;
}

delta::ChangeReport sample_report() {
    delta::ChangeReport report;
    report.base_label = "main (3f2a91c)";
    report.head_label = "HEAD (9b1c0de)";
    report.base_commit = "3f2a91c000000000000000000000000000000000";
    report.head_commit = "9b1c0de000000000000000000000000000000000";
    report.convention = "c-family/1";
    report.notes = {"base is 3f2a91c, the merge base of HEAD and main"};
    report.measured_files = 2;

    delta::FunctionDelta grew;
    grew.name = "skyline::FusionFilter::update";
    grew.signature = "double";
    grew.identity = "c:@N@skyline@S@FusionFilter@F@update#d#";
    grew.label = delta::DeltaLabel::changed;
    grew.base = side("src/fusion_filter.cpp", 16, 16, 6, 23, 12);
    grew.head = side("src/fusion_filter.cpp", 16, 22, 9, 41, 24);

    delta::FunctionDelta shrank;
    shrank.name = "skyline_crc16";
    shrank.signature = "const uint8_t *, size_t";
    shrank.identity = "c:@F@skyline_crc16";
    shrank.label = delta::DeltaLabel::changed;
    shrank.base = side("src/crc16.c", 6, 23, 11, 59, 28);
    shrank.head = side("src/crc16.c", 6, 18, 9, 40, 19);

    delta::FunctionDelta added;
    added.name = "operator|";
    added.signature = "Flags, Flags";
    added.identity = "c:@F@operator|#$@S@Flags#S0_#";
    added.label = delta::DeltaLabel::added;
    added.head = side("src/flags.cpp", 3, 8, 4, 10, 6);

    report.functions = {grew, shrank, added};
    delta::sort_deltas(report.functions);
    delta::compute_totals(report);
    report.skipped = {{"docs/logo.png", "binary"}};
    return report;
}

// A verdict from a real policy: the effort growth of update blocks, crc16 is above a ceiling.
policy::Verdict sample_verdict(const delta::ChangeReport& report) {
    const auto team_policy = policy::load_policy("tollgate-policy: 1\n"
                                                 "rules:\n"
                                                 "  - id: effort-growth\n"
                                                 "    kind: growth\n"
                                                 "    measure: effort\n"
                                                 "    max-increase-percent: 100\n"
                                                 "  - id: difficulty-ceiling\n"
                                                 "    kind: ceiling\n"
                                                 "    measure: difficulty\n"
                                                 "    ceiling: 18\n"
                                                 "    level: warning\n",
                                                 "team.yaml");
    policy::JudgeOptions options;
    options.today = "2026-12-01";
    options.policy_origin = ".tollgate.yaml at base 3f2a91c";
    auto verdict = policy::judge(team_policy, report, options);
    verdict.policy_change_summary =
        "this change edits .tollgate.yaml; the base's policy judges it until the change is merged";
    verdict.policy_changes = {"rules[\"effort-growth\"].max-increase-percent: 100 in base, 400 in "
                              "head"};
    return verdict;
}

void check_approved(const std::string& name, const std::string& actual) {
    const std::string path = std::string(TOLLGATE_SOURCE_DIR) + "/tests/approved/" + name;
    if (std::getenv("TOLLGATE_APPROVE") != nullptr) {
        std::ofstream(path, std::ios::binary) << actual;
    }
    const std::string approved = test::read_text(path);
    INFO("approved file: " << path << " (TOLLGATE_APPROVE=1 rewrites it)");
    CHECK(actual == approved);
}

} // namespace

TEST_CASE("write_change_text matches the approved terminal table", "[report]") {
    std::ostringstream out;
    const auto report = sample_report();
    report::write_change_text(out, report, sample_verdict(report), {});
    check_approved("change_text.txt", out.str());
}

TEST_CASE("write_change_markdown matches the approved Markdown", "[report]") {
    std::ostringstream out;
    report::RenderOptions options;
    options.markdown_rows = 2;
    options.link_template = "https://git.example/team/station/blob/{commit}/{path}#L{line}";
    const auto report = sample_report();
    report::write_change_markdown(out, report, sample_verdict(report), options);
    check_approved("change_markdown.md", out.str());
}

TEST_CASE("write_change_json carries every measure and delta", "[report]") {
    std::ostringstream out;
    const auto report = sample_report();
    report::write_change_json(out, report, sample_verdict(report));
    const auto json = nlohmann::json::parse(out.str());
    CHECK(json["schema"] == "tollgate.check/1");
    CHECK(json["verdict"]["outcome"] == "blocked");
    REQUIRE(json["verdict"]["findings"].size() == 3);
    CHECK(json["verdict"]["findings"][0]["rule"] == "effort-growth");
    CHECK(json["verdict"]["findings"][0]["level"] == "blocking");
    REQUIRE(json["functions"].size() == 3);
    CHECK(json["functions"][0]["function"] == "skyline::FusionFilter::update");
    const auto& added = json["functions"][1]; // +344 sorts before the shrinking crc16
    CHECK(added["label"] == "added");
    CHECK(added["base"].is_null());
    CHECK(added["delta"]["effort"]["percent"].is_null());
    CHECK(json["functions"][0]["delta"].size() == core::k_all_measures.size());
}

TEST_CASE("group_thousands and format_percent format numbers for reviewers", "[report]") {
    CHECK(report::group_thousands(0.4) == "0");
    CHECK(report::group_thousands(1234567.6) == "1,234,568");
    CHECK(report::group_thousands(-3002.0) == "-3,002");
    CHECK(report::format_percent(std::nullopt) == "new");
    CHECK(report::format_percent(61.4) == "+61%");
    CHECK(report::format_percent(-12.6) == "-13%");
    CHECK(report::format_percent(0.2) == "+0%");
}

namespace {

// Return the lines of `text` that hold `needle`.
std::vector<std::string> lines_with(const std::string& text, const std::string& needle) {
    std::vector<std::string> found;
    std::istringstream in(text);
    for (std::string line; std::getline(in, line);) {
        if (line.find(needle) != std::string::npos) {
            found.push_back(line);
        }
    }
    return found;
}

} // namespace

TEST_CASE("write_change_text colours by the verdict, not by the sign of a change", "[report]") {
    // Okabe and Ito's palette as 256-colour codes: vermillion 166, orange 178, sky blue 74.
    const std::string vermillion = "\x1b[38;5;166m", orange = "\x1b[38;5;178m",
                      sky_blue = "\x1b[38;5;74m";
    report::RenderOptions options;
    options.colour = report::Colour::on;
    options.fit = report::Fit::wide;
    const auto report = sample_report();
    SECTION("a blocked change: rows a finding touches carry colour and a word; others none") {
        std::ostringstream out;
        report::write_change_text(out, report, sample_verdict(report), options);
        const std::string text = out.str();
        INFO(text);
        const auto update = lines_with(text, "changed  skyline::FusionFilter::update");
        REQUIRE(update.size() == 1);
        CHECK(update[0].rfind(vermillion + "block  changed", 0) == 0);
        const auto crc = lines_with(text, "changed  skyline_crc16");
        REQUIRE(crc.size() == 1);
        CHECK(crc[0].rfind(orange + "warn   changed", 0) == 0); // shrank, yet warned
        const auto flags = lines_with(text, "added    operator|");
        REQUIRE(flags.size() == 1);
        CHECK(flags[0].find('\x1b') == std::string::npos); // grew, but no finding: no colour
        CHECK(lines_with(text, vermillion + "verdict: BLOCKED").size() == 1);
    }
    SECTION("a passing change is sky blue, never vermillion, whatever grew") {
        auto verdict = sample_verdict(report);
        verdict.findings.clear();
        verdict.outcome = policy::Outcome::pass;
        verdict.policy_change_summary.clear();
        verdict.policy_changes.clear();
        std::ostringstream out;
        report::write_change_text(out, report, verdict, options);
        INFO(out.str());
        CHECK(out.str().find(vermillion) == std::string::npos);
        CHECK(out.str().find(orange) == std::string::npos);
        CHECK(lines_with(out.str(), sky_blue + "verdict: pass").size() == 1);
    }
}
