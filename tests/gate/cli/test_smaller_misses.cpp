// SPDX-License-Identifier: MIT
// Smaller misses: includes that climb folders, paths under a git folder, explain's hint, missing
// third-party headers summarised once, --include-dir, and snapshots of the previous convention.
#include "gate/baseline/snapshot_file.hpp"
#include "gate/java/java_front_end.hpp"
#include "support/temp_repo.hpp"
#include "tollgate/core/convention.hpp"

#include <catch2/catch.hpp>

using tollgate::test::commit_all;
using tollgate::test::git;
using tollgate::test::init_repo;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

// A library whose contributed header includes its parent folder's header.
void write_library(const TempDir& dir) {
    dir.write("include/lib/x.h", "#pragma once\n"
                                 "struct Pair { int a; int b; };\n"
                                 "typedef int xint;\n");
    dir.write("include/lib/contrib/y.h", "#include \"../x.h\"\n"
                                         "inline xint twice(xint v) { return v * 2; }\n");
    dir.write("src/use.cpp", "#include \"lib/x.h\"\n"
                             "#include \"lib/contrib/y.h\"\n"
                             "int use(Pair p) { return twice(p.a); }\n");
}

} // namespace

TEST_CASE("measure finds a header included as \"../x.h\"", "[measure]") {
    // The C standard (ISO/IEC 9899:2011, 6.10.2) leaves the search to the implementation; clang
    // and gcc look first in the including file's folder, so "../x.h" is include/lib/x.h here.
    TempDir dir;
    init_repo(dir.path());
    write_library(dir);
    commit_all(dir.path(), "library");
    for (const std::string rev : {"", "--rev HEAD "}) {
        const auto result = run_tollgate(
            "measure " + rev + "--no-pch-cache include/lib/contrib/y.h src/use.cpp", dir.path());
        INFO(result.out);
        CHECK(result.exit_code == 0);
        // No "file not found", and no redefinition of Pair: both paths reach one file.
        CHECK(result.out.find("warning") == std::string::npos);
        CHECK(result.out.find("include/lib/contrib/y.h:2  twice") != std::string::npos);
    }
}

TEST_CASE("measure and explain read a revision from inside a git folder", "[measure]") {
    TempDir dir;
    init_repo(dir.path());
    write_library(dir);
    commit_all(dir.path(), "library");
    SECTION("the .git folder of a working tree") {
        const std::string git_dir = dir.path() + "/.git";
        const auto measured =
            run_tollgate("measure --rev HEAD --no-pch-cache include/lib/contrib/y.h", git_dir);
        INFO(measured.err);
        CHECK(measured.exit_code == 0);
        CHECK(measured.out.find("twice") != std::string::npos);
        const auto explained = run_tollgate(
            "explain --rev HEAD --no-pch-cache include/lib/contrib/y.h:twice", git_dir);
        INFO(explained.err);
        CHECK(explained.exit_code == 0);
        CHECK(explained.out.rfind("include/lib/contrib/y.h:2-2  twice(xint)", 0) == 0);
    }
    SECTION("a bare clone") {
        git("clone -q --bare " + shell_quote(dir.path()) + " " + shell_quote(dir.path() + "/b.git"),
            dir.path());
        const auto measured = run_tollgate(
            "measure --rev HEAD --no-pch-cache include/lib/contrib/y.h", dir.path() + "/b.git");
        INFO(measured.err);
        CHECK(measured.exit_code == 0);
        CHECK(measured.out.find("twice") != std::string::npos);
    }
}

TEST_CASE("explain's hint repeats the revision the user gave", "[explain]") {
    TempDir dir;
    init_repo(dir.path());
    write_library(dir);
    commit_all(dir.path(), "library");
    const auto result = run_tollgate(
        "explain --rev HEAD --no-pch-cache include/lib/contrib/y.h:zzzzzzzzzzzz", dir.path());
    CHECK(result.exit_code == 2);
    CHECK(result.err == "tollgate: error: no function \"zzzzzzzzzzzz\" in "
                        "\"include/lib/contrib/y.h\" (run \"tollgate measure --rev HEAD "
                        "include/lib/contrib/y.h\" to list its functions)\n");
}

TEST_CASE("measure summarises missing headers once and says how to supply them", "[measure]") {
    TempDir dir;
    dir.write("a.c", "#include \"lua.h\"\n"
                     "#include \"lauxlib.h\"\n"
                     "int f(lua_State *L) { return luaL_checkinteger(L, 1); }\n"
                     "int g(lua_State *L) { lua_pushnil(L); return 1; }\n");
    dir.write("b.c", "#include \"lua.h\"\n"
                     "int h(lua_State *L) { return lua_gettop(L); }\n");
    const std::string hint =
        "note: headers that are not in the repository were not found: give the build's "
        "compile_commands.json (--compile-commands), or name their folders with --include-dir "
        "DIR for the files it does not cover\n";
    SECTION("one warning per missing header, its consequences counted, one hint") {
        const auto result = run_tollgate("measure --no-pch-cache a.c b.c", dir.path());
        CHECK(result.exit_code == 0);
        const std::string warnings = result.out.substr(result.out.find("warning:"));
        CHECK(warnings == "warning: a.c:1: header \"lua.h\" not found (also included by 1 more "
                          "file): 3 later parse errors in these files not listed, measured "
                          "anyway\n"
                          "warning: a.c:2: header \"lauxlib.h\" not found\n" +
                              hint);
    }
    SECTION("--include-dir supplies a folder outside the repository") {
        TempDir third_party;
        third_party.write("lua.h", "typedef struct lua_State lua_State;\n"
                                   "int lua_gettop(lua_State *L);\n"
                                   "void lua_pushnil(lua_State *L);\n"
                                   "long luaL_checkinteger(lua_State *L, int arg);\n");
        third_party.write("lauxlib.h", "\n");
        const auto result = run_tollgate("measure --no-pch-cache --include-dir " +
                                             shell_quote(third_party.path()) + " a.c b.c",
                                         dir.path());
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("warning") == std::string::npos);
        CHECK(result.out.find("note:") == std::string::npos);
    }
    SECTION("an include folder that does not exist is a usage error") {
        const auto result =
            run_tollgate("measure --no-pch-cache --include-dir /nonexistent/lua a.c", dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err ==
              "tollgate: error: include folder \"/nonexistent/lua\" does not exist\n");
    }
}

TEST_CASE("check does not use a baseline measured under convention c-family/1", "[check]") {
    // The counting convention changed (core/README.md, "Versions"): numbers counted under the
    // old rules are never compared with the new ones; the base is parsed instead.
    REQUIRE(tollgate::core::fingerprint({}) == "c-family/2");
    TempDir dir;
    init_repo(dir.path());
    dir.write("a.c", "int f(int x) { return x; }\n");
    const std::string base = commit_all(dir.path(), "base");
    dir.write("a.c", "int f(int x) { return x + 1; }\n");
    const std::string head = commit_all(dir.path(), "head");
    const auto written =
        run_tollgate("snapshot --rev " + base + " --out snap.json --no-pch-cache", dir.path());
    REQUIRE(written.exit_code == 0);
    auto snapshot = tollgate::baseline::load_snapshot(dir.path() + "/snap.json");
    snapshot.convention = "c-family/1";
    tollgate::baseline::save_snapshot(snapshot, dir.path() + "/snap.json");

    const auto result = run_tollgate("check --base " + base + " --head " + head +
                                         " --baseline snap.json --no-pch-cache",
                                     dir.path());
    CHECK(result.exit_code == 0);
    CHECK(result.err.find("tollgate: warning: the baseline snapshot snap.json is not used: it was "
                          "measured under convention \"c-family/1\", this run counts \"" +
                          tollgate::java::build_fingerprint({}) +
                          "\"; the base was parsed (rebuild it: tollgate snapshot --rev " +
                          base.substr(0, 7) + " --out snap.json)") != std::string::npos);
}

TEST_CASE("explain finds a test-macro function by the name reports show", "[explain]") {
    TempDir dir;
    dir.write("macros.hpp", "#define TEST(s, n) class s##_##n##_Test { void TestBody(); }; "
                            "void s##_##n##_Test::TestBody()\n");
    dir.write("codec_test.cpp", "#include \"macros.hpp\"\n"
                                "TEST(Codec, Roundtrip) {\n"
                                "    int x = 1;\n"
                                "}\n");
    const auto result = run_tollgate("explain --no-pch-cache " +
                                         shell_quote("codec_test.cpp:TEST(Codec, Roundtrip)"),
                                     dir.path());
    INFO(result.err);
    CHECK(result.exit_code == 0);
    CHECK(result.out.rfind("codec_test.cpp:2-4  TEST(Codec, Roundtrip)()", 0) == 0);
}
