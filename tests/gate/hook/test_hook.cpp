// SPDX-License-Identifier: MIT
// `tollgate hook`: git's pre-push input, install/uninstall with chaining, and real pushes into a
// local bare repository that the installed hook blocks or lets through.
#include "gate/common/errors.hpp"
#include "gate/hook/pre_push.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <string>

using tollgate::test::commit_all;
using tollgate::test::git;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_command;
using tollgate::test::run_tollgate;
using tollgate::test::TempDir;

namespace {

const std::string k_zero(40, '0');

// A policy that blocks any changed function whose effort grows by more than 10%.
const char* const k_strict_policy = "tollgate-policy: 1\n"
                                    "noise-floor:\n"
                                    "  volume: 1\n"
                                    "rules:\n"
                                    "  - id: effort-growth\n"
                                    "    kind: growth\n"
                                    "    measure: effort\n"
                                    "    max-increase-percent: 10\n"
                                    "    level: blocking\n";

const char* const k_base_source = "int scale(int reading, int gain) {\n"
                                  "    return reading * gain;\n"
                                  "}\n";

// Much more effort: a clamp with branches and new operands.
const char* const k_grown_source = "int scale(int reading, int gain) {\n"
                                   "    int value = reading * gain + 7;\n"
                                   "    if (value > 1000 || value < -1000) {\n"
                                   "        value = value > 0 ? 1000 : -1000;\n"
                                   "    }\n"
                                   "    return value - reading % 3;\n"
                                   "}\n";

// Same function, a comment only: no measure moves.
const char* const k_commented_source = "// Scale a raw reading.\n"
                                       "int scale(int reading, int gain) {\n"
                                       "    return reading * gain;\n"
                                       "}\n";

// A work repository `work` whose main is pushed to the bare repository `remote.git`, with the
// remote's HEAD known, as after a clone.
struct PushSetup {
    TempDir dir;
    std::string work = dir.path() + "/work";
    std::string remote = dir.path() + "/remote.git";

    PushSetup() {
        git("init -q --bare -b main " + remote, dir.path());
        init_repo(work);
        dir.write("work/.tollgate.yaml", k_strict_policy);
        dir.write("work/src/scale.c", k_base_source);
        commit_all(work, "base");
        git("remote add origin " + remote, work);
        git("push -q origin main", work);
        git("fetch -q origin", work);
        git("remote set-head origin main", work);
    }

    // Return the commit the remote's `branch` points to, or empty when it has no such branch.
    std::string remote_tip(const std::string& branch) const {
        const auto result =
            run_command("git rev-parse --verify --quiet refs/heads/" + branch, remote);
        return result.exit_code == 0 ? result.out : std::string();
    }
};

} // namespace

TEST_CASE("parse_pushed_refs reads git's pre-push input", "[hook]") {
    // Line format from githooks(5), git 2.39, section "pre-push": "<local ref> SP <local object
    // name> SP <remote ref> SP <remote object name> LF", all zeros for a missing side.
    const std::string head(40, 'a');
    const std::string base(40, 'b');
    SECTION("each line becomes one ref, in order, and blank lines are skipped") {
        const auto refs = tollgate::hook::parse_pushed_refs(
            "refs/heads/topic " + head + " refs/heads/topic " + base + "\n\n" + "(delete) " +
            k_zero + " refs/heads/gone " + base + "\n");
        REQUIRE(refs.size() == 2);
        CHECK(refs[0] ==
              tollgate::hook::PushedRef{"refs/heads/topic", head, "refs/heads/topic", base});
        CHECK(refs[1] == tollgate::hook::PushedRef{"(delete)", k_zero, "refs/heads/gone", base});
        CHECK(tollgate::hook::is_null_sha(refs[1].local_sha));
        CHECK_FALSE(tollgate::hook::is_null_sha(refs[0].local_sha));
    }
    SECTION("empty input yields no ref") {
        CHECK(tollgate::hook::parse_pushed_refs("").empty());
    }
    SECTION("a line without four fields is a usage error naming the line") {
        try {
            tollgate::hook::parse_pushed_refs("refs/heads/topic " + head + "\n");
            FAIL("no error");
        } catch (const tollgate::UsageError& e) {
            CHECK(std::string(e.what()) ==
                  "pre-push input line 1: expected \"LOCAL-REF LOCAL-SHA REMOTE-REF "
                  "REMOTE-SHA\", got \"refs/heads/topic " +
                      head + "\" (is the hook called by git?)");
        }
    }
}

TEST_CASE("tollgate hook run blocks a real git push the policy blocks", "[hook]") {
    PushSetup setup;
    const auto installed = run_tollgate("hook install", setup.work);
    INFO(installed.err);
    REQUIRE(installed.exit_code == 0);
    REQUIRE(tollgate::test::read_text(setup.work + "/.git/hooks/pre-push").find("hook run") !=
            std::string::npos);

    SECTION("a new branch that grows a function's effort past the limit is not pushed") {
        git("checkout -q -b grow", setup.work);
        setup.dir.write("work/src/scale.c", k_grown_source);
        commit_all(setup.work, "grow");
        const auto push = run_command("git push origin grow", setup.work);
        INFO(push.err);
        CHECK(push.exit_code != 0);
        CHECK(push.err.find("effort-growth") != std::string::npos);
        CHECK(push.err.find("BLOCKED") != std::string::npos);
        CHECK(push.err.find("git push --no-verify") != std::string::npos);
        CHECK(setup.remote_tip("grow").empty());

        SECTION("and --no-verify pushes it anyway") {
            CHECK(run_command("git push --no-verify origin grow", setup.work).exit_code == 0);
            CHECK_FALSE(setup.remote_tip("grow").empty());
        }
    }
    SECTION("an update of main that leaves the measures alone is pushed") {
        setup.dir.write("work/src/scale.c", k_commented_source);
        const std::string head = commit_all(setup.work, "comment");
        const auto push = run_command("git push origin main", setup.work);
        INFO(push.err);
        CHECK(push.exit_code == 0);
        CHECK(push.err.find("verdict: pass") != std::string::npos);
        CHECK(setup.remote_tip("main") == head + "\n");
    }
    SECTION("an update from the remote's commit is judged from that commit") {
        setup.dir.write("work/src/scale.c", k_grown_source);
        commit_all(setup.work, "grow on main");
        const std::string pushed_base = setup.remote_tip("main").substr(0, 7);
        const auto push = run_command("git push origin main", setup.work);
        CHECK(push.exit_code != 0);
        CHECK(push.err.find("judging " + pushed_base + "..") != std::string::npos);
    }
    SECTION("deleting a remote branch is not judged") {
        git("push -q --no-verify origin main:old", setup.work);
        const auto push = run_command("git push origin :old", setup.work);
        INFO(push.err);
        CHECK(push.exit_code == 0);
        CHECK(push.err.find("nothing to judge (the ref is deleted)") != std::string::npos);
        CHECK(setup.remote_tip("old").empty());
    }
}

TEST_CASE("tollgate hook install and uninstall keep a hook they did not write", "[hook]") {
    PushSetup setup;
    const std::string hooks = setup.work + "/.git/hooks";
    const std::string foreign = "#!/bin/sh\ncat > \"$(git rev-parse --git-dir)/seen-refs\"\n";
    setup.dir.write("work/.git/hooks/pre-push", foreign);
    std::filesystem::permissions(hooks + "/pre-push", std::filesystem::perms::owner_all);

    SECTION("install refuses to replace it without --chain or --force") {
        const auto result = run_tollgate("hook install", setup.work);
        CHECK(result.exit_code == 2);
        CHECK(result.err == "tollgate: error: a pre-push hook tollgate did not write exists: \"" +
                                hooks +
                                "/pre-push\" (keep it and call it first with --chain, or "
                                "replace it with --force)\n");
        CHECK(read_text(hooks + "/pre-push") == foreign);
    }
    SECTION("uninstall refuses to remove it") {
        CHECK(run_tollgate("hook uninstall", setup.work).exit_code == 2);
        CHECK(read_text(hooks + "/pre-push") == foreign);
    }
    SECTION("--chain calls it first with the same input, and uninstall puts it back") {
        REQUIRE(run_tollgate("hook install --chain", setup.work).exit_code == 0);
        CHECK(read_text(hooks + "/pre-push.tollgate-chained") == foreign);
        setup.dir.write("work/src/scale.c", k_commented_source);
        const std::string head = commit_all(setup.work, "comment");
        const std::string remote_base = setup.remote_tip("main");
        const auto push = run_command("git push origin main", setup.work);
        INFO(push.err);
        CHECK(push.exit_code == 0);
        // The kept hook saw exactly git's line for the push.
        CHECK(read_text(setup.work + "/.git/seen-refs") ==
              "refs/heads/main " + head + " refs/heads/main " + remote_base);
        CHECK(push.err.find("verdict: pass") != std::string::npos);

        const auto removed = run_tollgate("hook uninstall", setup.work);
        CHECK(removed.exit_code == 0);
        CHECK(read_text(hooks + "/pre-push") == foreign);
        CHECK_FALSE(std::filesystem::exists(hooks + "/pre-push.tollgate-chained"));
    }
    SECTION("a chained hook that fails stops the push before tollgate runs") {
        setup.dir.write("work/.git/hooks/pre-push", "#!/bin/sh\nexit 7\n");
        REQUIRE(run_tollgate("hook install --chain", setup.work).exit_code == 0);
        setup.dir.write("work/src/scale.c", k_commented_source);
        commit_all(setup.work, "comment");
        const auto push = run_command("git push origin main", setup.work);
        CHECK(push.exit_code != 0);
        CHECK(push.err.find("judging") == std::string::npos);
    }
    SECTION("--force replaces it and keeps a copy") {
        REQUIRE(run_tollgate("hook install --force", setup.work).exit_code == 0);
        CHECK(read_text(hooks + "/pre-push.tollgate-replaced") == foreign);
        CHECK(read_text(hooks + "/pre-push").find("tollgate-hook") != std::string::npos);
        REQUIRE(run_tollgate("hook uninstall", setup.work).exit_code == 0);
        CHECK_FALSE(std::filesystem::exists(hooks + "/pre-push"));
    }
}

TEST_CASE("tollgate hook install honours core.hooksPath", "[hook]") {
    PushSetup setup;
    git("config core.hooksPath shared-hooks", setup.work);
    REQUIRE(run_tollgate("hook install", setup.work + "/src").exit_code == 0);
    CHECK(std::filesystem::exists(setup.work + "/shared-hooks/pre-push"));
    CHECK_FALSE(std::filesystem::exists(setup.work + "/.git/hooks/pre-push"));
    // git runs the hook from the configured folder: a blocked push proves it.
    git("checkout -q -b grow", setup.work);
    setup.dir.write("work/src/scale.c", k_grown_source);
    commit_all(setup.work, "grow");
    CHECK(run_command("git push origin grow", setup.work).exit_code != 0);
    CHECK(setup.remote_tip("grow").empty());
}

TEST_CASE("tollgate hook run chooses a base for a new branch without a known default branch",
          "[hook]") {
    TempDir dir;
    const std::string work = dir.path() + "/work";
    const std::string remote = dir.path() + "/remote.git";
    git("init -q --bare -b trunk " + remote, dir.path());
    init_repo(work);
    git("remote add origin " + remote, work);
    dir.write("work/.tollgate.yaml", k_strict_policy);
    dir.write("work/src/scale.c", k_base_source);
    const std::string root = commit_all(work, "base");
    REQUIRE(run_tollgate("hook install", work).exit_code == 0);

    SECTION("a first push of a history with no commit on a remote is not judged") {
        const auto push = run_command("git push origin main:trunk", work);
        INFO(push.err);
        CHECK(push.exit_code == 0);
        CHECK(push.err.find("nothing to judge (its history has no commit on a remote to "
                            "compare with)") != std::string::npos);
    }
    SECTION("a new branch is judged from the parent of its first commit on no remote-tracking "
            "ref") {
        // The remote's branch is "trunk": neither origin/HEAD, origin/main nor origin/master.
        git("push -q --no-verify origin main:trunk", work);
        git("fetch -q origin", work);
        git("checkout -q -b topic", work);
        dir.write("work/src/scale.c", k_grown_source);
        const std::string grown = commit_all(work, "grow");
        dir.write("work/README", "notes\n");
        commit_all(work, "notes");
        const auto push = run_command("git push origin topic", work);
        INFO(push.err);
        CHECK(push.exit_code != 0);
        CHECK(push.err.find("judging " + root.substr(0, 7) + "..") != std::string::npos);
        CHECK(push.err.find("(base: parent of " + grown.substr(0, 7) +
                            ", the first commit not on a remote-tracking ref)") !=
              std::string::npos);
    }
}

TEST_CASE("tollgate hook reports misuse with exit 2", "[hook]") {
    TempDir dir;
    SECTION("install outside a repository names the folder") {
        const auto result = run_tollgate("hook install", dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err == "tollgate: error: not a git repository: \"" + dir.path() +
                                "\" (run inside a git work tree, or name one with -C DIR)\n");
    }
    SECTION("run with input that is not git's names the line") {
        init_repo(dir.path());
        // run_command feeds /dev/null to the shell; the pipe inside sh -c feeds the hook.
        const auto result =
            run_command("sh -c " + tollgate::test::shell_quote("echo refs/heads/x | " +
                                                               std::string(TOLLGATE_BINARY) +
                                                               " hook run origin"),
                        dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err == "tollgate: error: pre-push input line 1: expected \"LOCAL-REF "
                            "LOCAL-SHA REMOTE-REF REMOTE-SHA\", got \"refs/heads/x\" (is the "
                            "hook called by git?)\n");
    }
    SECTION("uninstall without a hook changes nothing and says so") {
        init_repo(dir.path());
        const auto result = run_tollgate("hook uninstall", dir.path());
        CHECK(result.exit_code == 0);
        CHECK(result.err == "tollgate: no pre-push hook in \"" + dir.path() +
                                "/.git/hooks\": nothing to remove\n");
    }
}
