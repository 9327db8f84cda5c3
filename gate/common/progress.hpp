// SPDX-License-Identifier: MIT
// Progress of long work on stderr: a line rewritten in place on a terminal, a line every few
// seconds anywhere else (a CI log), with the time left estimated from the observed rate.
#pragma once

#include <cstddef>
#include <functional>
#include <mutex>
#include <ostream>
#include <string>

namespace tollgate {

// What --progress asks for.
enum class ProgressMode {
    automatic, // a live line on a terminal; elsewhere a line every interval, none for short work
    always,    // as automatic, and a first line at once and a closing line however short the work
    never,     // nothing
};

// Return the mode named `name` ("auto", "always", "never"). Throws UsageError for another name.
ProgressMode parse_progress_mode(const std::string& name);

// How progress is shown.
enum class ProgressStyle {
    live_line,      // one line rewritten in place ("\r"), for a terminal
    periodic_lines, // whole lines, one per interval, for logs
    none,           // nothing
};

// Return the style for `mode` when stderr `is_terminal` or not.
ProgressStyle progress_style(ProgressMode mode, bool is_terminal);

// Return whether standard error is a terminal.
bool stderr_is_terminal();

// Return the seconds between two periodic lines: $TOLLGATE_PROGRESS_SECONDS when it is a
// number of 0 or more (0: a line for every step), else 10.
double progress_interval_seconds();

// Return one progress line, e.g. "calibrate: 12/60 commits, 2.0 commits/s, about 24 s left":
// the rate is `done` over `elapsed` seconds and the time left is what remains at that rate
// ("time left unknown" before the first step or the first instant). Never fails.
std::string progress_line(const std::string& what, const std::string& unit, std::size_t done,
                          std::size_t total, double elapsed);

// Return `seconds` for a reader: "40 s", "3 min 5 s", "2 h 10 min". Never fails.
std::string duration_text(double seconds);

// Reports the steps of one piece of work. Thread-safe.
class ProgressMeter {
public:
    // Seconds since some fixed instant; the meter reads it at each step.
    using Clock = std::function<double()>;

    // Report `what` ("calibrate") counting `unit` ("commits") to `out` in `style`, a periodic
    // line every `interval` seconds; `mode` always adds a first and a closing line. `clock`
    // defaults to the steady clock.
    ProgressMeter(std::string what, std::string unit, ProgressMode mode, ProgressStyle style,
                  std::ostream& out, double interval, Clock clock = {});

    // Record that `done` of `total` steps are finished, and show it when it is time.
    void update(std::size_t done, std::size_t total);
    // End the report: the live line is closed, and a closing line with the time taken is written
    // when a periodic line was shown or the mode is always.
    void finish();
    // Return the lines written so far (live-line rewrites count once each).
    std::size_t lines() const;

private:
    void write(const std::string& text);

    std::string m_what;
    std::string m_unit;
    ProgressMode m_mode;
    ProgressStyle m_style;
    std::ostream& m_out;
    double m_interval;
    Clock m_clock;
    double m_start = 0;
    double m_last_line = 0;
    std::size_t m_done = 0;
    std::size_t m_total = 0;
    std::size_t m_lines = 0;
    bool m_live_open = false;
    mutable std::mutex m_mutex;
};

} // namespace tollgate
