// SPDX-License-Identifier: MIT
// Snapshot files in process: the JSON round trip, every refusal pinned verbatim, atomic saves,
// lookups and path confinement.
#include "baseline_test_support.hpp"
#include "gate/baseline/snapshot_file.hpp"
#include "gate/common/errors.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>

namespace fs = std::filesystem;
using tollgate::UsageError;
using tollgate::baseline::find_function;
using tollgate::baseline::load_snapshot;
using tollgate::baseline::parse_snapshot;
using tollgate::baseline::save_snapshot;
using tollgate::baseline::Snapshot;
using tollgate::baseline::snapshot_to_json;
using tollgate::baseline::SnapshotExpectations;
using tollgate::test::halstead_effort;
using tollgate::test::read_text;
using tollgate::test::snapshot_function;
using tollgate::test::TempDir;

namespace {

const std::string k_commit = "3f2a91c0d4e5f60718293a4b5c6d7e8f90a1b2c3";
const std::string k_path = "baselines/snapshot.json";

// A small snapshot made by hand (invented data).
Snapshot sample_snapshot() {
    Snapshot s;
    s.tool_version = TOLLGATE_VERSION;
    s.convention = "c-family/1";
    s.stroud = 18.0;
    s.commit = k_commit;
    s.created = "2024-05-01T12:00:00Z";
    s.functions = {
        snapshot_function("lib/util.c", 1, "c:@F@inc", "inc", "int", 1, 7, 2, 8, 3),
        snapshot_function("lib/util.c", 3, "c:@F@dup", "dup", "int", 2, 6, 1, 7, 2),
        snapshot_function("src/calc.cpp", 4, "", "calc::twice", "int", 1, 7, 2, 8, 3),
        snapshot_function("src/calc.cpp", 9, "", "calc::twice", "double", 2, 7, 2, 8, 3),
    };
    return s;
}

SnapshotExpectations this_run() {
    SnapshotExpectations e;
    e.convention = "c-family/1";
    e.stroud = 18.0;
    return e;
}

std::string refusal(const std::string& text, const SnapshotExpectations& e = this_run()) {
    try {
        parse_snapshot(text, k_path, e);
    } catch (const UsageError& error) {
        return error.what();
    }
    return "(accepted)";
}

void replace_once(std::string& text, const std::string& from, const std::string& to) {
    const std::size_t at = text.find(from);
    REQUIRE(at != std::string::npos);
    text.replace(at, from.size(), to);
}

} // namespace

TEST_CASE("parse_snapshot", "[baseline]") {
    const Snapshot snapshot = sample_snapshot();
    const std::string text = snapshot_to_json(snapshot);

    SECTION("a written snapshot reads back equal") {
        CHECK(parse_snapshot(text, k_path, this_run()) == snapshot);
    }

    SECTION("the text has the documented keys in a fixed order") {
        const auto document = nlohmann::ordered_json::parse(text);
        std::vector<std::string> keys;
        for (const auto& item : document.items()) {
            keys.push_back(item.key());
        }
        CHECK(keys == std::vector<std::string>{"schema", "tool_version", "convention", "stroud",
                                               "commit", "created", "function_count",
                                               "content_digest", "functions"});
        CHECK(document["schema"] == "tollgate.snapshot/1");
        std::vector<std::string> function_keys;
        for (const auto& item : document["functions"][0].items()) {
            function_keys.push_back(item.key());
        }
        CHECK(function_keys == std::vector<std::string>{"file", "start_line", "end_line", "usr",
                                                        "fallback_key", "function", "signature",
                                                        "extent", "token_hash", "counts",
                                                        "potential_operands", "measures"});
        CHECK(document["functions"][0]["measures"].size() == 16);
    }

    SECTION("the same snapshot gives the same bytes, and only the time differs otherwise") {
        CHECK(snapshot_to_json(snapshot) == text);
        Snapshot later = snapshot;
        later.created = "2024-06-01T08:30:00Z";
        std::string later_text = snapshot_to_json(later);
        replace_once(later_text, "2024-06-01T08:30:00Z", "2024-05-01T12:00:00Z");
        CHECK(later_text == text);
    }

    SECTION("every proper prefix of the file is refused as truncated") {
        // The last byte is the newline after the closing brace: dropping it leaves a whole file.
        for (std::size_t length = 1; length + 1 < text.size(); ++length) {
            const std::string message = refusal(text.substr(0, length));
            INFO("length " << length << ": " << message);
            REQUIRE(message == k_path + ": truncated snapshot: the JSON ends after " +
                                   std::to_string(length) +
                                   " bytes before the document is complete (rebuild it: "
                                   "tollgate snapshot --out baselines/snapshot.json)");
        }
    }

    SECTION("an empty file is refused as truncated") {
        CHECK(refusal("") == "baselines/snapshot.json: truncated snapshot: the file is empty "
                             "(rebuild it: tollgate snapshot --out baselines/snapshot.json)");
    }

    SECTION("invalid JSON is refused with its line and column") {
        std::string broken = text;
        // Line 4 is `  "convention": "c-family/1",`: the colon is column 15.
        replace_once(broken, "\"convention\":", "\"convention\"#");
        CHECK(refusal(broken) ==
              "baselines/snapshot.json:4:15: corrupted snapshot: invalid JSON (rebuild it: "
              "tollgate snapshot --out baselines/snapshot.json)");
    }

    SECTION("a changed number that is still valid JSON is refused by the digest") {
        std::string edited = text;
        replace_once(edited, "\"n1\": 7,", "\"n1\": 8,");
        CHECK(refusal(edited) ==
              "baselines/snapshot.json: corrupted snapshot: the content does not match "
              "\"content_digest\", the file was edited or damaged (rebuild it: tollgate snapshot "
              "--rev 3f2a91c --out baselines/snapshot.json)");
    }

    SECTION("a measure that does not follow from its counts is refused, digest or not") {
        // The digest is no signature: whoever edits a measure can recompute it.
        Snapshot edited = snapshot;
        edited.functions[1].measures.effort = 1e9;
        CHECK(refusal(snapshot_to_json(edited)) ==
              "baselines/snapshot.json: corrupted snapshot: /functions/1/measures/effort: "
              "1000000000 does not follow from the function's counts (n1 6 n2 1 N1 7 N2 2 give "
              "151.59716579111063) (rebuild it: tollgate snapshot --rev 3f2a91c --out "
              "baselines/snapshot.json)");
        // Halstead 1977: E = (n1/2)(N2/n2)(N1+N2) log2(n1+n2) = (6/2)(2/1)(7+2) log2 7.
        CHECK(halstead_effort(6, 1, 7, 2) == Approx(151.59716579111063));
    }

    SECTION("a missing key is refused by its JSON pointer") {
        auto document = nlohmann::ordered_json::parse(text);
        document["functions"][2].erase("end_line");
        CHECK(refusal(document.dump(2)) ==
              "baselines/snapshot.json: corrupted snapshot: /functions/2/end_line: missing "
              "(rebuild it: tollgate snapshot --rev 3f2a91c --out baselines/snapshot.json)");
    }

    SECTION("a malformed time is refused") {
        std::string edited = text;
        replace_once(edited, "2024-05-01T12:00:00Z", "yesterday");
        CHECK(refusal(edited) ==
              "baselines/snapshot.json: corrupted snapshot: /created: expected a UTC time "
              "\"YYYY-MM-DDTHH:MM:SSZ\", found \"yesterday\" (rebuild it: tollgate snapshot "
              "--rev 3f2a91c --out baselines/snapshot.json)");
    }

    SECTION("foreign files are refused as not ours") {
        const std::string remedy = " (check the path; tollgate snapshot --out "
                                   "baselines/snapshot.json --force replaces it)";
        CHECK(refusal(R"({"schema": "tollgate.measure/1", "functions": []})") ==
              "baselines/snapshot.json: not a tollgate snapshot: its schema is "
              "\"tollgate.measure/1\", expected \"tollgate.snapshot/1\"" +
                  remedy);
        CHECK(refusal(R"({"name": "weather-station", "version": "1.0.0"})") ==
              "baselines/snapshot.json: not a tollgate snapshot: it has no \"schema\" key, "
              "expected \"tollgate.snapshot/1\"" +
                  remedy);
        CHECK(refusal("[1, 2, 3]") ==
              "baselines/snapshot.json: not a tollgate snapshot: the JSON is an array, expected "
              "an object with \"schema\": \"tollgate.snapshot/1\"" +
                  remedy);
        CHECK(refusal("# release notes\n") ==
              "baselines/snapshot.json: not a tollgate snapshot: the file is not a JSON object" +
                  remedy);
    }

    SECTION("another schema version is refused with the rebuild command") {
        std::string other = text;
        replace_once(other, "tollgate.snapshot/1", "tollgate.snapshot/2");
        CHECK(refusal(other) ==
              "baselines/snapshot.json was written with snapshot schema version 2, this tollgate " +
                  std::string(TOLLGATE_VERSION) +
                  " reads version 1 (rebuild it: tollgate snapshot --rev 3f2a91c --out "
                  "baselines/snapshot.json)");
    }

    SECTION("another convention fingerprint is refused with the rebuild command") {
        Snapshot other = snapshot;
        other.convention = "c-family/1+body-only";
        CHECK(refusal(snapshot_to_json(other)) ==
              "baselines/snapshot.json was measured under convention \"c-family/1+body-only\", "
              "this run counts \"c-family/1\" (rebuild it: tollgate snapshot --rev 3f2a91c --out "
              "baselines/snapshot.json)");
    }

    SECTION("another Stroud number is refused with the rebuild command") {
        Snapshot other = snapshot;
        other.stroud = 20;
        CHECK(refusal(snapshot_to_json(other)) ==
              "baselines/snapshot.json was measured with Stroud number 20, this run uses 18 "
              "(rebuild it: tollgate snapshot --rev 3f2a91c --out baselines/snapshot.json)");
        SnapshotExpectations five = this_run();
        five.stroud = 5;
        CHECK(refusal(text, five) ==
              "baselines/snapshot.json was measured with Stroud number 18, this run uses 5 "
              "(rebuild it: tollgate snapshot --rev 3f2a91c --out baselines/snapshot.json "
              "--stroud 5)");
    }

    SECTION("no expectations accept any convention and Stroud number") {
        Snapshot other = snapshot;
        other.convention = "c-family/1+merged-forms";
        other.stroud = 10;
        for (auto& f : other.functions) {
            f.measures.time = f.measures.effort / 10; // T = E / S (Halstead 1977, from memory)
        }
        CHECK(parse_snapshot(snapshot_to_json(other), k_path) == other);
    }
}

TEST_CASE("load_snapshot", "[baseline]") {
    TempDir dir;
    const std::string path = dir.path() + "/missing.json";
    CHECK_THROWS_WITH(load_snapshot(path),
                      "cannot read snapshot \"" + path +
                          "\": no such file (write one: tollgate snapshot --out " + path + ")");
    CHECK_THROWS_WITH(load_snapshot(dir.path()),
                      "cannot read snapshot \"" + dir.path() + "\": it is a folder");
}

TEST_CASE("save_snapshot", "[baseline]") {
    TempDir dir;
    const Snapshot snapshot = sample_snapshot();
    const std::string path = dir.path() + "/baselines/snapshot.json";

    SECTION("it creates the folder and writes exactly snapshot_to_json") {
        save_snapshot(snapshot, path);
        CHECK(read_text(path) == snapshot_to_json(snapshot));
        CHECK(load_snapshot(path) == snapshot);
        // Only the snapshot is left in the folder: the temporary file was renamed.
        std::vector<std::string> entries;
        for (const auto& entry : fs::directory_iterator(dir.path() + "/baselines")) {
            entries.push_back(entry.path().filename().string());
        }
        CHECK(entries == std::vector<std::string>{"snapshot.json"});
    }

    SECTION("it replaces a snapshot of another convention") {
        Snapshot other = snapshot;
        other.convention = "c-family/1+body-only";
        save_snapshot(other, path);
        save_snapshot(snapshot, path);
        CHECK(load_snapshot(path) == snapshot);
    }

    SECTION("it refuses to replace a file that is not a snapshot unless forced") {
        dir.write("baselines/snapshot.json", "{\"keep\": \"me\"}\n");
        CHECK_THROWS_WITH(save_snapshot(snapshot, path),
                          "refusing to replace \"" + path +
                              "\": not a tollgate snapshot: "
                              "it has no \"schema\" key, expected \"tollgate.snapshot/1\" (move "
                              "it away, or pass --force to replace it)");
        CHECK(read_text(path) == "{\"keep\": \"me\"}\n");
        save_snapshot(snapshot, path, tollgate::baseline::Overwrite::anything);
        CHECK(load_snapshot(path) == snapshot);
    }

    SECTION("it refuses to replace a truncated snapshot unless forced") {
        const std::string text = snapshot_to_json(snapshot);
        dir.write("baselines/snapshot.json", text.substr(0, 200));
        CHECK_THROWS_WITH(save_snapshot(snapshot, path),
                          "refusing to replace \"" + path +
                              "\": truncated snapshot: the "
                              "JSON ends after 200 bytes before the document is complete (move "
                              "it away, or pass --force to replace it)");
        CHECK(read_text(path) == text.substr(0, 200));
    }

    SECTION("it removes temporary files of writers that no longer run, and only those") {
        // Process id 1 (init) always runs; a pid past the kernel's limit never does.
        dir.write("baselines/.snapshot.json.tollgate-tmp-1-abc123", "live writer");
        dir.write("baselines/.snapshot.json.tollgate-tmp-99999999-abc123", "dead writer");
        dir.write("baselines/.other.json.tollgate-tmp-99999999-abc123", "another file's");
        save_snapshot(snapshot, path);
        CHECK(fs::exists(dir.path() + "/baselines/.snapshot.json.tollgate-tmp-1-abc123"));
        CHECK_FALSE(
            fs::exists(dir.path() + "/baselines/.snapshot.json.tollgate-tmp-99999999-abc123"));
        CHECK(fs::exists(dir.path() + "/baselines/.other.json.tollgate-tmp-99999999-abc123"));
    }
}

TEST_CASE("find_function", "[baseline]") {
    Snapshot snapshot = sample_snapshot();

    SECTION("a USR finds its function even when the ordinal moved") {
        const auto* f = find_function(snapshot, "lib/util.c", "c:@F@inc", "inc(int)#5");
        REQUIRE(f != nullptr);
        CHECK(f->start_line == 1);
    }

    SECTION("without a USR the fallback key decides") {
        const auto* f = find_function(snapshot, "src/calc.cpp", "", "calc::twice(double)#2");
        REQUIRE(f != nullptr);
        CHECK(f->start_line == 9);
    }

    SECTION("name and signature find a function whose ordinal changed") {
        const auto* f = find_function(snapshot, "src/calc.cpp", "", "calc::twice(double)#7");
        REQUIRE(f != nullptr);
        CHECK(f->start_line == 9);
    }

    SECTION("a USR shared by two functions is settled by the fallback key") {
        snapshot.functions[1].usr = "c:@F@inc";
        const auto* f = find_function(snapshot, "lib/util.c", "c:@F@inc", "dup(int)#2");
        REQUIRE(f != nullptr);
        CHECK(f->start_line == 3);
    }

    SECTION("the same function in another file is not found") {
        CHECK(find_function(snapshot, "lib/other.c", "c:@F@inc", "inc(int)#1") == nullptr);
        CHECK(find_function(snapshot, "src/calc.cpp", "", "calc::thrice(int)#1") == nullptr);
    }

    SECTION("an ambiguous name and signature finds nothing") {
        snapshot.functions[3].signature = "int";
        snapshot.functions[3].fallback_key = "calc::twice(int)#2";
        CHECK(find_function(snapshot, "src/calc.cpp", "", "calc::twice(int)#9") == nullptr);
    }
}

TEST_CASE("confine_to_repository", "[baseline]") {
    TempDir repo, outside;
    const std::string root = fs::canonical(repo.path()).string();
    using tollgate::baseline::confine_to_repository;

    SECTION("a relative path inside is resolved from the root") {
        CHECK(confine_to_repository("baselines/snapshot.json", repo.path()) ==
              root + "/baselines/snapshot.json");
        CHECK(confine_to_repository("a/../baselines/s.json", repo.path()) ==
              root + "/baselines/s.json");
    }

    SECTION("a path climbing out with .. is refused") {
        CHECK_THROWS_WITH(
            confine_to_repository("../outside.json", repo.path()),
            "snapshot path \"../outside.json\" resolves to \"" +
                fs::path(root).parent_path().string() +
                "/outside.json\", outside the repository \"" + root +
                "\" (keep it inside the repository, or give the path with --out on the command "
                "line)");
        CHECK_THROWS_AS(confine_to_repository("baselines/../../x.json", repo.path()), UsageError);
    }

    SECTION("an absolute path elsewhere is refused") {
        CHECK_THROWS_AS(confine_to_repository(outside.path() + "/s.json", repo.path()), UsageError);
    }

    SECTION("a symlink escaping the repository is refused") {
        fs::create_directory_symlink(outside.path(), repo.path() + "/baselines");
        const std::string target = fs::canonical(outside.path()).string() + "/snapshot.json";
        CHECK_THROWS_WITH(confine_to_repository("baselines/snapshot.json", repo.path()),
                          "snapshot path \"baselines/snapshot.json\" resolves to \"" + target +
                              "\", outside the repository \"" + root +
                              "\" (keep it inside the repository, or give the path with --out "
                              "on the command line)");
    }

    SECTION("the root itself is refused") {
        CHECK_THROWS_WITH(confine_to_repository(".", repo.path()),
                          "snapshot path \".\" names the repository folder itself, not a file "
                          "(give a file path such as \"baselines/snapshot.json\")");
    }
}

TEST_CASE("make_snapshot", "[baseline]") {
    auto span = [](const std::string& path, unsigned line, const std::string& key) {
        tollgate::lexer::FunctionSpan s;
        s.path = path;
        s.start_line = line;
        s.end_line = line + 1;
        s.fallback_key = key;
        s.qualified_name = key.substr(0, key.find('('));
        s.token_hash = "0";
        return s;
    };
    std::vector<tollgate::lexer::FileFunctions> files(2);
    files[0].path = "z.c";
    files[0].functions = {span("z.c", 9, "b()#1"), span("z.c", 2, "a()#0")};
    files[1].path = "a.c";
    files[1].functions = {span("a.c", 5, "c()#0"), span("a.c", 5, "c()#0")};
    tollgate::core::MeasureSettings settings;
    settings.stroud = 10;
    const Snapshot s = tollgate::baseline::make_snapshot(files, k_commit, "c-family/1", settings,
                                                         "2024-05-01T12:00:00Z");

    SECTION("functions are sorted by path and line, a repeated one kept once") {
        REQUIRE(s.functions.size() == 3);
        CHECK(s.functions[0].path == "a.c");
        CHECK(s.functions[1].start_line == 2);
        CHECK(s.functions[2].start_line == 9);
    }

    SECTION("the header records the commit, convention, Stroud number and version") {
        CHECK(s.commit == k_commit);
        CHECK(s.convention == "c-family/1");
        CHECK(s.stroud == 10);
        CHECK(s.tool_version == TOLLGATE_VERSION);
        CHECK(s.created == "2024-05-01T12:00:00Z");
    }

    SECTION("the result survives a write and a read") {
        CHECK(parse_snapshot(snapshot_to_json(s), k_path) == s);
    }
}
