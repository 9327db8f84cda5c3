// SPDX-License-Identifier: MIT
// check_base_snapshot: what makes a snapshot of the base disagree with the parsed base, on
// touched functions built by hand from Halstead counts.
#include "gate/delta/snapshot_check.hpp"
#include "tollgate/core/counts.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using namespace tollgate::delta;

namespace {

core::Measures measures_of(std::uint64_t n1, std::uint64_t n2, std::uint64_t N1, std::uint64_t N2,
                           std::uint64_t potential = 3) {
    return core::compute_measures(core::counts_from_totals(n1, n2, N1, N2), potential);
}

FunctionSide side(const core::Measures& m, const std::string& hash) {
    FunctionSide s;
    s.path = "src/knot.c";
    s.start_line = 4;
    s.end_line = 9;
    s.token_hash = hash;
    s.measures = m;
    return s;
}

// knot(int, int), changed: base n1 9 n2 2 N1 14 N2 12, head larger.
FunctionDelta knot() {
    FunctionDelta f;
    f.name = "knot";
    f.signature = "int, int";
    f.identity = "c:@F@knot";
    f.label = DeltaLabel::changed;
    f.base = side(measures_of(9, 2, 14, 12), "aaaaaaaaaaaaaaaa");
    f.head = side(measures_of(12, 5, 30, 24), "bbbbbbbbbbbbbbbb");
    return f;
}

} // namespace

TEST_CASE("check_base_snapshot", "[delta][baseline]") {
    const std::vector<FunctionDelta> parsed{knot()};

    SECTION("the same base sides agree") {
        const SnapshotCheck check = check_base_snapshot(parsed, parsed);
        CHECK(check.compared);
        CHECK(check.functions == 1);
        CHECK(check.disagreements.empty());
        CHECK(check.first_disagreement().empty());
    }
    SECTION("derived measures are not compared, only what they come from") {
        auto recorded = parsed;
        recorded[0].base->measures.effort += 0.5; // the loader refuses this; not the comparison
        recorded[0].base->start_line = 3;         // extents matter only through the labels
        CHECK(check_base_snapshot(parsed, recorded).disagreements.empty());
    }
    SECTION("one count off disagrees, naming both sides") {
        // Halstead 1977: E = (n1/2)(N2/n2)(N1+N2) log2(n1+n2): 4.5 * 6.5 * 27 * log2 11 = 2732.1
        // for the snapshot's counts, 4.5 * 6 * 26 * log2 11 = 2428.5 for the parsed ones.
        auto recorded = parsed;
        recorded[0].base->measures = measures_of(9, 2, 14, 13);
        const SnapshotCheck check = check_base_snapshot(parsed, recorded);
        REQUIRE(check.disagreements.size() == 1);
        CHECK(check.first_disagreement() ==
              "src/knot.c:4: knot(int, int): the snapshot has changed, n1 9 n2 2 N1 14 N2 13 n2* 3 "
              "(effort 2732), token hash aaaaaaaaaaaa; the base parses to changed, n1 9 n2 2 N1 "
              "14 N2 12 n2* 3 (effort 2429), token hash aaaaaaaaaaaa");
    }
    SECTION("the potential operands and the token hash are compared too") {
        auto other_potential = parsed;
        other_potential[0].base->measures = measures_of(9, 2, 14, 12, 4);
        CHECK(check_base_snapshot(parsed, other_potential).disagreements.size() == 1);
        auto other_tokens = parsed;
        other_tokens[0].base->token_hash = "cccccccccccccccc";
        CHECK(check_base_snapshot(parsed, other_tokens).disagreements.size() == 1);
    }
    SECTION("a snapshot that makes the function unchanged or added disagrees") {
        // The forgery of the issue: the head's function recorded as the base's.
        auto unchanged = parsed;
        unchanged[0].label = DeltaLabel::unchanged;
        unchanged[0].base = unchanged[0].head;
        CHECK(check_base_snapshot(parsed, unchanged).disagreements.size() == 1);
        // A snapshot that leaves the function out: the head's is then added.
        auto added = parsed;
        added[0].label = DeltaLabel::added;
        added[0].base.reset();
        const SnapshotCheck check = check_base_snapshot(parsed, added);
        REQUIRE(check.disagreements.size() == 1);
        CHECK(check.disagreements[0].recorded == "added, no base side");
    }
    SECTION("a touched function only one side has disagrees") {
        FunctionDelta gone = knot();
        gone.label = DeltaLabel::removed;
        gone.head.reset();
        const SnapshotCheck check = check_base_snapshot(parsed, {knot(), gone});
        REQUIRE(check.disagreements.size() == 1);
        CHECK(check.functions == 2);
        CHECK(check.disagreements[0].parsed == "no such touched function");
    }
}
