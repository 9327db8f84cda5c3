// SPDX-License-Identifier: MIT
// Files the tools write and read under pressure, end to end: outputs that cannot be written (one
// message form and exit 3 for every kind, before the work), calibrate without a cache folder, and
// source files over the size limit (listed with their size in every report, never read).
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <string>
#include <unistd.h>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_command;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;
using tollgate::test::tollgate_binary;

namespace fs = std::filesystem;

namespace {

// A repository with two commits: f.c, then g.c added.
std::string make_repo(const std::string& root) {
    init_repo(root);
    std::ofstream(root + "/f.c") << "int f(int x) {\n    return x + 1;\n}\n";
    commit_all(root, "f");
    std::ofstream(root + "/g.c") << "int g(int y) { return y * 2; }\n";
    commit_all(root, "g");
    return root;
}

// Run tollgate with `args` in `cwd` as a user who may not write to "ro" (see read_only_setup).
tollgate::test::RunResult run_unprivileged(const std::string& args, const std::string& cwd,
                                           const std::string& home) {
    const std::string prefix =
        ::geteuid() == 0 ? "setpriv --reuid=4321 --regid=4321 --clear-groups " : std::string();
    return run_command(prefix + "env HOME=" + shell_quote(home) + " " +
                           shell_quote(tollgate_binary()) + " " + args,
                       cwd);
}

// Make `dir` hold a repository "r" the test's user owns and a folder "r/ro" that user cannot
// write to. As root (CI), root keeps "ro" and the rest goes to uid 4321, which runs tollgate:
// root itself writes anywhere. Return the repository's path.
std::string read_only_setup(const TempDir& dir) {
    const std::string root = make_repo(dir.path() + "/r");
    fs::create_directories(root + "/ro");
    fs::create_directories(dir.path() + "/home");
    if (::geteuid() == 0) {
        REQUIRE(run_command("chown -R 4321:4321 " + shell_quote(dir.path()) + " && chown 0:0 " +
                                shell_quote(root + "/ro") + " && chmod 755 " +
                                shell_quote(root + "/ro") + " " + shell_quote(dir.path()),
                            ".")
                    .exit_code == 0);
    } else {
        fs::permissions(root + "/ro", fs::perms::owner_read | fs::perms::owner_exec);
    }
    return root;
}

} // namespace

TEST_CASE("an output that cannot be written fails the same way for every kind, before the work",
          "[cli][bad-input]") {
    TempDir dir;
    const std::string root = read_only_setup(dir);
    const std::string home = dir.path() + "/home";
    const std::string denied = ": permission denied (choose a folder you can write to)\n";
    SECTION("a report") {
        const auto result = run_unprivileged(
            "check --base HEAD~1 --head HEAD --no-pch-cache --report json:ro/r.json", root, home);
        CHECK(result.exit_code == 3);
        CHECK(result.err == "tollgate: error: cannot write report \"ro/r.json\"" + denied);
        CHECK(result.out.empty()); // refused before anything was measured or printed
    }
    SECTION("a report in a folder that cannot be made") {
        const auto result = run_unprivileged(
            "check --base HEAD~1 --head HEAD --no-pch-cache --report markdown:ro/sub/r.md", root,
            home);
        CHECK(result.exit_code == 3);
        CHECK(result.err == "tollgate: error: cannot write report \"ro/sub/r.md\": cannot create "
                            "folder \"" +
                                fs::canonical(root).string() + "/ro/sub\"" + denied);
    }
    SECTION("a snapshot") {
        const auto result = run_unprivileged("snapshot --no-pch-cache --out ro/s.json", root, home);
        CHECK(result.exit_code == 3);
        CHECK(result.err == "tollgate: error: cannot write snapshot \"ro/s.json\"" + denied);
    }
    SECTION("a policy and a page written by calibrate") {
        const std::string cache = "--no-pch-cache --cache-dir " + shell_quote(home + "/cache");
        const auto policy =
            run_unprivileged("calibrate " + cache + " --suggest 90 --out ro/p.yaml", root, home);
        CHECK(policy.exit_code == 3);
        CHECK(policy.err == "tollgate: error: cannot write policy \"ro/p.yaml\"" + denied);
        const auto page = run_unprivileged("calibrate " + cache + " --html ro/c.html", root, home);
        CHECK(page.exit_code == 3);
        CHECK(page.err == "tollgate: error: cannot write HTML page \"ro/c.html\"" + denied);
    }
    SECTION("a pre-push hook, written by the same writer") {
        // Hooks go where core.hooksPath says: here the folder the user cannot write to.
        REQUIRE(run_command(std::string("git config --file .git/config core.hooksPath ro") +
                                (::geteuid() == 0 ? " && chown 4321:4321 .git/config" : ""),
                            root)
                    .exit_code == 0);
        const auto result = run_unprivileged("hook install", root, home);
        CHECK(result.exit_code == 3);
        const std::string start = "tollgate: error: cannot write hook \"";
        const std::string end = "/ro/pre-push\"" + denied;
        CHECK(result.err.rfind(start, 0) == 0);
        CHECK(result.err.size() > start.size() + end.size());
        CHECK(result.err.compare(result.err.size() - end.size(), end.size(), end) == 0);
        CHECK_FALSE(fs::exists(root + "/ro/pre-push"));
    }
    SECTION("a folder where the file should go") {
        const auto report = run_unprivileged(
            "check --base HEAD~1 --head HEAD --no-pch-cache --report json:ro", root, home);
        CHECK(report.exit_code == 3);
        CHECK(report.err ==
              "tollgate: error: cannot write report \"ro\": it is a folder (give a file path)\n");
        const auto snapshot = run_unprivileged("snapshot --no-pch-cache --out ro", root, home);
        CHECK(snapshot.exit_code == 3);
        CHECK(snapshot.err ==
              "tollgate: error: cannot write snapshot \"ro\": it is a folder (give a file path)\n");
    }
}

TEST_CASE("calibrate without a creatable cache folder warns and runs without it",
          "[cli][bad-input]") {
    TempDir dir;
    const std::string root = make_repo(dir.path() + "/r");
    // A regular file in the path: no user, root included, can make a folder below it.
    std::ofstream(dir.path() + "/plain") << "not a folder\n";
    const std::string blocked = dir.path() + "/plain/cache";
    const auto result = run_tollgate(
        "calibrate --no-pch-cache --format json --cache-dir " + shell_quote(blocked), root);
    CHECK(result.exit_code == 0);
    CHECK(result.err == "tollgate: warning: cannot create cache folder \"" + blocked +
                            "\": not a directory; calibrate runs without its lexed-file cache "
                            "(pass --cache-dir to choose another folder)\n");
    const auto report = nlohmann::json::parse(result.out);
    CHECK(report["commits"].size() == 1);
    CHECK(report["cache"]["hits"] == 0);
    CHECK(report["cache"]["parses"] == report["cache"]["visits"]);
    CHECK(report["cache"]["parses"].get<int>() > 0);
}

TEST_CASE("files over the size limit are listed with their size and never read",
          "[cli][bad-input]") {
    TempDir dir;
    const std::string root = make_repo(dir.path() + "/r");
    // 2000 bytes of C: one function padded with a comment.
    const std::string big =
        "int big(int z) { return z - 1; }\n/*" + std::string(1962, '.') + "*/\n";
    REQUIRE(big.size() == 2000);

    SECTION("measure lists an oversized working-tree file as a warning with its size") {
        std::ofstream(root + "/big.c") << big;
        const auto text = run_tollgate("measure --max-file-size 1K --no-pch-cache", root);
        CHECK(text.exit_code == 0);
        CHECK(text.out.find("big.c:1") == std::string::npos);
        CHECK(text.out.find("f.c:1") != std::string::npos);
        CHECK(text.out.find("warning: big.c: not measured, too large: 1.9 KiB, over the 1 KiB "
                            "limit of --max-file-size\n") != std::string::npos);
        const auto json =
            run_tollgate("measure --max-file-size 1K --no-pch-cache --format json", root);
        const auto warnings = nlohmann::json::parse(json.out)["warnings"];
        REQUIRE(warnings.size() == 1);
        CHECK(warnings[0]["file"] == "big.c");
        CHECK(warnings[0]["message"] ==
              "not measured, too large: 1.9 KiB, over the 1 KiB limit of --max-file-size");
        // The same file under the default limit, or none, is measured.
        CHECK(run_tollgate("measure --no-pch-cache", root).out.find("big.c:1") !=
              std::string::npos);
        CHECK(run_tollgate("measure --max-file-size 0 --no-pch-cache", root).out.find("big.c:1") !=
              std::string::npos);
    }
    SECTION("measure outside a repository lists an oversized file of the folder the same way") {
        const std::string folder = dir.path() + "/plain";
        fs::create_directories(folder);
        std::ofstream(folder + "/big.c") << big;
        std::ofstream(folder + "/small.c") << "int s(int v) { return v; }\n";
        const auto text = run_tollgate("measure --max-file-size 1K --no-pch-cache", folder);
        CHECK(text.exit_code == 0);
        CHECK(text.out.find("big.c:1") == std::string::npos);
        CHECK(text.out.find("small.c:1") != std::string::npos);
        CHECK(text.out.find("warning: big.c: not measured, too large: 1.9 KiB, over the 1 KiB "
                            "limit of --max-file-size\n") != std::string::npos);
    }
    SECTION("explain refuses an oversized file") {
        std::ofstream(root + "/big.c") << big;
        const auto result = run_tollgate("explain big.c:big --max-file-size 1K", root);
        CHECK(result.exit_code == 2);
        CHECK(result.err == "tollgate: error: \"big.c\" was not read: 1.9 KiB is over the 1 KiB "
                            "limit (raise it with --max-file-size)\n");
    }
    SECTION("check lists a changed oversized file as skipped, with its size, in every report") {
        std::ofstream(root + "/big.c") << big;
        commit_all(root, "big");
        const std::string reason = "too large: 1.9 KiB, over the 1 KiB limit of --max-file-size";
        const auto result =
            run_tollgate("check --base HEAD~1 --head HEAD --max-file-size 1K --no-pch-cache "
                         "--report json:c.json --report text:c.txt --report markdown:c.md "
                         "--report sarif:c.sarif",
                         root);
        CHECK(result.exit_code == 0);
        const auto json = nlohmann::json::parse(read_text(root + "/c.json"));
        REQUIRE(json["skipped"].size() == 1);
        CHECK(json["skipped"][0]["file"] == "big.c");
        CHECK(json["skipped"][0]["reason"] == reason);
        CHECK(json["functions"].empty());
        CHECK(read_text(root + "/c.txt").find("skipped: big.c (" + reason + ")\n") !=
              std::string::npos);
        CHECK(read_text(root + "/c.md").find("skipped `big.c` (" + reason + ")") !=
              std::string::npos);
        const auto sarif = nlohmann::json::parse(read_text(root + "/c.sarif"));
        const auto& skipped = sarif["runs"][0]["properties"]["skipped"];
        REQUIRE(skipped.size() == 1);
        CHECK(skipped[0]["file"] == "big.c");
        CHECK(skipped[0]["reason"] == reason);
    }
    SECTION("a working-tree file far larger than memory is only listed") {
        // A sparse file: its size costs no disk. Reading it whole would need more memory than
        // the address-space limit the run gets (sanitizer builds reserve far more address space
        // than that, so they get a smaller file and no limit).
#if defined(__SANITIZE_ADDRESS__)
        const bool sanitized = true; // the binary under test is built the same way
#else
        const bool sanitized = false;
#endif
        const std::string size = sanitized ? "24M" : "8G";
        REQUIRE(run_command("truncate -s " + size + " huge.c", root).exit_code == 0);
        const std::string limit = sanitized ? "" : "ulimit -v 4000000; ";
        const auto result = run_command(
            limit + shell_quote(tollgate_binary()) + " measure --no-pch-cache -j 1", root);
        INFO(result.err);
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("warning: huge.c: not measured, too large: " +
                              std::string(sanitized ? "24 MiB" : "8 GiB") +
                              ", over the 16 MiB limit of --max-file-size\n") != std::string::npos);
        CHECK(result.out.find("f.c:1") != std::string::npos);
    }
}
