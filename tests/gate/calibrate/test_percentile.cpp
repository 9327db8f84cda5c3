// SPDX-License-Identifier: MIT
// Percentiles and summaries of calibrate against a published definition and Python's statistics.
#include "gate/calibrate/distribution.hpp"
#include "support/temp_repo.hpp"

#include <algorithm>
#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <sstream>

using tollgate::calibrate::histogram;
using tollgate::calibrate::percentile;
using tollgate::calibrate::summarize;

namespace {

// Return Python's statistics.quantiles(data, n=100, method='inclusive'): the 99 cut points.
std::vector<double> python_percentiles(const std::vector<double>& data) {
    std::string list;
    for (double v : data) {
        list += fmt::format("{:.17g},", v);
    }
    const auto result = tollgate::test::run_command(
        "python3 -c \"import statistics; print('\\n'.join(repr(q) for q in "
        "statistics.quantiles([" +
            list + "], n=100, method='inclusive')))\"",
        ".");
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
    std::vector<double> out;
    std::istringstream in(result.out);
    for (double v; in >> v;) {
        out.push_back(v);
    }
    return out;
}

} // namespace

TEST_CASE("percentile", "[calibrate]") {
    SECTION("it interpolates linearly between closest ranks, as a hand computation gives") {
        // Definition 7 of Hyndman and Fan, "Sample Quantiles in Statistical Packages", The
        // American Statistician 50(4), 1996: h = (n - 1) p + 1 (1-based), computed by hand for
        // 1..10: p50 = 5.5, p75 = 7.75, p90 = 9.1, p95 = 9.55, p99 = 9.91.
        const std::vector<double> data = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10};
        CHECK(percentile(data, 50) == Approx(5.5));
        CHECK(percentile(data, 75) == Approx(7.75));
        CHECK(percentile(data, 90) == Approx(9.1));
        CHECK(percentile(data, 95) == Approx(9.55));
        CHECK(percentile(data, 99) == Approx(9.91));
        CHECK(percentile(data, 100) == 10);
        CHECK(percentile(data, 0) == 1);
    }
    SECTION("it agrees with Python's statistics.quantiles(method='inclusive') at every cut") {
        // Uneven data with negatives, ties and a long tail, as growth values look.
        std::vector<double> data = {-120.5, 0,   0,    0,      3.25,  17,     17,  44.1,
                                    98.6,   250, 1e4,  -3.5,   61.75, 1234.5, 0.5, 7,
                                    7,      7,   88.8, 4096.0, -0.25, 15.125, 301, 2.5};
        const auto reference = python_percentiles(data);
        REQUIRE(reference.size() == 99);
        std::sort(data.begin(), data.end());
        for (int p = 1; p <= 99; ++p) {
            INFO("p" << p);
            CHECK(percentile(data, p) == Approx(reference[static_cast<std::size_t>(p - 1)]));
        }
    }
    SECTION("an empty list and a single value give defined results") {
        CHECK(percentile({}, 90) == 0);
        CHECK(percentile({42}, 90) == 42);
    }
}

TEST_CASE("summarize", "[calibrate]") {
    SECTION("it reports p50 to p99, the extremes and the count of unsorted values") {
        const auto s = summarize({10, 1, 9, 2, 8, 3, 7, 4, 6, 5});
        CHECK(s.count == 10);
        CHECK(s.at[0] == Approx(5.5));
        CHECK(s.at[2] == Approx(9.1));
        CHECK(s.min == 1);
        CHECK(s.max == 10);
    }
}

TEST_CASE("histogram", "[calibrate]") {
    SECTION("every value falls in exactly one bar, the tail above p99 in its own") {
        std::vector<double> data;
        for (int i = 0; i < 200; ++i) {
            data.push_back(i % 17);
        }
        data.push_back(5000); // far above the 99th percentile
        const auto bins = histogram(data);
        std::size_t total = 0;
        for (const auto& b : bins) {
            total += b.count;
        }
        CHECK(total == data.size());
        REQUIRE(bins.back().overflow);
        CHECK(bins.back().count == 1);
        CHECK(bins.front().low == 0);
    }
    SECTION("equal values make one bar") {
        const auto bins = histogram({3, 3, 3});
        REQUIRE(bins.size() == 1);
        CHECK(bins[0].count == 3);
    }
}
