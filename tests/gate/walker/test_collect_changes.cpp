// SPDX-License-Identifier: MIT
// Tests of collect_changes, read_side and read_side_tree against git's own diff output.
#include "gate/walker/change_set.hpp"
#include "walker_support.hpp"

#include <algorithm>
#include <catch2/catch.hpp>
#include <cstdio>
#include <filesystem>
#include <map>
#include <sstream>

namespace fs = std::filesystem;
using tollgate::Side;
using tollgate::SourceFile;
using tollgate::walker::ChangedFile;
using tollgate::walker::ChangeOptions;
using tollgate::walker::ChangeSet;
using tollgate::walker::ChangeStatus;
using tollgate::walker::collect_changes;
using tollgate::walker::LineRange;
using tollgate::walker::LineSet;
using tollgate::walker::read_side;
using tollgate::walker::read_side_tree;
using tollgate::walker::RenameDetection;
using tollgate::walker::Repository;
using tollgate::walker::resolve_range;
using tollgate::walker::RevisionRange;
using tollgate::walker::SkippedFile;
using tollgate::walker::SkipReason;
using namespace tollgate::test;

namespace {

// One file of git's own `git diff -U0` output.
struct GitFileDiff {
    std::string base_path; // empty for a new file
    std::string head_path; // empty for a deleted file
    ChangeStatus status = ChangeStatus::modified;
    bool binary = false;
    unsigned similarity = 0; // "similarity index N%" of a rename
    LineSet base_lines;      // from the "-a,b" half of each hunk header
    LineSet head_lines;      // from the "+c,d" half
};

// Parse "a[,b]" of a hunk header into the inclusive range it covers (empty when b is 0).
void add_hunk_side(const std::string& text, LineSet& lines) {
    const auto comma = text.find(',');
    const unsigned start = static_cast<unsigned>(std::stoul(text.substr(0, comma)));
    const unsigned count =
        comma == std::string::npos ? 1U : static_cast<unsigned>(std::stoul(text.substr(comma + 1)));
    if (count > 0) {
        lines.add(start, start + count - 1);
    }
}

// Run git's own diff (the outside reference) and parse its file headers and hunk headers. The
// diff options are spelt out so that a user's git configuration cannot change the reference.
std::map<std::string, GitFileDiff> git_reference_diff(const std::string& dir,
                                                      const std::string& revisions) {
    const std::string out =
        git("-c core.quotePath=false diff -U0 --no-color --no-ext-diff --diff-algorithm=myers "
            "--indent-heuristic --src-prefix=a/ --dst-prefix=b/ -M " +
                revisions,
            dir);
    std::map<std::string, GitFileDiff> files;
    std::istringstream lines(out);
    std::string line;
    GitFileDiff* current = nullptr;
    auto key_of = [](const GitFileDiff& file) {
        return file.head_path.empty() ? file.base_path : file.head_path;
    };
    std::vector<GitFileDiff> parsed;
    while (std::getline(lines, line)) {
        if (line.rfind("diff --git a/", 0) == 0) {
            const auto split = line.find(" b/");
            parsed.emplace_back();
            current = &parsed.back();
            current->base_path = line.substr(13, split - 13);
            current->head_path = line.substr(split + 3);
        } else if (current == nullptr) {
            continue;
        } else if (line.rfind("new file mode", 0) == 0) {
            current->base_path.clear();
            current->status = ChangeStatus::added;
        } else if (line.rfind("deleted file mode", 0) == 0) {
            current->head_path.clear();
            current->status = ChangeStatus::deleted;
        } else if (line.rfind("similarity index ", 0) == 0) {
            current->similarity = static_cast<unsigned>(std::stoul(line.substr(17)));
        } else if (line.rfind("rename from ", 0) == 0) {
            current->status = ChangeStatus::renamed;
        } else if (line.rfind("Binary files ", 0) == 0) {
            current->binary = true;
        } else if (line.rfind("@@ -", 0) == 0) {
            const auto plus = line.find(" +", 4);
            const auto end = line.find(" @@", plus);
            add_hunk_side(line.substr(4, plus - 4), current->base_lines);
            add_hunk_side(line.substr(plus + 2, end - plus - 2), current->head_lines);
        }
    }
    for (const GitFileDiff& file : parsed) {
        files[key_of(file)] = file;
    }
    return files;
}

std::string key_of(const ChangedFile& file) {
    return file.head_path.empty() ? file.base_path : file.head_path;
}

// Check every changed C/C++ file of `changes` against git's diff of the same two commits, and that
// git reports no C/C++ text file that `changes` misses.
void check_against_git(const ChangeSet& changes, const std::string& dir,
                       const std::string& revisions) {
    const auto reference = git_reference_diff(dir, revisions);
    std::size_t text_c_files = 0;
    for (const auto& item : reference) {
        if (!item.second.binary && tollgate::is_c_family_path(item.first)) {
            ++text_c_files;
        }
    }
    CHECK(changes.files.size() == text_c_files);
    for (const ChangedFile& file : changes.files) {
        INFO("file " << key_of(file) << " in " << revisions);
        const auto found = reference.find(key_of(file));
        REQUIRE(found != reference.end());
        CHECK(file.base_path == found->second.base_path);
        CHECK(file.head_path == found->second.head_path);
        CHECK(file.status == found->second.status);
        CHECK(file.similarity == found->second.similarity);
        CHECK(file.base_lines.ranges() == found->second.base_lines.ranges());
        CHECK(file.head_lines.ranges() == found->second.head_lines.ranges());
    }
}

std::string functions_text(const std::vector<std::string>& names) {
    std::string text;
    for (const std::string& name : names) {
        text += "void " + name + "() {\n    " + name + "_step();\n}\n\n";
    }
    return text;
}

std::vector<std::string> paths_of(const std::vector<SourceFile>& files) {
    std::vector<std::string> paths;
    for (const SourceFile& file : files) {
        paths.push_back(file.path);
    }
    return paths;
}

ChangeSet changes_between(const Repository& repo, const std::string& base, const std::string& head,
                          const ChangeOptions& options = {}) {
    RevisionRange range;
    range.base = base;
    range.head = head;
    return collect_changes(repo, resolve_range(repo, range), options);
}

} // namespace

TEST_CASE("collect_changes", "[walker]") {
    TempDir dir;
    const std::string root = dir.path();
    init_repo(root);
    dir.write("src/keep.cpp", numbered_lines(12));
    dir.write("src/gone.c", numbered_lines(3));
    dir.write("src/old_name.cpp", numbered_lines(20));
    dir.write("src/script.c", numbered_lines(4));
    dir.write("src/kind.h", "int kind;\n");
    dir.write("docs/readme.md", "# readme\n");
    dir.write("assets/blob.h", std::string("binary\0data\n", 12));
    const std::string base = commit_all(root, "base");

    dir.write("src/keep.cpp", numbered_lines(4) + "int inserted;\n" + numbered_lines(8, 5));
    fs::remove(fs::path(root) / "src/gone.c");
    fs::remove(fs::path(root) / "src/old_name.cpp");
    dir.write("src/new_name.cpp", numbered_lines(18) + "int appended;\n");
    fs::rename(fs::path(root) / "src/script.c", fs::path(root) / "src/script.txt");
    fs::remove(fs::path(root) / "src/kind.h");
    fs::create_symlink("keep.cpp", fs::path(root) / "src/kind.h");
    dir.write("src/added.hpp", "int added;\nint also_added;\n");
    dir.write("docs/readme.md", "# readme, longer\n");
    dir.write("assets/blob.h", std::string("binary\0data, changed\n", 21));
    fs::create_directories(fs::path(root) / "include");
    fs::create_symlink("../src/added.hpp", fs::path(root) / "include/link.h");
    init_repo(root + "/sub"); // an embedded repository becomes a gitlink
    dir.write("sub/lib.c", "int lib;\n");
    commit_all(root + "/sub", "lib");
    const std::string head = commit_all(root, "head");
    const Repository repo = Repository::open(root);
    const ChangeSet changes = changes_between(repo, base, head);

    SECTION("C/C++ files are listed by path with their status, paths and blobs") {
        REQUIRE(changes.files.size() == 5);
        const ChangedFile& added = changes.files[0];
        CHECK(added.status == ChangeStatus::added);
        CHECK(added.base_path.empty());
        CHECK(added.head_path == "src/added.hpp");
        CHECK(added.base_blob.hex.empty());
        CHECK(added.head_blob.hex == rev_parse(root, head + ":src/added.hpp"));
        CHECK(added.head_lines.ranges() == std::vector<LineRange>{{1, 2}});

        const ChangedFile& gone = changes.files[1];
        CHECK(gone.status == ChangeStatus::deleted);
        CHECK(gone.base_path == "src/gone.c");
        CHECK(gone.head_path.empty());
        CHECK(gone.base_blob.hex == rev_parse(root, base + ":src/gone.c"));
        CHECK(gone.head_blob.hex.empty());
        CHECK(gone.base_lines.ranges() == std::vector<LineRange>{{1, 3}});

        const ChangedFile& kept = changes.files[2];
        CHECK(kept.status == ChangeStatus::modified);
        CHECK(kept.head_path == "src/keep.cpp");
        CHECK(kept.base_lines.empty()); // a pure insertion deletes no base line
        CHECK(kept.head_lines.ranges() == std::vector<LineRange>{{5, 5}});

        const ChangedFile& moved = changes.files[3];
        CHECK(moved.status == ChangeStatus::renamed);
        CHECK(moved.base_path == "src/old_name.cpp");
        CHECK(moved.head_path == "src/new_name.cpp");
        CHECK(moved.similarity > 50);
        CHECK(moved.similarity < 100);
        CHECK(moved.base_lines.ranges() == std::vector<LineRange>{{19, 20}});
        CHECK(moved.head_lines.ranges() == std::vector<LineRange>{{19, 19}});

        // git sees a rename to script.txt; for measuring, the C file is gone, every line of it.
        const ChangedFile& script = changes.files[4];
        CHECK(script.status == ChangeStatus::deleted);
        CHECK(script.base_path == "src/script.c");
        CHECK(script.head_path.empty());
        CHECK(script.base_lines.ranges() == std::vector<LineRange>{{1, 4}});
    }
    SECTION("binary, symlink, submodule, type change and other-language files are skipped") {
        const std::vector<SkippedFile> expected = {
            {"assets/blob.h", "assets/blob.h", SkipReason::binary},
            {"docs/readme.md", "docs/readme.md", SkipReason::not_c_family},
            {"", "include/link.h", SkipReason::symlink},
            {"src/kind.h", "src/kind.h", SkipReason::type_change},
            {"", "sub", SkipReason::submodule},
        };
        CHECK(changes.skipped == expected);
        CHECK(changes.notes.empty());
    }
    SECTION("the text C/C++ files agree with git's own diff, except the cross-language rename") {
        const auto reference = git_reference_diff(root, base + " " + head);
        for (const ChangedFile& file : changes.files) {
            if (key_of(file) == "src/script.c") {
                continue;
            }
            INFO("file " << key_of(file));
            const auto found = reference.find(key_of(file));
            REQUIRE(found != reference.end());
            CHECK(file.base_lines.ranges() == found->second.base_lines.ranges());
            CHECK(file.head_lines.ranges() == found->second.head_lines.ranges());
        }
        CHECK(reference.at("assets/blob.h").binary);
    }
    SECTION("read_side gives each side's bytes from the object database") {
        const ChangedFile& moved = changes.files[3];
        fs::remove(fs::path(root) / "src/new_name.cpp"); // not read from the work tree
        const auto base_side = read_side(repo, changes, moved, Side::base);
        const auto head_side = read_side(repo, changes, moved, Side::head);
        REQUIRE(base_side.has_value());
        REQUIRE(head_side.has_value());
        CHECK(*base_side == SourceFile{"src/old_name.cpp", numbered_lines(20)});
        CHECK(*head_side == SourceFile{"src/new_name.cpp", numbered_lines(18) + "int appended;\n"});
        CHECK_FALSE(read_side(repo, changes, changes.files[0], Side::base).has_value());
        CHECK_FALSE(read_side(repo, changes, changes.files[1], Side::head).has_value());
    }
    SECTION("read_side_tree gives every C/C++ file of a side, sorted by path") {
        CHECK(paths_of(read_side_tree(repo, changes, Side::base)) ==
              std::vector<std::string>{"assets/blob.h", "src/gone.c", "src/keep.cpp", "src/kind.h",
                                       "src/old_name.cpp", "src/script.c"});
        CHECK(paths_of(read_side_tree(repo, changes, Side::head)) ==
              std::vector<std::string>{"assets/blob.h", "src/added.hpp", "src/keep.cpp",
                                       "src/new_name.cpp"});
    }
}

TEST_CASE("collect_changes matches git diff over a scripted history", "[walker]") {
    TempDir dir;
    const std::string root = dir.path();
    init_repo(root);
    std::vector<std::string> commits;

    // c0: the starting files.
    dir.write("src/engine.cpp", numbered_lines(30));
    dir.write("src/util.h", numbered_lines(10));
    dir.write("src/legacy.c", numbered_lines(15));
    dir.write("src/mover.cpp", numbered_lines(40));
    dir.write("src/slide.c", functions_text({"a", "c"}));
    dir.write("src/spaces.c", "int one;\nint two;\nint a;\n\nint b;\nint three;\n");
    commits.push_back(commit_all(root, "c0"));

    // c1: insertion at the top, a deleted block, a replaced line, an append, a deletion, an add.
    dir.write("src/engine.cpp", "// header\n// second\n" + numbered_lines(9) +
                                    numbered_lines(7, 13) + "int replaced = 0;\n" +
                                    numbered_lines(10, 21));
    dir.write("src/util.h", numbered_lines(10) + "int tail1;\nint tail2;\n");
    fs::remove(fs::path(root) / "src/legacy.c");
    dir.write("src/fresh.cc", numbered_lines(6));
    // A repeated block whose hunk can slide: git's indent heuristic places it (checked: git's
    // output differs with --no-indent-heuristic).
    dir.write("src/spaces.c",
              "int one;\nint two;\nint a;\n\nint b;\nint a;\n\nint b;\nint three;\n");
    commits.push_back(commit_all(root, "c1"));

    // c2: a rename with edits, a function inserted where hunks can slide, a lost final newline.
    fs::remove(fs::path(root) / "src/mover.cpp");
    dir.write("src/moved/mover2.cpp", numbered_lines(5) + "int edit_a;\n" + numbered_lines(24, 7) +
                                          "int edit_b;\n" + numbered_lines(9, 32));
    dir.write("src/slide.c", functions_text({"a", "b", "c"}));
    dir.write("src/util.h", numbered_lines(10) + "int tail1;\nint tail2_changed;");
    commits.push_back(commit_all(root, "c2"));

    // c3: a pure rename, whitespace-only edits, a CRLF line, blank lines, a middle deletion.
    fs::rename(fs::path(root) / "src/util.h", fs::path(root) / "src/util.hpp");
    std::string engine = tollgate::test::read_text(root + "/src/engine.cpp");
    engine.replace(engine.find("int v3 = 3;"), 11, "  int v3 = 3;");
    engine.replace(engine.find("int v5 = 5;\n"), 12, "int v5 = 5;\r\n");
    engine += "\n\n\nint last;\n";
    dir.write("src/engine.cpp", engine);
    dir.write("src/slide.c", functions_text({"a", "c"}));
    dir.write("src/fresh.cc", numbered_lines(2) + numbered_lines(2, 5));
    commits.push_back(commit_all(root, "c3"));

    const Repository repo = Repository::open(root);
    SECTION("each consecutive pair of commits") {
        for (std::size_t i = 1; i < commits.size(); ++i) {
            const ChangeSet changes = changes_between(repo, commits[i - 1], commits[i]);
            CHECK_FALSE(changes.files.empty());
            check_against_git(changes, root, commits[i - 1] + " " + commits[i]);
        }
    }
    SECTION("the whole history at once") {
        check_against_git(changes_between(repo, commits.front(), commits.back()), root,
                          commits.front() + " " + commits.back());
    }
    SECTION("a pure rename is listed with no changed lines") {
        const ChangeSet changes = changes_between(repo, commits[2], commits[3]);
        const auto found =
            std::find_if(changes.files.begin(), changes.files.end(),
                         [](const ChangedFile& f) { return f.head_path == "src/util.hpp"; });
        REQUIRE(found != changes.files.end());
        CHECK(found->status == ChangeStatus::renamed);
        CHECK(found->similarity == 100);
        CHECK(found->base_lines.empty());
        CHECK(found->head_lines.empty());
    }
}

TEST_CASE("collect_changes bounds rename detection", "[walker]") {
    TempDir dir;
    const std::string root = dir.path();
    init_repo(root);
    dir.write("a.cpp", numbered_lines(20));
    dir.write("b.cpp", numbered_lines(3));
    dir.write("c.cpp", numbered_lines(3));
    const std::string base = commit_all(root, "base");
    fs::remove(fs::path(root) / "a.cpp");
    dir.write("moved/a.cpp", numbered_lines(19) + "int edited;\n");
    dir.write("b.cpp", numbered_lines(4));
    dir.write("c.cpp", numbered_lines(4));
    const std::string head = commit_all(root, "head");
    const Repository repo = Repository::open(root);

    SECTION("under the limit a moved file is a rename") {
        const ChangeSet changes = changes_between(repo, base, head);
        REQUIRE(changes.files.size() == 3);
        CHECK(changes.files[2].status == ChangeStatus::renamed);
        CHECK(changes.notes.empty());
    }
    SECTION("above the file limit detection is skipped and the note says so") {
        ChangeOptions options;
        options.rename_file_limit = 3;
        const ChangeSet changes = changes_between(repo, base, head, options);
        REQUIRE(changes.files.size() == 4);
        CHECK(changes.files[0].status == ChangeStatus::deleted);
        CHECK(changes.files[0].base_path == "a.cpp");
        CHECK(changes.files[3].status == ChangeStatus::added);
        CHECK(changes.files[3].head_path == "moved/a.cpp");
        CHECK(changes.notes == std::vector<std::string>{
                                   "rename detection skipped: 4 changed files exceed the limit of "
                                   "3 (moved files show as deleted and added)"});
    }
    SECTION("turned off, a moved file is deleted and added without a note") {
        ChangeOptions options;
        options.renames = RenameDetection::off;
        const ChangeSet changes = changes_between(repo, base, head, options);
        REQUIRE(changes.files.size() == 4);
        CHECK(changes.files[0].status == ChangeStatus::deleted);
        CHECK(changes.notes.empty());
    }
}

TEST_CASE("collect_changes in the working tree", "[walker]") {
    TempDir dir;
    const std::string root = dir.path();
    init_repo(root);
    dir.write(".gitignore", "*.tmp.cpp\n");
    dir.write("src/a.cpp", numbered_lines(10));
    dir.write("src/b.cpp", numbered_lines(10));
    dir.write("src/gone.cpp", numbered_lines(2));
    const std::string base = commit_all(root, "base");

    std::string a = numbered_lines(10);
    a.replace(a.find("int v2 = 2;"), 11, "int v2 = 20;");
    dir.write("src/a.cpp", a);
    git("add src/a.cpp", root); // staged edit
    a.replace(a.find("int v8 = 8;"), 11, "int v8 = 80;");
    dir.write("src/a.cpp", a); // and an unstaged one on top
    std::string b = numbered_lines(10);
    b.replace(b.find("int v5 = 5;"), 11, "int v5 = 50;");
    dir.write("src/b.cpp", b);                             // unstaged only
    dir.write("src/c.cpp", "int c1;\nint c2;\nint c3;\n"); // untracked
    dir.write("src/scratch.tmp.cpp", numbered_lines(3));   // ignored
    fs::remove(fs::path(root) / "src/gone.cpp");           // deleted, not staged

    const Repository repo = Repository::open(root);
    RevisionRange worktree;
    worktree.worktree = true;
    const ChangeSet changes = collect_changes(repo, resolve_range(repo, worktree));

    SECTION("staged, unstaged and untracked changes are collected against HEAD") {
        REQUIRE(changes.files.size() == 4);
        CHECK(changes.files[0].head_path == "src/a.cpp");
        CHECK(changes.files[1].head_path == "src/b.cpp");
        CHECK(changes.files[2].head_path == "src/c.cpp");
        CHECK(changes.files[2].status == ChangeStatus::added);
        CHECK(changes.files[2].head_lines.ranges() == std::vector<LineRange>{{1, 3}});
        CHECK(changes.files[3].base_path == "src/gone.cpp");
        CHECK(changes.files[3].status == ChangeStatus::deleted);
        for (const ChangedFile& file : changes.files) {
            CHECK(file.head_blob.hex.empty());
        }
        CHECK(changes.skipped.empty());
    }
    SECTION("tracked files agree with git diff HEAD (index and work tree together)") {
        const auto reference = git_reference_diff(root, "HEAD");
        for (std::size_t i : {0, 1, 3}) {
            const ChangedFile& file = changes.files[i];
            INFO("file " << key_of(file));
            const auto& expected = reference.at(key_of(file));
            CHECK(file.status == expected.status);
            CHECK(file.base_lines.ranges() == expected.base_lines.ranges());
            CHECK(file.head_lines.ranges() == expected.head_lines.ranges());
        }
        CHECK(changes.files[0].head_lines.ranges() == std::vector<LineRange>{{2, 2}, {8, 8}});
    }
    SECTION("the head side is read from disk") {
        const auto head_side = read_side(repo, changes, changes.files[0], Side::head);
        REQUIRE(head_side.has_value());
        CHECK(head_side->content == a);
        const auto base_side = read_side(repo, changes, changes.files[0], Side::base);
        REQUIRE(base_side.has_value());
        CHECK(base_side->content == numbered_lines(10));
        CHECK(paths_of(read_side_tree(repo, changes, Side::head)) ==
              std::vector<std::string>{"src/a.cpp", "src/b.cpp", "src/c.cpp"});
    }
}

TEST_CASE("collect_changes from a feature branch with the default base", "[walker]") {
    TempDir dir;
    const std::string root = dir.path();
    init_repo(root);
    dir.write("shared.cpp", numbered_lines(5));
    commit_all(root, "base");
    git("checkout -q -b feature", root);
    dir.write("feature.cpp", numbered_lines(2));
    commit_all(root, "feature work");
    git("checkout -q main", root);
    dir.write("shared.cpp", numbered_lines(6));
    commit_all(root, "main moves on");
    git("checkout -q feature", root);

    const Repository repo = Repository::open(root);
    const ChangeSet changes = collect_changes(repo, resolve_range(repo, RevisionRange{}));
    // Only the feature's own change: main's later edit of shared.cpp is not part of it.
    REQUIRE(changes.files.size() == 1);
    CHECK(changes.files[0].head_path == "feature.cpp");
    check_against_git(changes, root, "main...HEAD");
}

TEST_CASE("collect_changes leaves files over the size limit unread", "[walker]") {
    TempDir dir;
    const std::string root = dir.path();
    init_repo(root);
    dir.write("small.c", numbered_lines(3));
    dir.write("grows.c", numbered_lines(3));
    dir.write("data/old.bin", std::string(600, 'a'));
    dir.write("gen/old_table.c", numbered_lines(45));
    const std::string base = commit_all(root, "base");
    dir.write("small.c", numbered_lines(4));
    dir.write("grows.c", numbered_lines(40)); // 3 lines (45 bytes) to 40 (about 600 bytes)
    fs::remove(fs::path(root) / "data/old.bin");
    dir.write("data/new.bin", std::string(600, 'a') + "b");
    fs::remove(fs::path(root) / "gen/old_table.c");
    dir.write("gen/new_table.c", numbered_lines(45) + "int more;\n");
    const std::string head = commit_all(root, "head");
    const Repository repo = Repository::open(root);
    ChangeOptions options;
    options.max_file_size = 500;
    const ChangeSet changes = changes_between(repo, base, head, options);

    SECTION("a changed C/C++ file with a side over the limit is skipped with its size") {
        REQUIRE(changes.files.size() == 1);
        CHECK(changes.files[0].head_path == "small.c");
        const std::vector<SkippedFile> expected = {
            {"data/old.bin", "", SkipReason::not_c_family, 0},
            {"", "data/new.bin", SkipReason::not_c_family, 0},
            {"gen/old_table.c", "", SkipReason::too_large, numbered_lines(45).size()},
            {"", "gen/new_table.c", SkipReason::too_large, numbered_lines(45).size() + 10},
            {"grows.c", "grows.c", SkipReason::too_large, numbered_lines(40).size()},
        };
        std::vector<SkippedFile> sorted = changes.skipped;
        std::sort(sorted.begin(), sorted.end(), [](const SkippedFile& a, const SkippedFile& b) {
            return (a.head_path.empty() ? a.base_path : a.head_path) <
                   (b.head_path.empty() ? b.base_path : b.head_path);
        });
        std::vector<SkippedFile> want = expected;
        std::sort(want.begin(), want.end(), [](const SkippedFile& a, const SkippedFile& b) {
            return (a.head_path.empty() ? a.base_path : a.head_path) <
                   (b.head_path.empty() ? b.base_path : b.head_path);
        });
        CHECK(sorted == want);
    }
    SECTION("oversized files are kept out of rename detection, which would read them whole") {
        // Under no limit the same history pairs both moves as renames (git agrees).
        ChangeOptions unbounded;
        unbounded.max_file_size = 0;
        const ChangeSet all = changes_between(repo, base, head, unbounded);
        const auto reference = git_reference_diff(root, base + " " + head);
        CHECK(reference.at("gen/new_table.c").status == ChangeStatus::renamed);
        bool renamed = false;
        for (const auto& file : all.files) {
            renamed = renamed ||
                      (file.status == ChangeStatus::renamed && file.head_path == "gen/new_table.c");
        }
        CHECK(renamed);
        for (const auto& file : changes.files) {
            CHECK(file.status != ChangeStatus::renamed);
        }
    }
    SECTION("read_side_tree lists what it leaves unread") {
        std::vector<tollgate::OversizedFile> oversized;
        const auto files = read_side_tree(repo, changes, Side::head, &oversized);
        CHECK(paths_of(files) == std::vector<std::string>{"small.c"});
        CHECK(oversized == std::vector<tollgate::OversizedFile>{
                               {"gen/new_table.c", numbered_lines(45).size() + 10},
                               {"grows.c", numbered_lines(40).size()}});
    }
}
