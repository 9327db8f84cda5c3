// SPDX-License-Identifier: MIT
// Tests of Repository: opening, revision resolution and reading trees, blobs and the work tree.
#include "gate/common/errors.hpp"
#include "gate/walker/repository.hpp"
#include "walker_support.hpp"

#include <catch2/catch.hpp>
#include <filesystem>

namespace fs = std::filesystem;
using tollgate::SourceFile;
using tollgate::UsageError;
using tollgate::walker::ObjectId;
using tollgate::walker::Repository;
using namespace tollgate::test;

namespace {

std::vector<std::string> paths_of(const std::vector<SourceFile>& files) {
    std::vector<std::string> paths;
    for (const SourceFile& file : files) {
        paths.push_back(file.path);
    }
    return paths;
}

} // namespace

TEST_CASE("Repository::open", "[walker]") {
    TempDir dir;
    const std::string root = dir.path() + "/repo";
    init_repo(root);
    dir.write("repo/src/deep/a.cpp", "int a;\n");
    commit_all(root, "first");

    SECTION("a subfolder opens the repository around it") {
        const Repository repo = Repository::open(root + "/src/deep");
        CHECK_FALSE(repo.is_bare());
        CHECK(fs::equivalent(repo.workdir(), root));
        CHECK(repo.workdir().back() == '/');
    }
    SECTION("a bare clone opens without a working tree") {
        git("clone -q --bare " + shell_quote(root) + " bare.git", dir.path());
        const Repository repo = Repository::open(dir.path() + "/bare.git");
        CHECK(repo.is_bare());
        CHECK(repo.workdir().empty());
        CHECK(repo.resolve_commit("HEAD").hex == rev_parse(root, "HEAD"));
    }
    SECTION("a folder outside any repository is a usage error naming it") {
        TempDir outside;
        CHECK_THROWS_MATCHES(
            Repository::open(outside.path()), UsageError,
            Catch::Message("not a git repository: \"" + outside.path() +
                           "\" (run inside a git work tree, or name one with -C DIR)"));
    }
}

TEST_CASE("Repository::resolve_commit", "[walker]") {
    TempDir dir;
    const std::string root = dir.path();
    init_repo(root);
    dir.write("a.c", "int a;\n");
    const std::string first = commit_all(root, "first");
    git("tag -a v1.0 -m release", root);
    dir.write("a.c", "int a = 1;\n");
    const std::string second = commit_all(root, "second");
    git("branch feature/parser", root);
    const Repository repo = Repository::open(root);

    // git rev-parse is the reference for every id (git's own resolution).
    SECTION("HEAD, HEAD~1, an annotated tag and a short id resolve to git's commits") {
        CHECK(repo.resolve_commit("HEAD").hex == second);
        CHECK(repo.resolve_commit("HEAD~1").hex == first);
        CHECK(repo.resolve_commit("v1.0").hex == rev_parse(root, "v1.0^{commit}"));
        CHECK(repo.resolve_commit("v1.0").hex == first);
        CHECK(repo.resolve_commit(second.substr(0, 7)).hex == second);
        CHECK(repo.resolve_commit("main@{1}").hex == rev_parse(root, "main@{1}"));
    }
    SECTION("an unknown name suggests the closest reference") {
        CHECK_THROWS_MATCHES(
            repo.resolve_commit("feature/parsr"), UsageError,
            Catch::Message("cannot resolve \"feature/parsr\": reference not found (did you mean "
                           "\"feature/parser\"?)"));
    }
    SECTION("the role is named in the message when given") {
        CHECK_THROWS_MATCHES(repo.resolve_commit("maim", "base"), UsageError,
                             Catch::Message("cannot resolve base \"maim\": reference not found "
                                            "(did you mean \"main\"?)"));
    }
    SECTION("a name far from every reference gets no suggestion") {
        CHECK_THROWS_MATCHES(
            repo.resolve_commit("zzzzzzzzzzzz"), UsageError,
            Catch::Message("cannot resolve \"zzzzzzzzzzzz\": reference not found"));
    }
    SECTION("a revision naming a tree is not a commit") {
        CHECK_THROWS_MATCHES(repo.resolve_commit("HEAD^{tree}"), UsageError,
                             Catch::Message("cannot resolve \"HEAD^{tree}\": it names a tree, "
                                            "not a commit"));
    }
}

TEST_CASE("Repository::list_c_family_files", "[walker]") {
    TempDir dir;
    const std::string root = dir.path();
    init_repo(root);
    dir.write("src/a.cpp", "int a() { return 1; }\n");
    dir.write("include/a.h", "int a();\n");
    dir.write("README.md", "# readme\n");
    fs::create_symlink("a.h", fs::path(root) / "include/alias.h");
    const std::string first = commit_all(root, "first");
    dir.write("src/a.cpp", "int a() { return 2; }\n");
    dir.write("src/b.cc", "int b;\n");
    commit_all(root, "second");
    dir.write("src/a.cpp", "uncommitted edit\n"); // the work tree no longer matches any commit
    const Repository repo = Repository::open(root);
    const ObjectId base = repo.resolve_commit(first);

    SECTION("an older commit lists its own C/C++ blobs, without symlinks or other files") {
        const auto files = repo.list_c_family_files(base);
        REQUIRE(files.size() == 2);
        CHECK(files[0].path == "include/a.h");
        CHECK(files[0].blob.hex == rev_parse(root, first + ":include/a.h"));
        CHECK(files[1].path == "src/a.cpp");
        CHECK(files[1].blob.hex == rev_parse(root, first + ":src/a.cpp"));
    }
    SECTION("read_blob and read_file give that commit's bytes, not the work tree's") {
        const auto files = repo.list_c_family_files(base);
        CHECK(repo.read_blob(files[1].blob) == git("show " + first + ":src/a.cpp", root));
        CHECK(repo.read_blob(files[1].blob) == "int a() { return 1; }\n");
        const auto file = repo.read_file(base, "src/a.cpp");
        REQUIRE(file.has_value());
        CHECK(*file == SourceFile{"src/a.cpp", "int a() { return 1; }\n"});
    }
    SECTION("read_file gives nothing for a missing path, a folder or a symlink") {
        CHECK_FALSE(repo.read_file(base, "src/b.cc").has_value());
        CHECK_FALSE(repo.read_file(base, "src").has_value());
        CHECK_FALSE(repo.read_file(base, "include/alias.h").has_value());
    }
    SECTION("read_c_family_files at HEAD reads the committed head, sorted by path") {
        const auto files = repo.read_c_family_files(repo.resolve_commit("HEAD"));
        CHECK(paths_of(files) == std::vector<std::string>{"include/a.h", "src/a.cpp", "src/b.cc"});
        CHECK(files[1].content == "int a() { return 2; }\n");
    }
    SECTION("a bare clone reads the same blobs") {
        TempDir elsewhere;
        const std::string bare_path = elsewhere.path() + "/bare.git";
        git("clone -q --bare . " + shell_quote(bare_path), root);
        const Repository bare = Repository::open(bare_path);
        const auto files = bare.read_c_family_files(bare.resolve_commit(first));
        CHECK(paths_of(files) == std::vector<std::string>{"include/a.h", "src/a.cpp"});
        CHECK(files[1].content == "int a() { return 1; }\n");
        CHECK_THROWS_MATCHES(
            bare.read_worktree_c_family_files(), UsageError,
            Catch::Message("a bare repository has no working tree (pass a revision instead)"));
    }
}

TEST_CASE("Repository::read_worktree_c_family_files", "[walker]") {
    TempDir dir;
    const std::string root = dir.path();
    init_repo(root);
    dir.write(".gitignore", "build/\n*.gen.cpp\n");
    dir.write("src/tracked.cpp", "int tracked;\n");
    dir.write("src/removed.c", "int removed;\n");
    commit_all(root, "first");
    dir.write("src/tracked.cpp", "int tracked = 2;\n");    // unstaged edit
    dir.write("src/untracked.cpp", "int untracked;\n");    // untracked, not ignored
    dir.write("src/new/deeper.h", "int deeper;\n");        // inside an untracked folder
    dir.write("build/out.cpp", "int ignored_folder;\n");   // ignored
    dir.write("src/table.gen.cpp", "int ignored_glob;\n"); // ignored
    dir.write("notes.txt", "not C\n");
    fs::remove(fs::path(root) / "src/removed.c"); // tracked but deleted from disk
    const Repository repo = Repository::open(root);

    const auto files = repo.read_worktree_c_family_files();
    // git's own view of the same files: tracked plus untracked, minus ignored.
    const std::string listed = git("ls-files --cached --others --exclude-standard", root);
    CHECK(listed.find("src/untracked.cpp") != std::string::npos);
    CHECK(listed.find("build/out.cpp") == std::string::npos);
    CHECK(paths_of(files) ==
          std::vector<std::string>{"src/new/deeper.h", "src/tracked.cpp", "src/untracked.cpp"});
    CHECK(files[1].content == "int tracked = 2;\n");
}

TEST_CASE("Repository::reference_names", "[walker]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("a.c", "int a;\n");
    commit_all(dir.path(), "first");
    git("branch topic", dir.path());
    git("tag v2", dir.path());
    const Repository repo = Repository::open(dir.path());
    CHECK(repo.reference_names() == std::vector<std::string>{"main", "topic", "v2"});
}
