// SPDX-License-Identifier: MIT
// The progress meter driven by a scripted clock: when lines appear, the rate and the time left.
#include "gate/common/errors.hpp"
#include "gate/common/progress.hpp"

#include <catch2/catch.hpp>
#include <sstream>

using namespace tollgate;

namespace {

// Count the lines of `text`.
std::size_t line_count(const std::string& text) {
    return static_cast<std::size_t>(std::count(text.begin(), text.end(), '\n'));
}

} // namespace

TEST_CASE("progress_line", "[common]") {
    SECTION("the time left is what remains at the observed rate") {
        // 12 of 60 in 6 s: 2 per second, 48 left take 24 s.
        CHECK(progress_line("calibrate", "commits", 12, 60, 6.0) ==
              "calibrate: 12/60 commits, 2.0 commits/s, about 24 s left");
        CHECK(progress_line("snapshot", "files", 10, 400, 20.0) ==
              "snapshot: 10/400 files, 0.5 files/s, about 13 min 0 s left");
    }
    SECTION("before the first step the time left is unknown") {
        CHECK(progress_line("calibrate", "commits", 0, 60, 3.0) ==
              "calibrate: 0/60 commits, time left unknown");
    }
}

TEST_CASE("ProgressMeter", "[common]") {
    double now = 100;
    const auto clock = [&now] { return now; };
    std::ostringstream out;

    SECTION("a log gets a line each interval, not each step, then a closing line") {
        ProgressMeter meter("calibrate", "commits", ProgressMode::automatic,
                            ProgressStyle::periodic_lines, out, 10, clock);
        for (std::size_t done = 1; done <= 30; ++done) {
            now += 1; // one commit a second: lines at 10, 20 and 30 s
            meter.update(done, 30);
        }
        meter.finish();
        CHECK(out.str() == "calibrate: 10/30 commits, 1.0 commits/s, about 20 s left\n"
                           "calibrate: 20/30 commits, 1.0 commits/s, about 10 s left\n"
                           "calibrate: 30/30 commits, 1.0 commits/s, about 0 s left\n"
                           "calibrate: 30/30 commits in 30 s\n");
    }
    SECTION("work shorter than one interval stays quiet in auto mode") {
        ProgressMeter meter("calibrate", "commits", ProgressMode::automatic,
                            ProgressStyle::periodic_lines, out, 10, clock);
        now += 3;
        meter.update(5, 5);
        meter.finish();
        CHECK(out.str().empty());
    }
    SECTION("always shows the first step at once and closes even short work") {
        ProgressMeter meter("snapshot", "files", ProgressMode::always,
                            ProgressStyle::periodic_lines, out, 10, clock);
        now += 2;
        meter.update(1, 4);
        now += 2;
        meter.update(2, 4);
        meter.finish();
        CHECK(out.str() == "snapshot: 1/4 files, 0.5 files/s, about 6 s left\n"
                           "snapshot: 2/4 files in 4 s\n");
    }
    SECTION("a rate that changes changes the estimate") {
        ProgressMeter meter("check", "files", ProgressMode::automatic,
                            ProgressStyle::periodic_lines, out, 5, clock);
        now += 5;
        meter.update(10, 100); // 2 per second: 45 s left
        now += 15;
        meter.update(20, 100); // 1 per second overall: 80 s left
        CHECK(out.str() == "check: 10/100 files, 2.0 files/s, about 45 s left\n"
                           "check: 20/100 files, 1.0 files/s, about 1 min 20 s left\n");
    }
    SECTION("an interval of zero shows every step") {
        ProgressMeter meter("calibrate", "commits", ProgressMode::automatic,
                            ProgressStyle::periodic_lines, out, 0, clock);
        for (std::size_t done = 1; done <= 7; ++done) {
            meter.update(done, 7);
        }
        meter.finish();
        CHECK(line_count(out.str()) == 8);
    }
    SECTION("a terminal gets one line rewritten in place, closed by a line break") {
        ProgressMeter meter("calibrate", "commits", ProgressMode::automatic,
                            ProgressStyle::live_line, out, 10, clock);
        now += 1;
        meter.update(1, 2);
        now += 1;
        meter.update(2, 2);
        meter.finish();
        CHECK(out.str() == "\rcalibrate: 1/2 commits, 1.0 commits/s, about 1 s left   "
                           "\rcalibrate: 2/2 commits, 1.0 commits/s, about 0 s left   \n");
    }
    SECTION("never shows nothing") {
        ProgressMeter meter("calibrate", "commits", ProgressMode::never,
                            progress_style(ProgressMode::never, false), out, 0, clock);
        meter.update(1, 1);
        meter.finish();
        CHECK(out.str().empty());
    }
}

TEST_CASE("parse_progress_mode", "[common]") {
    SECTION("the three names are known") {
        CHECK(parse_progress_mode("auto") == ProgressMode::automatic);
        CHECK(parse_progress_mode("always") == ProgressMode::always);
        CHECK(parse_progress_mode("never") == ProgressMode::never);
    }
    SECTION("another name is refused with the choices") {
        CHECK_THROWS_WITH(parse_progress_mode("sometimes"),
                          "unknown progress mode \"sometimes\" (give auto, always or never)");
    }
    SECTION("a terminal gets a live line, anything else periodic lines") {
        CHECK(progress_style(ProgressMode::automatic, true) == ProgressStyle::live_line);
        CHECK(progress_style(ProgressMode::always, false) == ProgressStyle::periodic_lines);
    }
}

TEST_CASE("duration_text", "[common]") {
    CHECK(duration_text(0.4) == "0 s");
    CHECK(duration_text(59) == "59 s");
    CHECK(duration_text(185) == "3 min 5 s");
    CHECK(duration_text(7800) == "2 h 10 min");
}
