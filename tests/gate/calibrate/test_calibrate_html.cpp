// SPDX-License-Identifier: MIT
// The calibrate HTML page, loaded in headless Chromium: its SVG histograms and numbers in the DOM.
#include "calibrate_test_support.hpp"

#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <nlohmann/json.hpp>

using tollgate::test::make_scripted_history;
using tollgate::test::run_command;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

std::size_t count_of(const std::string& text, const std::string& needle) {
    std::size_t count = 0;
    for (auto pos = text.find(needle); pos != std::string::npos; pos = text.find(needle, pos + 1)) {
        ++count;
    }
    return count;
}

} // namespace

TEST_CASE("write_calibration_html in a browser", "[calibrate]") {
    if (run_command("command -v chromium", ".").exit_code != 0) {
        WARN("chromium is not installed: the HTML page was not loaded in a browser "
             "(apt-get install chromium)");
        return;
    }
    TempDir repo, cache, profile;
    make_scripted_history(repo.path() + "/r");
    const std::string dir = repo.path() + "/r";
    const std::string page = repo.path() + "/calibrate.html";
    const auto run = run_tollgate("calibrate --no-pch-cache --format json --cache-dir " +
                                      shell_quote(cache.path()) + " --html " + shell_quote(page),
                                  dir);
    INFO(run.err);
    REQUIRE(run.exit_code == 0);
    const auto doc = nlohmann::json::parse(run.out);

    const auto dom = run_command(
        "chromium --headless --no-sandbox --disable-gpu --disable-background-networking "
        "--disable-component-update --disable-sync --no-first-run --user-data-dir=" +
            shell_quote(profile.path()) + " --dump-dom " + shell_quote("file://" + page) +
            " 2>/dev/null",
        repo.path());
    REQUIRE(dom.exit_code == 0);
    INFO(dom.out.substr(0, 2000));

    SECTION("the browser built one SVG histogram per non-empty series") {
        std::size_t series = 0;
        for (const char* measure : {"volume", "difficulty", "effort"}) {
            for (const char* key : {"growth", "growth_percent", "added"}) {
                if (!doc["measures"][measure][key]["histogram"].empty()) {
                    ++series;
                    CHECK(dom.out.find(fmt::format("id=\"hist-{}-{}\"", measure, key)) !=
                          std::string::npos);
                }
            }
        }
        CHECK(series > 0);
        CHECK(count_of(dom.out, "<svg class=\"histogram\"") == series);
        CHECK(count_of(dom.out, "<rect class=\"bar\"") > series);
    }
    SECTION("the percentile tables show the report's numbers") {
        for (const char* measure : {"volume", "difficulty", "effort"}) {
            const auto& s = doc["measures"][measure]["growth"]["summary"];
            const std::string row = fmt::format(
                "<td>{}</td><td>{:.2f}</td><td>{:.2f}</td><td>{:.2f}</td><td>{:.2f}</td>"
                "<td>{:.2f}</td><td>{:.2f}</td>",
                s["count"].get<int>(), s["p50"].get<double>(), s["p75"].get<double>(),
                s["p90"].get<double>(), s["p95"].get<double>(), s["p99"].get<double>(),
                s["max"].get<double>());
            INFO(measure << ": " << row);
            CHECK(dom.out.find(row) != std::string::npos);
        }
    }
    SECTION("the page needs nothing from outside") {
        const std::string html = tollgate::test::read_text(page);
        CHECK(html.find("<script") == std::string::npos);
        CHECK(count_of(html, "http://") == count_of(html, "http://www.w3.org/2000/svg"));
        CHECK(html.find("https://") == std::string::npos);
    }
}
