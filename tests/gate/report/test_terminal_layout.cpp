// SPDX-License-Identifier: MIT
// Terminal tables fitted to a width: names shortened from the left keeping their last two
// scopes, locations keeping the file name, columns dropped in the documented order, lines wrapped.
#include "gate/common/text_safety.hpp"
#include "gate/report/terminal_layout.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using report::Fit;
using report::Shorten;

namespace {

const std::string k_ellipsis = "\xE2\x80\xA6";

std::size_t widest(const std::vector<std::string>& lines) {
    std::size_t width = 0;
    for (const auto& line : lines) {
        width = std::max(width, text::display_width(line));
    }
    return width;
}

} // namespace

TEST_CASE("shorten_name drops leading scopes and keeps the last two", "[report]") {
    const std::string name = "skyline::sensors::detail::FusionFilter::update";
    SECTION("a name that fits is unchanged") {
        CHECK(report::shorten_name(name, 100, 2) == name);
    }
    SECTION("leading scopes go one at a time, as few as needed") {
        CHECK(report::shorten_name(name, 40, 2) ==
              k_ellipsis + "::sensors::detail::FusionFilter::update");
        CHECK(report::shorten_name(name, 38, 2) == k_ellipsis + "::detail::FusionFilter::update");
        CHECK(report::shorten_name(name, 25, 2) == k_ellipsis + "::FusionFilter::update");
    }
    SECTION("past the last two scopes, characters go from the left") {
        const std::string cut = report::shorten_name(name, 12, 2);
        CHECK(cut == k_ellipsis + "ter::update");
        CHECK(text::display_width(cut) <= 12);
    }
    SECTION("template arguments and parameters stay with their scope") {
        CHECK(report::shorten_name("ns::Map<std::string, int>::find", 30, 2) ==
              k_ellipsis + "::Map<std::string, int>::find");
        CHECK(report::shorten_name("a::b::operator<", 15, 2) == "a::b::operator<");
        CHECK(report::shorten_name("a::b::operator<", 14, 2) == k_ellipsis + "b::operator<");
    }
}

TEST_CASE("shorten_location keeps the file name and line", "[report]") {
    const std::string location = "src/firmware/sensors/fusion_filter.cpp:120";
    CHECK(report::shorten_location(location, 100) == location);
    CHECK(report::shorten_location(location, 34) == k_ellipsis + "/sensors/fusion_filter.cpp:120");
    CHECK(report::shorten_location(location, 26) == k_ellipsis + "/fusion_filter.cpp:120");
    const std::string cut = report::shorten_location(location, 12);
    CHECK(cut == k_ellipsis + "ter.cpp:120"); // the line number is never cut
    CHECK(text::display_width(cut) == 12);
    CHECK(report::shorten_location(location, 15) == k_ellipsis + "filter.cpp:120");
}

TEST_CASE("layout_table fits a width by shortening, then dropping columns", "[report]") {
    const std::vector<report::TableColumn> columns = {
        {"function", false, Shorten::name, 0}, {"location", false, Shorten::location, 0},
        {"change", true, Shorten::none, 0},    {"volume", true, Shorten::none, 1},
        {"rules", false, Shorten::text, 2},
    };
    const std::vector<std::vector<std::string>> rows = {
        {"skyline::sensors::detail::FusionFilter::update",
         "src/firmware/sensors/fusion_filter.cpp:120", "+6,949 (+278%)", "156.1 -> 322.0",
         "effort-growth, difficulty-ceiling"},
        {"crc16", "src/crc16.c:6", "-7,626 (-59%)", "442.6 -> 280.5", ""},
    };
    SECTION("a table that fits is shown whole") {
        const auto lines = report::layout_table(columns, rows, 200, Fit::to_width);
        CHECK(lines.size() == 3);
        CHECK(lines[1].find("skyline::sensors::detail::FusionFilter::update") != std::string::npos);
        CHECK(lines[0].find("volume") != std::string::npos);
    }
    SECTION("shortening alone is enough at 120 columns: every column stays") {
        const auto lines = report::layout_table(columns, rows, 120, Fit::to_width);
        CHECK(widest(lines) <= 120);
        CHECK(lines[0].find("volume") != std::string::npos);
        CHECK(lines[0].find("rules") != std::string::npos);
    }
    SECTION("at 100 columns volume goes first; at 60, rules too") {
        // Shortened to whole scopes the table needs 115 columns; without volume 99; without
        // rules 64, then names and locations are cut further.
        const auto lines = report::layout_table(columns, rows, 100, Fit::to_width);
        CHECK(widest(lines) <= 100);
        CHECK(lines[0].find("volume") == std::string::npos);
        CHECK(lines[0].find("rules") != std::string::npos);
        const auto narrow = report::layout_table(columns, rows, 60, Fit::to_width);
        CHECK(widest(narrow) <= 60);
        CHECK(narrow[0].find("rules") == std::string::npos);
        CHECK(narrow[0].find("change") != std::string::npos);
        CHECK(narrow[1].find("FusionFilter::update") != std::string::npos);
        CHECK(narrow[1].find("filter.cpp:120") != std::string::npos);
    }
    SECTION("wide shows everything, whatever the width") {
        const auto lines = report::layout_table(columns, rows, 40, Fit::wide);
        CHECK(lines[1].find("skyline::sensors::detail::FusionFilter::update") != std::string::npos);
        CHECK(lines[1].find("src/firmware/sensors/fusion_filter.cpp:120") != std::string::npos);
        CHECK(lines[0].find("volume") != std::string::npos);
    }
    SECTION("non-ASCII names align by display width, not bytes") {
        const std::vector<std::vector<std::string>> wide_rows = {
            {"\xE6\xB8\xAC\xE9\x87\x8F::run", "a.c:1", "+1 (+1%)", "1 -> 2", ""},
            {"caf\xC3\xA9::run", "b.c:2", "+2 (+2%)", "1 -> 3", ""},
        };
        const auto lines = report::layout_table(columns, wide_rows, 200, Fit::to_width);
        CHECK(text::display_width(lines[1].substr(0, lines[1].find("a.c"))) ==
              text::display_width(lines[2].substr(0, lines[2].find("b.c"))));
    }
}

TEST_CASE("wrap_text breaks lines at spaces within the width", "[report]") {
    const std::string sentence =
        "  blocking  src/fusion_filter.cpp:16: skyline::FusionFilter::update(double): effort "
        "+6,949 (+278%) exceeds the limit +100% by 178 points (rule \"effort-growth\", blocking)";
    SECTION("every line fits and no word is lost") {
        const auto lines = report::wrap_text(sentence, 60, 4, Fit::to_width);
        CHECK(lines.size() > 1);
        CHECK(widest(lines) <= 60);
        std::string joined;
        for (const auto& line : lines) {
            joined += line;
        }
        for (const char* word : {"blocking", "+6,949", "\"effort-growth\","}) {
            CHECK(joined.find(word) != std::string::npos);
        }
        CHECK(lines[1].rfind("    ", 0) == 0);
        CHECK(lines[0].rfind("  blocking", 0) == 0);
    }
    SECTION("a word longer than a line is broken inside it") {
        const std::string path(150, 'x');
        const auto lines = report::wrap_text("skipped: " + path, 50, 2, Fit::to_width);
        CHECK(widest(lines) <= 50);
        std::size_t xs = 0;
        for (const auto& line : lines) {
            xs += static_cast<std::size_t>(std::count(line.begin(), line.end(), 'x'));
        }
        CHECK(xs == 150);
    }
    SECTION("wide keeps one line") {
        CHECK(report::wrap_text(sentence, 60, 4, Fit::wide).size() == 1);
    }
}
