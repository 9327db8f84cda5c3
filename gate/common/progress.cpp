// SPDX-License-Identifier: MIT
// The progress meter: when to show a step, and the rate and time left it shows.
#include "gate/common/progress.hpp"

#include "gate/common/errors.hpp"

#include <chrono>
#include <cmath>
#include <cstdlib>
#include <fmt/format.h>
#include <unistd.h>

namespace tollgate {

namespace {

// A terminal line is rewritten at most this often, so a fast loop does not flood it.
constexpr double k_live_interval = 0.2;

double steady_seconds() {
    return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch())
        .count();
}

} // namespace

ProgressMode parse_progress_mode(const std::string& name) {
    if (name == "auto") {
        return ProgressMode::automatic;
    }
    if (name == "always") {
        return ProgressMode::always;
    }
    if (name == "never") {
        return ProgressMode::never;
    }
    throw UsageError("unknown progress mode \"" + name + "\" (give auto, always or never)");
}

bool stderr_is_terminal() {
    return ::isatty(STDERR_FILENO) == 1;
}

ProgressStyle progress_style(ProgressMode mode, bool is_terminal) {
    if (mode == ProgressMode::never) {
        return ProgressStyle::none;
    }
    return is_terminal ? ProgressStyle::live_line : ProgressStyle::periodic_lines;
}

double progress_interval_seconds() {
    if (const char* text = std::getenv("TOLLGATE_PROGRESS_SECONDS")) {
        char* end = nullptr;
        const double value = std::strtod(text, &end);
        if (end != text && *end == '\0' && value >= 0 && std::isfinite(value)) {
            return value;
        }
    }
    return 10;
}

std::string duration_text(double seconds) {
    const auto whole = static_cast<long long>(std::llround(std::max(0.0, seconds)));
    if (whole < 60) {
        return fmt::format("{} s", whole);
    }
    if (whole < 3600) {
        return fmt::format("{} min {} s", whole / 60, whole % 60);
    }
    return fmt::format("{} h {} min", whole / 3600, (whole % 3600) / 60);
}

std::string progress_line(const std::string& what, const std::string& unit, std::size_t done,
                          std::size_t total, double elapsed) {
    std::string line = fmt::format("{}: {}/{} {}", what, done, total, unit);
    if (done == 0 || !(elapsed > 0)) {
        return line + ", time left unknown";
    }
    const double rate = static_cast<double>(done) / elapsed;
    const double left = static_cast<double>(total > done ? total - done : 0) / rate;
    return line + fmt::format(", {:.1f} {}/s, about {} left", rate, unit, duration_text(left));
}

ProgressMeter::ProgressMeter(std::string what, std::string unit, ProgressMode mode,
                             ProgressStyle style, std::ostream& out, double interval, Clock clock)
    : m_what(std::move(what)), m_unit(std::move(unit)), m_mode(mode), m_style(style), m_out(out),
      m_interval(interval), m_clock(clock ? std::move(clock) : Clock(steady_seconds)) {
    m_start = m_clock();
    m_last_line = m_start;
}

void ProgressMeter::write(const std::string& text) {
    if (m_style == ProgressStyle::live_line) {
        m_out << "\r" << text << "   " << std::flush;
        m_live_open = true;
    } else {
        m_out << text << "\n" << std::flush;
    }
    ++m_lines;
}

void ProgressMeter::update(std::size_t done, std::size_t total) {
    std::lock_guard<std::mutex> lock(m_mutex);
    if (m_style == ProgressStyle::none) {
        return;
    }
    m_done = done;
    m_total = total;
    const double now = m_clock();
    const bool first = m_lines == 0;
    const double every = m_style == ProgressStyle::live_line ? k_live_interval : m_interval;
    const bool due = now - m_last_line >= every || (first && m_mode == ProgressMode::always);
    if (!due) {
        return;
    }
    m_last_line = now;
    write(progress_line(m_what, m_unit, done, total, now - m_start));
}

void ProgressMeter::finish() {
    std::lock_guard<std::mutex> lock(m_mutex);
    if (m_style == ProgressStyle::none) {
        return;
    }
    const double elapsed = m_clock() - m_start;
    if (m_style == ProgressStyle::live_line) {
        if (m_live_open) {
            m_out << "\n" << std::flush;
            m_live_open = false;
        }
        return;
    }
    if (m_lines > 0 || m_mode == ProgressMode::always) {
        m_out << fmt::format("{}: {}/{} {} in {}", m_what, m_done, m_total, m_unit,
                             duration_text(elapsed))
              << "\n"
              << std::flush;
        ++m_lines;
    }
}

std::size_t ProgressMeter::lines() const {
    std::lock_guard<std::mutex> lock(m_mutex);
    return m_lines;
}

} // namespace tollgate
