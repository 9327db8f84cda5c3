// SPDX-License-Identifier: MIT
// Tests of resolve_range: default bases, merge bases, the working tree and shallow clones.
#include "gate/common/errors.hpp"
#include "gate/walker/change_set.hpp"
#include "gate/walker/revision_range.hpp"
#include "walker_support.hpp"

#include <catch2/catch.hpp>

using tollgate::UsageError;
using tollgate::walker::BaseSource;
using tollgate::walker::HeadSource;
using tollgate::walker::Repository;
using tollgate::walker::resolve_range;
using tollgate::walker::ResolvedRange;
using tollgate::walker::RevisionRange;
using namespace tollgate::test;

namespace {

// main: m1 m2 ... m4, feature: branched at m2 with f1 f2 f3; main checked out at the end.
struct ForkedHistory {
    std::string m1, m2, m4, f3;
};

ForkedHistory make_forked_history(const TempDir& dir, const std::string& relative) {
    const std::string root = dir.path() + "/" + relative;
    init_repo(root);
    ForkedHistory ids;
    dir.write(relative + "/src/core.c", "int m1;\n");
    ids.m1 = commit_all(root, "m1");
    dir.write(relative + "/src/core.c", "int m1;\nint m2;\n");
    ids.m2 = commit_all(root, "m2");
    git("checkout -q -b feature", root);
    for (int i = 1; i <= 3; ++i) {
        dir.write(relative + "/src/feature.cpp", numbered_lines(i));
        ids.f3 = commit_all(root, "f" + std::to_string(i));
    }
    git("checkout -q main", root);
    dir.write(relative + "/src/core.c", "int m1;\nint m2;\nint m3;\n");
    commit_all(root, "m3");
    dir.write(relative + "/src/other.h", "int m4;\n");
    ids.m4 = commit_all(root, "m4");
    return ids;
}

} // namespace

TEST_CASE("resolve_range", "[walker]") {
    TempDir dir;
    const ForkedHistory ids = make_forked_history(dir, "origin");
    const std::string root = dir.path() + "/origin";

    SECTION("from a feature branch the default base is the merge base with main") {
        git("checkout -q feature", root);
        const Repository repo = Repository::open(root);
        const ResolvedRange range = resolve_range(repo, RevisionRange{});
        // git merge-base is the reference for the base.
        CHECK(range.base.hex == trimmed(git("merge-base HEAD main", root)));
        CHECK(range.base.hex == ids.m2);
        CHECK(range.head.hex == ids.f3);
        CHECK(range.base_name == "main");
        CHECK(range.head_name == "HEAD");
        CHECK(range.base_source == BaseSource::merge_base);
        CHECK(range.head_source == HeadSource::commit);
        CHECK(range.note == "base is " + ids.m2.substr(0, 7) +
                                ", the merge base of \"HEAD\" and the default branch \"main\" "
                                "(found by name)");
    }
    SECTION("in a clone the default branch comes from origin/HEAD") {
        git("clone -q " + shell_quote(root) + " clone", dir.path());
        const std::string clone = dir.path() + "/clone";
        git("checkout -q -b topic origin/feature", clone);
        const Repository repo = Repository::open(clone);
        const ResolvedRange range = resolve_range(repo, RevisionRange{});
        CHECK(range.base_name == "origin/main");
        CHECK(range.base.hex == trimmed(git("merge-base HEAD origin/main", clone)));
        CHECK(range.note == "base is " + ids.m2.substr(0, 7) +
                                ", the merge base of \"HEAD\" and the default branch "
                                "\"origin/main\" (taken from refs/remotes/origin/HEAD)");

        SECTION("an unknown base suggests the closest reference") {
            RevisionRange given;
            given.base = "origin/mian";
            CHECK_THROWS_MATCHES(resolve_range(repo, given), UsageError,
                                 Catch::Message("cannot resolve base \"origin/mian\": reference "
                                                "not found (did you mean \"origin/main\"?)"));
        }
    }
    SECTION("a given base and head are used as they are, without a note") {
        const Repository repo = Repository::open(root);
        RevisionRange given;
        given.base = "HEAD~2";
        given.head = "feature";
        const ResolvedRange range = resolve_range(repo, given);
        CHECK(range.base.hex == rev_parse(root, "HEAD~2"));
        CHECK(range.head.hex == ids.f3);
        CHECK(range.base_name == "HEAD~2");
        CHECK(range.head_name == "feature");
        CHECK(range.base_source == BaseSource::given);
        CHECK(range.note.empty());
    }
    SECTION("a misspelt default branch suggests the closest reference") {
        const Repository repo = Repository::open(root);
        RevisionRange given;
        given.default_branch = "mian";
        CHECK_THROWS_MATCHES(resolve_range(repo, given), UsageError,
                             Catch::Message("cannot resolve default branch \"mian\": reference "
                                            "not found (did you mean \"main\"?)"));
    }
    SECTION("the working tree is compared with HEAD by default") {
        const Repository repo = Repository::open(root);
        RevisionRange worktree;
        worktree.worktree = true;
        const ResolvedRange range = resolve_range(repo, worktree);
        CHECK(range.base.hex == ids.m4);
        CHECK(range.head.hex.empty());
        CHECK(range.head_source == HeadSource::worktree);
        CHECK(range.head_name == "working tree");
        CHECK(range.base_name == "HEAD");

        worktree.head = "feature";
        CHECK_THROWS_MATCHES(resolve_range(repo, worktree), UsageError,
                             Catch::Message("head \"feature\" cannot be combined with the working "
                                            "tree (drop --head or --worktree)"));
    }
    SECTION("unrelated histories have no merge base") {
        git("checkout -q --orphan island", root);
        dir.write("origin/island.c", "int island;\n");
        commit_all(root, "island");
        const Repository repo = Repository::open(root);
        CHECK_THROWS_MATCHES(resolve_range(repo, RevisionRange{}), UsageError,
                             Catch::Message("head \"HEAD\" and the default branch \"main\" have "
                                            "no common ancestor (pass --base)"));
    }
    SECTION("a repository without a default branch asks for a base") {
        git("branch -m main trunk", root);
        const Repository repo = Repository::open(root);
        CHECK_THROWS_MATCHES(
            resolve_range(repo, RevisionRange{}), UsageError,
            Catch::Message("no default branch found: none of \"origin/HEAD\", \"main\", "
                           "\"master\", \"origin/main\", \"origin/master\" exists (pass --base, "
                           "or fetch the default branch)"));
    }
    SECTION("a bare repository has no working tree to compare") {
        git("clone -q --bare " + shell_quote(root) + " bare.git", dir.path());
        const Repository repo = Repository::open(dir.path() + "/bare.git");
        RevisionRange worktree;
        worktree.worktree = true;
        CHECK_THROWS_MATCHES(
            resolve_range(repo, worktree), UsageError,
            Catch::Message("a bare repository has no working tree to compare (drop --worktree)"));
    }
}

TEST_CASE("resolve_range in shallow clones", "[walker]") {
    TempDir dir;
    const ForkedHistory ids = make_forked_history(dir, "origin");
    const std::string url = "file://" + dir.path() + "/origin"; // file:// so --depth applies
    const std::string remedy = " is not in this clone (it is shallow: fetch with depth 0, or run "
                               "\"git fetch --deepen=N\" / \"git fetch --unshallow\")";

    SECTION("depth 1: a base cut off by the clone gets the fetch remedy") {
        git("clone -q --depth 1 " + shell_quote(url) + " shallow", dir.path());
        const std::string clone = dir.path() + "/shallow";
        REQUIRE(trimmed(git("rev-parse --is-shallow-repository", clone)) == "true");
        const Repository repo = Repository::open(clone);

        RevisionRange by_id;
        by_id.base = ids.m1;
        CHECK_THROWS_MATCHES(resolve_range(repo, by_id), UsageError,
                             Catch::Message("base commit " + ids.m1.substr(0, 7) + remedy));
        RevisionRange by_ancestry;
        by_ancestry.base = "HEAD~1";
        CHECK_THROWS_MATCHES(resolve_range(repo, by_ancestry), UsageError,
                             Catch::Message("base commit \"HEAD~1\"" + remedy));
    }
    SECTION("depth 1: an unknown name keeps its own message") {
        git("clone -q --depth 1 " + shell_quote(url) + " shallow", dir.path());
        const Repository repo = Repository::open(dir.path() + "/shallow");
        RevisionRange misspelt;
        misspelt.base = "origin/mian";
        CHECK_THROWS_MATCHES(resolve_range(repo, misspelt), UsageError,
                             Catch::Message("cannot resolve base \"origin/mian\": reference not "
                                            "found (did you mean \"origin/main\"?)"));
    }
    SECTION("depth 2: both tips present but no merge base, so they are compared directly") {
        git("clone -q --depth 2 --no-single-branch " + shell_quote(url) + " shallow", dir.path());
        const std::string clone = dir.path() + "/shallow";
        git("checkout -q -b topic origin/feature", clone);
        // git itself finds no merge base here either: the history between is cut off.
        CHECK(run_command("git merge-base HEAD origin/main", clone).exit_code != 0);
        const Repository repo = Repository::open(clone);
        const ResolvedRange range = resolve_range(repo, RevisionRange{});
        CHECK(range.base.hex == ids.m4);
        CHECK(range.head.hex == ids.f3);
        CHECK(range.base_source == BaseSource::default_branch);
        CHECK(range.base_name == "origin/main");
        CHECK(range.note == "merge base unavailable in this shallow clone: compared base and head "
                            "directly (base is the tip of the default branch \"origin/main\")");

        // The two-dot comparison works on the present commits; git's own diff is the reference.
        const auto changes = tollgate::walker::collect_changes(repo, range);
        std::string paths;
        for (const auto& file : changes.files) {
            paths += file.head_path.empty() ? file.base_path : file.head_path;
            paths += "\n";
        }
        CHECK(paths == git("diff --name-only --no-renames " + ids.m4 + " " + ids.f3, clone));
    }
}
