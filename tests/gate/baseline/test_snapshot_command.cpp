// SPDX-License-Identifier: MIT
// `tollgate snapshot` end to end: real temp repositories, the real binary, agreement with
// `tollgate measure`, determinism, refusals, confinement and a writer killed before its rename.
#include "gate/baseline/snapshot_file.hpp"
#include "gate/common/errors.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <chrono>
#include <csignal>
#include <fcntl.h>
#include <filesystem>
#include <map>
#include <nlohmann/json.hpp>
#include <regex>
#include <set>
#include <sys/wait.h>
#include <thread>
#include <tuple>
#include <unistd.h>

namespace fs = std::filesystem;
using tollgate::test::commit_all;
using tollgate::test::git;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

// A small C and C++ code base (invented for the test): a header with a class, out-of-line
// members, a static function, a lambda and a C file.
void write_older_tree(const TempDir& dir) {
    dir.write("include/geo/vec.hpp", "#pragma once\n"
                                     "namespace geo {\n"
                                     "struct Vec {\n"
                                     "    double x;\n"
                                     "    double y;\n"
                                     "    double dot(const Vec& o) const;\n"
                                     "    double norm2() const { return dot(*this); }\n"
                                     "};\n"
                                     "Vec add(const Vec& a, const Vec& b);\n"
                                     "}\n");
    dir.write("src/vec.cpp", "#include \"geo/vec.hpp\"\n"
                             "namespace geo {\n"
                             "double Vec::dot(const Vec& o) const { return x * o.x + y * o.y; }\n"
                             "Vec add(const Vec& a, const Vec& b) {\n"
                             "    return Vec{a.x + b.x, a.y + b.y};\n"
                             "}\n"
                             "static int clamp(int v, int lo, int hi) {\n"
                             "    return v < lo ? lo : (v > hi ? hi : v);\n"
                             "}\n"
                             "int apply(int v) {\n"
                             "    auto twice = [](int q) { return q * 2; };\n"
                             "    return clamp(twice(v), 0, 100);\n"
                             "}\n"
                             "}\n");
    dir.write("c/crc.c", "unsigned crc_step(unsigned crc, unsigned char byte) {\n"
                         "    crc ^= byte;\n"
                         "    for (int k = 0; k < 8; ++k) {\n"
                         "        crc = (crc >> 1) ^ (0xEDB88320u & (0u - (crc & 1u)));\n"
                         "    }\n"
                         "    return crc;\n"
                         "}\n");
}

// Make a repository with two commits; HEAD adds a function and the working tree has an
// uncommitted one. Return the older commit's id.
std::string make_history(const TempDir& dir) {
    init_repo(dir.path());
    write_older_tree(dir);
    const std::string older = commit_all(dir.path(), "older");
    dir.write("src/extra.cpp", "#include \"geo/vec.hpp\"\n"
                               "double length2(const geo::Vec& v) { return v.norm2(); }\n");
    commit_all(dir.path(), "newer");
    dir.write("c/dirty.c", "int dirty(void) { return 1; }\n");
    return older;
}

// Run `tollgate snapshot ARGS` (without the precompiled-header cache), requiring success.
void snapshot(const std::string& cwd, const std::string& args) {
    const auto result = run_tollgate("snapshot --no-pch-cache " + args, cwd);
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
}

// Return `text` with the value of "created" blanked.
std::string without_time(const std::string& text) {
    static const std::regex created("\"created\": \"[0-9TZ:-]+\"");
    return std::regex_replace(text, created, "\"created\": \"\"");
}

// Start the binary with `args` in `cwd` and `variable=value` added to the environment.
pid_t spawn_tollgate(const std::vector<std::string>& args, const std::string& cwd,
                     const std::string& variable, const std::string& value) {
    const pid_t pid = fork();
    REQUIRE(pid != -1);
    if (pid == 0) {
        if (chdir(cwd.c_str()) != 0) {
            _exit(127);
        }
        const int null = open("/dev/null", O_WRONLY);
        dup2(null, 1);
        dup2(null, 2);
        setenv(variable.c_str(), value.c_str(), 1);
        std::vector<char*> argv;
        std::string binary = TOLLGATE_BINARY;
        argv.push_back(binary.data());
        std::vector<std::string> copies = args;
        for (auto& a : copies) {
            argv.push_back(a.data());
        }
        argv.push_back(nullptr);
        execv(binary.c_str(), argv.data());
        _exit(127);
    }
    return pid;
}

std::vector<std::string> temporaries(const std::string& folder) {
    std::vector<std::string> found;
    for (const auto& entry : fs::directory_iterator(folder)) {
        const std::string name = entry.path().filename().string();
        if (name.find(".tollgate-tmp-") != std::string::npos) {
            found.push_back(name);
        }
    }
    return found;
}

} // namespace

TEST_CASE("snapshot agrees with measure at an older revision, read without checkout",
          "[baseline]") {
    TempDir dir;
    const std::string older = make_history(dir);
    const std::string status_before = git("status --porcelain", dir.path());
    const std::string head_before = git("rev-parse HEAD", dir.path());

    snapshot(dir.path(), "--rev HEAD~1 --out older.json");
    const auto measured =
        run_tollgate("measure --rev HEAD~1 --format json --no-pch-cache", dir.path());
    REQUIRE(measured.exit_code == 0);
    const auto reference = nlohmann::json::parse(measured.out);
    const auto written = nlohmann::json::parse(read_text(dir.path() + "/older.json"));

    // The header names the commit, the convention and the tool.
    CHECK(written["schema"] == "tollgate.snapshot/1");
    CHECK(written["commit"] == older);
    CHECK(written["convention"] == reference["convention"]);
    CHECK(written["tool_version"] == TOLLGATE_VERSION);
    CHECK(written["stroud"] == 18.0);
    CHECK(std::regex_match(written["created"].get<std::string>(),
                           std::regex("[0-9]{4}-[0-9]{2}-[0-9]{2}T[0-9]{2}:[0-9]{2}:[0-9]{2}Z")));

    // Every function and every measure equals what measure reports.
    using Key = std::tuple<std::string, unsigned, std::string>;
    std::map<Key, nlohmann::json> expected;
    for (const auto& f : reference["functions"]) {
        expected[{f["file"], f["line"], f["function"]}] = f;
    }
    REQUIRE(written["functions"].size() == expected.size());
    std::set<std::string> names;
    for (const auto& f : written["functions"]) {
        names.insert(f["function"].get<std::string>());
        const Key key{f["file"], f["start_line"], f["function"]};
        REQUIRE(expected.count(key) == 1);
        const auto& m = expected[key];
        CHECK(f["end_line"] == m["end_line"]);
        CHECK(f["signature"] == m["signature"]);
        CHECK(f["extent"] == m["extent"]);
        CHECK(f["measures"] == m["measures"]);
        CHECK(f["counts"]["n1"] == m["measures"]["n1"]);
        CHECK(f["counts"]["n2"] == m["measures"]["n2"]);
        CHECK(f["counts"]["N1"] == m["measures"]["N1"]);
        CHECK(f["counts"]["N2"] == m["measures"]["N2"]);
        CHECK_FALSE(f["token_hash"].get<std::string>().empty());
        CHECK_FALSE(f["fallback_key"].get<std::string>().empty());
    }
    // The six definitions of the older tree (the lambda belongs to apply); length2 (only in
    // HEAD) and dirty (uncommitted) are absent.
    CHECK(names == std::set<std::string>{"geo::Vec::norm2", "geo::Vec::dot", "geo::add",
                                         "geo::clamp", "geo::apply", "crc_step"});

    // The working tree and HEAD are untouched.
    CHECK(git("status --porcelain", dir.path()) == status_before + "?? older.json\n");
    CHECK(git("rev-parse HEAD", dir.path()) == head_before);

    // The file loads under this run's expectations.
    tollgate::baseline::SnapshotExpectations e;
    e.convention = reference["convention"].get<std::string>();
    e.stroud = 18.0;
    const auto loaded = tollgate::baseline::load_snapshot(dir.path() + "/older.json", e);
    CHECK(loaded.commit == older);
    CHECK(loaded.functions.size() == reference["functions"].size());
}

TEST_CASE("snapshot is byte-identical apart from its time", "[baseline]") {
    TempDir dir;
    make_history(dir);
    snapshot(dir.path(), "--out one.json -j 1");
    std::this_thread::sleep_for(std::chrono::milliseconds(1100)); // let the clock move on
    snapshot(dir.path(), "--out two.json -j 2");
    const std::string one = read_text(dir.path() + "/one.json");
    const std::string two = read_text(dir.path() + "/two.json");
    CHECK(one != two); // the times differ
    CHECK(without_time(one) == without_time(two));
    CHECK(without_time(one) != one);
}

TEST_CASE("snapshot writes the default path inside the repository", "[baseline]") {
    TempDir dir, outside;
    make_history(dir);

    SECTION("from a subfolder it writes baselines/snapshot.json at the root") {
        snapshot(dir.path() + "/src", "");
        CHECK(fs::exists(dir.path() + "/baselines/snapshot.json"));
        CHECK_FALSE(fs::exists(dir.path() + "/src/baselines"));
    }

    SECTION("a symlink carrying the default path out of the repository is refused") {
        fs::create_directory_symlink(outside.path(), dir.path() + "/baselines");
        const auto result = run_tollgate("snapshot --no-pch-cache", dir.path());
        CHECK(result.exit_code == 2);
        const std::string root = fs::canonical(dir.path()).string();
        const std::string target = fs::canonical(outside.path()).string() + "/snapshot.json";
        CHECK(result.err == "tollgate: error: snapshot path \"baselines/snapshot.json\" resolves "
                            "to \"" +
                                target + "\", outside the repository \"" + root +
                                "\" (keep it inside the repository, or give the path with --out "
                                "on the command line)\n");
        CHECK(fs::is_empty(outside.path()));
    }

    SECTION("an explicit --out may lie outside") {
        snapshot(dir.path(), "--out " + shell_quote(outside.path() + "/s.json"));
        CHECK(fs::exists(outside.path() + "/s.json"));
    }
}

TEST_CASE("snapshot never silently replaces a file that is not a snapshot", "[baseline]") {
    TempDir dir;
    make_history(dir);
    dir.write("baselines/snapshot.json", "{\"keep\": true}\n");
    const auto refused = run_tollgate("snapshot --no-pch-cache", dir.path());
    CHECK(refused.exit_code == 2);
    CHECK(refused.err == "tollgate: error: refusing to replace \"baselines/snapshot.json\": not a "
                         "tollgate snapshot: it has no \"schema\" key, expected "
                         "\"tollgate.snapshot/1\" (move it away, or pass --force to replace it)\n");
    CHECK(read_text(dir.path() + "/baselines/snapshot.json") == "{\"keep\": true}\n");

    snapshot(dir.path(), "--force");
    CHECK_NOTHROW(tollgate::baseline::load_snapshot(dir.path() + "/baselines/snapshot.json"));
    // A snapshot (now valid) is replaced without --force.
    snapshot(dir.path(), "--rev HEAD~1");
}

TEST_CASE("snapshot killed before its rename leaves the previous snapshot intact", "[baseline]") {
    TempDir dir;
    make_history(dir);
    const std::string folder = dir.path() + "/baselines";
    const std::string path = folder + "/snapshot.json";
    snapshot(dir.path(), "--rev HEAD~1");
    const std::string previous = read_text(path);

    // The hook makes the writer sleep after its temporary file is complete and synced.
    const pid_t writer = spawn_tollgate({"snapshot", "--no-pch-cache"}, dir.path(),
                                        tollgate::baseline::k_pause_before_rename_variable, "120");
    // Wait until the temporary file holds the whole new snapshot: the writer is then paused
    // between its fsync and its rename, the worst moment to die.
    const auto deadline = std::chrono::steady_clock::now() + std::chrono::seconds(120);
    std::vector<std::string> left;
    bool complete = false;
    while (!complete && std::chrono::steady_clock::now() < deadline) {
        std::this_thread::sleep_for(std::chrono::milliseconds(20));
        left = temporaries(folder);
        if (left.size() == 1) {
            try {
                tollgate::baseline::parse_snapshot(read_text(folder + "/" + left.front()), "tmp");
                complete = true;
            } catch (const tollgate::UsageError&) {
                // still being written
            }
        }
    }
    REQUIRE(complete);
    REQUIRE(kill(writer, SIGKILL) == 0);
    int status = 0;
    REQUIRE(waitpid(writer, &status, 0) == writer);
    REQUIRE(WIFSIGNALED(status));

    // The previous snapshot is intact byte for byte.
    CHECK(read_text(path) == previous);
    CHECK_NOTHROW(tollgate::baseline::load_snapshot(path));
    // The orphan is named after the killed writer and never read as a snapshot.
    CHECK(left.front().rfind(".snapshot.json.tollgate-tmp-" + std::to_string(writer) + "-", 0) ==
          0);

    // The next run removes the orphan and writes the new snapshot.
    snapshot(dir.path(), "");
    CHECK(temporaries(folder).empty());
    const auto loaded = tollgate::baseline::load_snapshot(path);
    CHECK(loaded.commit + "\n" == git("rev-parse HEAD", dir.path()));
}

TEST_CASE("snapshot --compare refuses a damaged snapshot", "[baseline]") {
    TempDir dir;
    make_history(dir);
    snapshot(dir.path(), "--out base.json");
    const std::string text = read_text(dir.path() + "/base.json");
    dir.write("cut.json", text.substr(0, 120));
    const auto result = run_tollgate("snapshot --compare base.json cut.json", dir.path());
    CHECK(result.exit_code == 2);
    CHECK(result.err == "tollgate: error: cut.json: truncated snapshot: the JSON ends after 120 "
                        "bytes before the document is complete (rebuild it: tollgate snapshot "
                        "--out cut.json)\n");
    CHECK(result.out.empty());
}
