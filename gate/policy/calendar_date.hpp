// SPDX-License-Identifier: MIT
// Calendar dates as policies write them (YYYY-MM-DD), and the date judging uses as "today".
#pragma once

#include <string>

namespace tollgate::policy {

// Return whether `text` is a real calendar date written YYYY-MM-DD (leap years honoured).
bool is_calendar_date(const std::string& text);

// Return today's date for judging: TOLLGATE_TODAY when set (for tests), else the local date.
// Throws UsageError when TOLLGATE_TODAY is set but is not a YYYY-MM-DD date.
std::string current_date();

} // namespace tollgate::policy
