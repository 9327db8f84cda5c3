// SPDX-License-Identifier: MIT
// The trend between two snapshots: pairing, growth order and totals per top folder, in process
// and through `tollgate snapshot --compare` on a scripted history.
#include "baseline_test_support.hpp"
#include "gate/baseline/snapshot_trend.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <cstdlib>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

using tollgate::baseline::compare_snapshots;
using tollgate::baseline::Snapshot;
using tollgate::test::commit_all;
using tollgate::test::halstead_effort;
using tollgate::test::halstead_volume;
using tollgate::test::init_repo;
using tollgate::test::run_tollgate;
using tollgate::test::snapshot_function;
using tollgate::test::TempDir;

namespace {

// Counts of the scripted functions below, counted by hand under convention c-family/1
// (core/README.md: keywords, punctuators, type names and the function's own name are operators;
// `( )` and `{ }` count once per pair; names of values and literals are operands).
struct HandCount {
    double n1, n2, N1, N2;
};
// `int twice(int x) { return x * 2; }`: int(2) twice () {} return * ; | x(2) 2
constexpr HandCount k_twice_base{7, 2, 8, 3};
// `int twice(int x) { return x * 2 + 1; }`: adds + and 1
constexpr HandCount k_twice_head{8, 3, 9, 4};
// `int keep(int y) { return y; }`: int(2) keep () {} return ; | y(2)
constexpr HandCount k_keep{6, 1, 7, 2};
// `int inc(int v) { return v + 1; }`: int(2) inc () {} return + ; | v(2) 1
constexpr HandCount k_inc_base{7, 2, 8, 3};
// `int inc(int v) { return v + 1 + v * v; }`: int(2) inc () {} return +(2) * ; | v(4) 1
constexpr HandCount k_inc_head{8, 2, 10, 5};
// `int main(void) { return 0; }`: int main () void {} return ; | 0
constexpr HandCount k_main{7, 1, 7, 1};

double effort(const HandCount& c) {
    return halstead_effort(c.n1, c.n2, c.N1, c.N2);
}
double volume(const HandCount& c) {
    return halstead_volume(c.n1, c.n2, c.N1, c.N2);
}

const std::string k_base_tree_calc = "int twice(int x) { return x * 2; }\n"
                                     "int keep(int y) { return y; }\n";
const std::string k_head_tree_calc = "int twice(int x) { return x * 2 + 1; }\n"
                                     "int keep(int y) { return y; }\n";
const std::string k_base_tree_util = "int inc(int v) { return v + 1; }\n"
                                     "int gone(int z) { return z; }\n";
const std::string k_head_tree_util = "int inc(int v) { return v + 1 + v * v; }\n"
                                     "int fresh(int w) { return w; }\n";
const std::string k_main_c = "int main(void) { return 0; }\n";

tollgate::baseline::SnapshotFunction hand(const std::string& path, unsigned line,
                                          const std::string& name, int ordinal,
                                          const HandCount& c) {
    return snapshot_function(path, line, "c:@F@" + name, name, "int", ordinal,
                             static_cast<std::uint64_t>(c.n1), static_cast<std::uint64_t>(c.n2),
                             static_cast<std::uint64_t>(c.N1), static_cast<std::uint64_t>(c.N2));
}

// The scripted history's two snapshots, made by hand with the counts above.
void hand_snapshots(Snapshot& base, Snapshot& head) {
    base.convention = head.convention = "c-family/1";
    base.commit = std::string(40, 'a');
    head.commit = std::string(40, 'b');
    base.created = "2024-05-01T12:00:00Z";
    head.created = "2024-05-08T09:30:00Z";
    base.functions = {
        hand("lib/util.c", 1, "inc", 1, k_inc_base), hand("lib/util.c", 2, "gone", 2, k_keep),
        hand("main.c", 1, "main", 1, k_main), hand("src/calc.c", 1, "twice", 1, k_twice_base),
        hand("src/calc.c", 2, "keep", 2, k_keep)};
    head.functions = {
        hand("lib/util.c", 1, "inc", 1, k_inc_head), hand("lib/util.c", 2, "fresh", 2, k_keep),
        hand("main.c", 1, "main", 1, k_main), hand("src/calc.c", 1, "twice", 1, k_twice_head),
        hand("src/calc.c", 2, "keep", 2, k_keep)};
}

// Compare `actual` with the reviewed file tests/approved/NAME; TOLLGATE_APPROVE=1 rewrites it.
void check_approved(const std::string& name, const std::string& actual) {
    const std::string path = std::string(TOLLGATE_SOURCE_DIR) + "/tests/approved/" + name;
    if (std::getenv("TOLLGATE_APPROVE") != nullptr) {
        std::ofstream(path, std::ios::binary) << actual;
    }
    INFO("approved file: " << path << " (TOLLGATE_APPROVE=1 rewrites it)");
    CHECK(actual == tollgate::test::read_text(path));
}

} // namespace

TEST_CASE("compare_snapshots", "[baseline]") {
    Snapshot base, head;
    hand_snapshots(base, head);

    SECTION("functions grow in order of their effort increase") {
        const auto trend = compare_snapshots(base, head);
        CHECK(trend.matched == 4);
        CHECK(trend.added == 1);
        CHECK(trend.removed == 1);
        CHECK(trend.grew == 2);
        CHECK(trend.shrank == 0);
        CHECK(trend.unchanged == 2);
        REQUIRE(trend.growth.size() == 2);
        CHECK(trend.growth[0].qualified_name == "inc");
        CHECK(trend.growth[0].effort.absolute == Approx(effort(k_inc_head) - effort(k_inc_base)));
        CHECK(*trend.growth[0].effort.percent ==
              Approx(100 * (effort(k_inc_head) / effort(k_inc_base) - 1)));
        CHECK(trend.growth[1].qualified_name == "twice");
        CHECK(trend.growth[1].effort.absolute ==
              Approx(effort(k_twice_head) - effort(k_twice_base)));
    }

    SECTION("folders are summed base and head, sorted by name, with a total") {
        const auto trend = compare_snapshots(base, head);
        REQUIRE(trend.folders.size() == 3);
        CHECK(trend.folders[0].folder == ".");
        CHECK(trend.folders[1].folder == "lib");
        CHECK(trend.folders[2].folder == "src");
        CHECK(trend.folders[1].effort.base == Approx(effort(k_inc_base) + effort(k_keep)));
        CHECK(trend.folders[1].effort.head == Approx(effort(k_inc_head) + effort(k_keep)));
        CHECK(trend.folders[2].volume.base == Approx(volume(k_twice_base) + volume(k_keep)));
        CHECK(trend.folders[2].volume.head == Approx(volume(k_twice_head) + volume(k_keep)));
        CHECK(trend.folders[0].effort.absolute == 0);
        CHECK(trend.total.base_functions == 5);
        CHECK(trend.total.head_functions == 5);
        CHECK(trend.total.effort.absolute == Approx(effort(k_inc_head) - effort(k_inc_base) +
                                                    effort(k_twice_head) - effort(k_twice_base)));
    }

    SECTION("a function whose ordinal changed pairs by name and signature") {
        // A new function above `keep` shifts its ordinal; the USR is empty (as for lexical ones).
        for (auto* side : {&base, &head}) {
            side->functions[4].usr.clear();
        }
        head.functions[4].fallback_key = "keep(int)#3";
        head.functions.push_back(hand("src/calc.c", 5, "later", 2, k_keep));
        head.functions.back().usr.clear();
        const auto trend = compare_snapshots(base, head);
        CHECK(trend.matched == 4);
        CHECK(trend.added == 2);
        CHECK(trend.removed == 1);
    }

    SECTION("a function moved to another file counts as removed and added") {
        head.functions[4].path = "src/keep.c";
        const auto trend = compare_snapshots(base, head);
        CHECK(trend.matched == 3);
        CHECK(trend.added == 2);
        CHECK(trend.removed == 2);
    }

    SECTION("a USR shared by several functions pairs them by fallback key") {
        for (auto* side : {&base, &head}) {
            side->functions[3].usr = "c:@F@shared";
            side->functions[4].usr = "c:@F@shared";
        }
        const auto trend = compare_snapshots(base, head);
        CHECK(trend.matched == 4);
        CHECK(trend.growth.size() == 2);
    }

    SECTION("two empty snapshots give an empty trend") {
        const auto trend = compare_snapshots(Snapshot{}, Snapshot{});
        CHECK(trend.growth.empty());
        CHECK(trend.folders.empty());
        CHECK(trend.total.effort.absolute == 0);
    }
}

TEST_CASE("write_trend_text and write_trend_json match the approved files", "[baseline]") {
    Snapshot base, head;
    hand_snapshots(base, head);
    const auto trend = compare_snapshots(base, head);
    std::ostringstream text, json;
    tollgate::baseline::write_trend_text(text, trend, 10);
    tollgate::baseline::write_trend_json(json, trend, 10);
    check_approved("snapshot_trend.txt", text.str());
    check_approved("snapshot_trend.json", json.str());

    SECTION("top limits the listed functions, not the counts") {
        std::ostringstream one;
        tollgate::baseline::write_trend_text(one, trend, 1);
        CHECK(one.str().find("functions that grew most in effort (1 of 2):") != std::string::npos);
        CHECK(one.str().find("twice(int)") == std::string::npos);
    }
}

TEST_CASE("snapshot --compare on a scripted history", "[baseline]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("src/calc.c", k_base_tree_calc);
    dir.write("lib/util.c", k_base_tree_util);
    dir.write("main.c", k_main_c);
    commit_all(dir.path(), "base");
    dir.write("src/calc.c", k_head_tree_calc);
    dir.write("lib/util.c", k_head_tree_util);
    commit_all(dir.path(), "head");
    for (const auto& [rev, file] : {std::pair{"HEAD~1", "base.json"}, {"HEAD", "head.json"}}) {
        const auto made = run_tollgate(
            std::string("snapshot --no-pch-cache --rev ") + rev + " --out " + file, dir.path());
        INFO(made.err);
        REQUIRE(made.exit_code == 0);
    }

    const auto result =
        run_tollgate("snapshot --compare base.json head.json --format json", dir.path());
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
    const auto trend = nlohmann::json::parse(result.out);

    // Counts and order.
    CHECK(trend["schema"] == "tollgate.snapshot-trend/1");
    CHECK(trend["functions"] == nlohmann::json{{"in_both", 4},
                                               {"added", 1},
                                               {"removed", 1},
                                               {"grew", 2},
                                               {"shrank", 0},
                                               {"unchanged", 2}});
    REQUIRE(trend["grew_most"].size() == 2);
    CHECK(trend["grew_most"][0]["function"] == "inc");
    CHECK(trend["grew_most"][0]["file"] == "lib/util.c");
    CHECK(trend["grew_most"][0]["effort"]["base"].get<double>() == Approx(effort(k_inc_base)));
    CHECK(trend["grew_most"][0]["effort"]["head"].get<double>() == Approx(effort(k_inc_head)));
    CHECK(trend["grew_most"][1]["function"] == "twice");
    CHECK(trend["grew_most"][1]["effort"]["change"].get<double>() ==
          Approx(effort(k_twice_head) - effort(k_twice_base)));
    CHECK(trend["grew_most"][1]["effort"]["percent"].get<double>() ==
          Approx(100 * (effort(k_twice_head) / effort(k_twice_base) - 1)));

    // Totals per top folder, from the hand counts.
    const auto& folders = trend["folders"];
    REQUIRE(folders.size() == 3);
    CHECK(folders[0]["folder"] == ".");
    CHECK(folders[0]["volume"]["base"].get<double>() == Approx(volume(k_main)));
    CHECK(folders[0]["effort"]["change"].get<double>() == 0);
    CHECK(folders[1]["folder"] == "lib");
    CHECK(folders[1]["functions"] == nlohmann::json{{"base", 2}, {"head", 2}});
    CHECK(folders[1]["effort"]["base"].get<double>() ==
          Approx(effort(k_inc_base) + effort(k_keep)));
    CHECK(folders[1]["effort"]["head"].get<double>() ==
          Approx(effort(k_inc_head) + effort(k_keep)));
    CHECK(folders[2]["folder"] == "src");
    CHECK(folders[2]["volume"]["base"].get<double>() ==
          Approx(volume(k_twice_base) + volume(k_keep)));
    CHECK(folders[2]["volume"]["head"].get<double>() ==
          Approx(volume(k_twice_head) + volume(k_keep)));
    CHECK(trend["total"]["effort"]["change"].get<double>() ==
          Approx(effort(k_inc_head) - effort(k_inc_base) + effort(k_twice_head) -
                 effort(k_twice_base)));

    // The text form lists the same order.
    const auto text = run_tollgate("snapshot --compare base.json head.json", dir.path());
    REQUIRE(text.exit_code == 0);
    const std::size_t inc_at = text.out.find("inc(int)");
    const std::size_t twice_at = text.out.find("twice(int)");
    REQUIRE(inc_at != std::string::npos);
    REQUIRE(twice_at != std::string::npos);
    CHECK(inc_at < twice_at);
    CHECK(text.out.find("functions that grew most in effort (2 of 2):") != std::string::npos);
    CHECK(
        text.out.find("4 in both (2 grew, 0 shrank, 2 unchanged in effort), 1 added, 1 removed") !=
        std::string::npos);
}
