// SPDX-License-Identifier: MIT
// Tests of LineSet: merging, membership and range overlap of changed-line sets.
#include "gate/walker/line_set.hpp"

#include <catch2/catch.hpp>

using tollgate::walker::LineRange;
using tollgate::walker::LineSet;

// Interval arithmetic on inclusive ranges: common practice, no source.
TEST_CASE("LineSet::add", "[walker]") {
    SECTION("adjacent and overlapping ranges merge into one") {
        LineSet set;
        set.add(5, 7);
        set.add(8, 9);  // adjacent
        set.add(6, 12); // overlapping
        CHECK(set.ranges() == std::vector<LineRange>{{5, 12}});
        CHECK(set.line_count() == 8);
    }
    SECTION("ranges added out of order come out sorted and separate when a gap remains") {
        LineSet set;
        set.add(20, 21);
        set.add(3);
        set.add(10, 11);
        CHECK(set.ranges() == std::vector<LineRange>{{3, 3}, {10, 11}, {20, 21}});
    }
    SECTION("a range bridging several ranges swallows them") {
        LineSet set({{1, 2}, {4, 5}, {8, 9}, {30, 30}});
        set.add(3, 8);
        CHECK(set.ranges() == std::vector<LineRange>{{1, 9}, {30, 30}});
    }
    SECTION("empty ranges and line 0 are ignored") {
        LineSet set;
        set.add(5, 4);
        set.add(0);
        CHECK(set.empty());
        CHECK(set.line_count() == 0);
    }
}

TEST_CASE("LineSet::contains", "[walker]") {
    const LineSet set({{3, 5}, {9, 9}});
    CHECK_FALSE(set.contains(2));
    CHECK(set.contains(3));
    CHECK(set.contains(5));
    CHECK_FALSE(set.contains(6));
    CHECK(set.contains(9));
    CHECK_FALSE(set.contains(10));
    CHECK_FALSE(LineSet().contains(1));
}

TEST_CASE("LineSet::meets", "[walker]") {
    const LineSet set({{10, 12}, {40, 41}});
    SECTION("a function extent overlapping a range at either end meets it") {
        CHECK(set.meets(1, 10));
        CHECK(set.meets(12, 20));
        CHECK(set.meets(11, 11));
        CHECK(set.meets(30, 50));
    }
    SECTION("an extent between ranges or outside all of them does not") {
        CHECK_FALSE(set.meets(1, 9));
        CHECK_FALSE(set.meets(13, 39));
        CHECK_FALSE(set.meets(42, 100));
    }
    SECTION("an empty extent meets nothing") {
        CHECK_FALSE(set.meets(11, 10));
        CHECK_FALSE(LineSet().meets(1, 100));
    }
}
