// SPDX-License-Identifier: MIT
// Snapshots of files whose names and text are not UTF-8: written as valid JSON, read back byte
// for byte (the "exact" key), matched by the next check; and the trend shown safely.
#include "baseline_test_support.hpp"
#include "gate/baseline/snapshot_file.hpp"
#include "gate/baseline/snapshot_trend.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/text_safety.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <sstream>

using namespace tollgate;
using tollgate::baseline::parse_snapshot;
using tollgate::baseline::Snapshot;
using tollgate::baseline::snapshot_to_json;
using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::snapshot_function;
using tollgate::test::TempDir;

namespace {

const std::string k_fffd = "\xEF\xBF\xBD";

// Two Latin-1 file names that differ only in their invalid byte: replaced by U+FFFD they would
// be one path, and their static functions (USR with the file name) one identity.
Snapshot latin1_snapshot() {
    Snapshot s;
    s.tool_version = TOLLGATE_VERSION;
    s.convention = "c-family/1";
    s.commit = "3f2a91c0d4e5f60718293a4b5c6d7e8f90a1b2c3";
    s.created = "2024-05-01T12:00:00Z";
    s.functions = {
        snapshot_function("src/caf\xE8.c", 1, "c:caf\xE8.c@F@f", "f", "int", 0, 1, 7, 2, 8),
        snapshot_function("src/caf\xE9.c", 1, "c:caf\xE9.c@F@f", "f", "char \xFF*", 0, 2, 6, 1, 7),
        snapshot_function("src/plain.c", 1, "c:@F@g", "g\x1b[2J", "int", 0, 1, 7, 2, 8),
    };
    return s;
}

std::string refusal(const std::string& text) {
    try {
        parse_snapshot(text, "s.json");
    } catch (const UsageError& e) {
        return e.what();
    }
    return "(accepted)";
}

} // namespace

TEST_CASE("snapshot_to_json keeps text that is not UTF-8 exactly", "[baseline]") {
    const Snapshot snapshot = latin1_snapshot();
    std::string text;
    // Before: the display form only ("caf\uFFFD.c" twice), so both files read back as one path.
    REQUIRE_NOTHROW(text = snapshot_to_json(snapshot));
    CHECK(text::is_valid_utf8(text));

    SECTION("the file reads back equal, byte for byte") {
        CHECK(parse_snapshot(text, "s.json") == snapshot);
    }
    SECTION("readers see the display form; the exact bytes sit under \"exact\"") {
        const auto json = nlohmann::json::parse(text);
        const auto& first = json["functions"][0];
        CHECK(first["file"] == "src/caf" + k_fffd + ".c");
        CHECK(first["exact"] ==
              nlohmann::json{{"file", "src/caf%E8.c"}, {"usr", "c:caf%E8.c@F@f"}});
        CHECK(json["functions"][1]["exact"]["signature"] == "char %FF*");
        CHECK(json["functions"][1]["exact"]["fallback_key"] == "f(char %FF*)#0");
        // Valid text, escape sequences included, needs no "exact".
        CHECK_FALSE(json["functions"][2].contains("exact"));
        CHECK(json["functions"][2]["function"] == "g\x1b[2J");
    }
    SECTION("a damaged \"exact\" is refused like any other damage") {
        // Another invalid byte shows the same: only the digest sees it.
        std::string other = text;
        other.replace(other.find("src/caf%E8.c"), 12, "src/caf%E7.c");
        CHECK(refusal(other).find("does not match \"content_digest\"") != std::string::npos);
        std::string bad = text;
        bad.replace(bad.find("src/caf%E8.c"), 12, "src/caf%E8.h");
        CHECK(refusal(bad) ==
              "s.json: corrupted snapshot: /functions/0/exact/file: does not match "
              "/functions/0/file (rebuild it: tollgate snapshot --rev 3f2a91c --out s.json)");
        bad = text;
        bad.replace(bad.find("src/caf%E8.c"), 12, "src/caf%G8.c");
        CHECK(refusal(bad) == "s.json: corrupted snapshot: /functions/0/exact/file: not a stored "
                              "byte string (rebuild it: tollgate snapshot --rev 3f2a91c --out "
                              "s.json)");
    }
}

TEST_CASE("a snapshot of a tree with Latin-1 file names serves the next check", "[baseline]") {
    TempDir dir;
    init_repo(dir.path());
    const std::string e_grave = "caf\xE8.c", e_acute = "caf\xE9.c";
    dir.write(e_grave, "static int f(int x) {\n    return x + 1;\n}\n");
    dir.write(e_acute, "static int f(int x) {\n    return x * 2;\n}\n");
    const std::string base = commit_all(dir.path(), "base");
    const auto snap = run_tollgate("snapshot --no-pch-cache --out base.json", dir.path());
    INFO(snap.err);
    REQUIRE(snap.exit_code == 0);
    REQUIRE(baseline::load_snapshot(dir.path() + "/base.json").functions.size() == 2);

    dir.write(e_acute, "static int f(int x) {\n    return x * 2 + x / 3;\n}\n");
    const std::string head = commit_all(dir.path(), "head");
    const auto check = run_tollgate("check --no-pch-cache --base " + base + " --head " + head +
                                        " --baseline base.json --report json:-",
                                    dir.path());
    INFO(check.err);
    REQUIRE(check.exit_code == 0);
    const auto report = nlohmann::json::parse(check.out);
    // The snapshot's functions were found under the exact path: nothing is missing or disagrees
    // (with the display form, the base side had no function there and f showed as "added").
    CHECK(report["warnings"].empty());
    REQUIRE(report["functions"].size() == 1);
    const auto& f = report["functions"][0];
    CHECK(f["label"] == "changed");
    CHECK(f["head"]["file"] == "caf" + k_fffd + ".c");
    // Counted by hand under c-family/1: `static int f(int x) { return x * 2; }` has operators
    // static int f () {} return * ; (int counted once) -> n1 = 8, N1 = 9; operands x (2), 2.
    CHECK(f["base"]["measures"]["n1"] == 8);
    CHECK(f["base"]["measures"]["N2"] == 3);
}

TEST_CASE("write_trend_text and write_trend_json show hostile snapshots safely", "[baseline]") {
    Snapshot base = latin1_snapshot();
    Snapshot head = latin1_snapshot();
    head.functions[2].measures = core::compute_measures(core::counts_from_totals(3, 7, 9, 8), 1);
    const auto trend = baseline::compare_snapshots(base, head);
    REQUIRE(trend.grew == 1);
    std::ostringstream text_out, json_out;
    baseline::write_trend_text(text_out, trend, 10);
    INFO(text_out.str());
    CHECK(text_out.str().find('\x1b') == std::string::npos);
    CHECK(text_out.str().find("g\\x1b[2J(int)") != std::string::npos);
    REQUIRE_NOTHROW(baseline::write_trend_json(json_out, trend, 10));
    CHECK(nlohmann::json::parse(json_out.str())["grew_most"][0]["function"] == "g\x1b[2J");
}
