// SPDX-License-Identifier: MIT
// is_calendar_date and current_date: waiver expiry dates and the injectable "today". Leap years
// follow the Gregorian rule (every fourth year, centuries only when divisible by 400; common
// practice, no source).
#include "gate/common/errors.hpp"
#include "gate/policy/calendar_date.hpp"

#include <catch2/catch.hpp>
#include <cstdlib>

using tollgate::policy::current_date;
using tollgate::policy::is_calendar_date;

TEST_CASE("is_calendar_date accepts real YYYY-MM-DD dates only", "[policy]") {
    CHECK(is_calendar_date("2027-03-31"));
    CHECK(is_calendar_date("2024-02-29"));
    CHECK(is_calendar_date("2000-02-29"));
    CHECK_FALSE(is_calendar_date("2100-02-29"));
    CHECK_FALSE(is_calendar_date("2027-02-29"));
    CHECK_FALSE(is_calendar_date("2027-04-31"));
    CHECK_FALSE(is_calendar_date("2027-13-01"));
    CHECK_FALSE(is_calendar_date("2027-00-10"));
    CHECK_FALSE(is_calendar_date("2027-3-31"));
    CHECK_FALSE(is_calendar_date("31.03.2027"));
    CHECK_FALSE(is_calendar_date(""));
}

TEST_CASE("current_date honours TOLLGATE_TODAY", "[policy]") {
    SECTION("a set date is returned as given") {
        ::setenv("TOLLGATE_TODAY", "2026-02-28", 1);
        CHECK(current_date() == "2026-02-28");
    }
    SECTION("a malformed date is a usage error") {
        ::setenv("TOLLGATE_TODAY", "tomorrow", 1);
        CHECK_THROWS_AS(current_date(), tollgate::UsageError);
        CHECK_THROWS_WITH(current_date(),
                          "TOLLGATE_TODAY is \"tomorrow\", not a date (expected YYYY-MM-DD)");
    }
    SECTION("unset, the local date is a calendar date") {
        ::unsetenv("TOLLGATE_TODAY");
        CHECK(is_calendar_date(current_date()));
    }
    ::unsetenv("TOLLGATE_TODAY");
}
