// SPDX-License-Identifier: MIT
// YYYY-MM-DD validation and the date used as "today" when judging waivers.
#include "gate/policy/calendar_date.hpp"

#include "gate/common/errors.hpp"

#include <cctype>
#include <cstdlib>
#include <ctime>

namespace tollgate::policy {

bool is_calendar_date(const std::string& text) {
    if (text.size() != 10 || text[4] != '-' || text[7] != '-') {
        return false;
    }
    for (std::size_t i : {0u, 1u, 2u, 3u, 5u, 6u, 8u, 9u}) {
        if (!std::isdigit(static_cast<unsigned char>(text[i]))) {
            return false;
        }
    }
    const int year = std::stoi(text.substr(0, 4));
    const int month = std::stoi(text.substr(5, 2));
    const int day = std::stoi(text.substr(8, 2));
    if (month < 1 || month > 12 || day < 1) {
        return false;
    }
    // Gregorian leap years: every fourth year, except centuries not divisible by 400.
    const bool leap = (year % 4 == 0 && year % 100 != 0) || year % 400 == 0;
    const int days_in_month[] = {31, leap ? 29 : 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
    return day <= days_in_month[month - 1];
}

std::string current_date() {
    if (const char* forced = std::getenv("TOLLGATE_TODAY"); forced != nullptr && *forced != '\0') {
        if (!is_calendar_date(forced)) {
            throw UsageError(std::string("TOLLGATE_TODAY is \"") + forced +
                             "\", not a date (expected YYYY-MM-DD)");
        }
        return forced;
    }
    const std::time_t now = std::time(nullptr);
    std::tm local{};
    localtime_r(&now, &local);
    char text[16];
    std::strftime(text, sizeof text, "%Y-%m-%d", &local);
    return text;
}

} // namespace tollgate::policy
