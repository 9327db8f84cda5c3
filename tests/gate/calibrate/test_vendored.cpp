// SPDX-License-Identifier: MIT
// Vendored-folder detection from a tree's file names, and the globs that exclude such folders.
#include "gate/calibrate/calibration_scope.hpp"
#include "gate/calibrate/vendored.hpp"
#include "gate/policy/glob.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using calibrate::find_vendored;
using calibrate::VendoredSign;

namespace {

std::vector<std::string> paths_of(const std::vector<calibrate::VendoredFolder>& folders) {
    std::vector<std::string> out;
    for (const auto& f : folders) {
        out.push_back(f.path);
    }
    return out;
}

} // namespace

TEST_CASE("find_vendored", "[calibrate]") {
    SECTION("a folder with its own licence and build file below a holding folder is vendored") {
        const auto found =
            find_vendored({"src/a.c", "third_party/zlib/LICENSE", "third_party/zlib/CMakeLists.txt",
                           "third_party/zlib/inflate.c", "third_party/zlib/contrib/x/y.c"});
        REQUIRE(found.size() == 1);
        CHECK(found[0].path == "third_party/zlib");
        CHECK(found[0].sign == VendoredSign::licensed_bundle);
    }
    SECTION("names compare without case and the licence may carry an extension") {
        CHECK(paths_of(find_vendored(
                  {"Tests/Lib/COPYING.txt", "Tests/Lib/Makefile", "Tests/Lib/lib.c"})) ==
              std::vector<std::string>{"Tests/Lib"});
    }
    SECTION("a licence without a build file, or a build file without a licence, is not enough") {
        CHECK(find_vendored({"vendor/a/LICENSE", "vendor/a/a.c"}).empty());
        CHECK(find_vendored({"tests/unit/CMakeLists.txt", "tests/unit/test_a.cpp"}).empty());
    }
    SECTION("the project's own top-level folder is not vendored for having a licence") {
        CHECK(find_vendored(
                  {"LICENSE", "CMakeLists.txt", "lib/LICENSE", "lib/CMakeLists.txt", "lib/a.c"})
                  .empty());
    }
    SECTION("a test framework's folder is vendored below the top level, with a build file") {
        const auto found = find_vendored({"test/gtest/CMakeLists.txt", "test/gtest/src/all.cc",
                                          "test/gtest/include/gtest/gtest.h"});
        REQUIRE(found.size() == 1);
        CHECK(found[0].path == "test/gtest");
        CHECK(found[0].sign == VendoredSign::test_framework);
    }
    SECTION("a test framework's folder at the top level is the project itself") {
        CHECK(find_vendored({"googletest/CMakeLists.txt", "googletest/src/gtest.cc",
                             "googletest/include/gtest/gtest.h"})
                  .empty());
    }
    SECTION("only the outermost of nested vendored folders is listed, in path order") {
        CHECK(paths_of(find_vendored({"deps/b/LICENSE", "deps/b/Makefile", "deps/b/tests/c/LICENSE",
                                      "deps/b/tests/c/Makefile", "deps/a-x/COPYING",
                                      "deps/a-x/meson.build"})) ==
              std::vector<std::string>{"deps/a-x", "deps/b"});
    }
}

TEST_CASE("folder_glob", "[calibrate]") {
    SECTION("it matches every file below the folder and nothing beside it") {
        const std::string glob = calibrate::folder_glob("tests/vendor/x");
        CHECK(glob == "tests/vendor/x/**");
        CHECK(policy::glob_match(glob, "tests/vendor/x/a/b.c", policy::GlobSubject::path));
        CHECK_FALSE(policy::glob_match(glob, "tests/vendor/xy/b.c", policy::GlobSubject::path));
    }
    SECTION("glob characters in the folder's name match only themselves") {
        const std::string glob = calibrate::folder_glob("deps/a*[b]?");
        CHECK(glob == "deps/a[*][[]b][?]/**");
        CHECK(policy::glob_match(glob, "deps/a*[b]?/f.c", policy::GlobSubject::path));
        CHECK_FALSE(policy::glob_match(glob, "deps/axx[b]z/f.c", policy::GlobSubject::path));
        CHECK_FALSE(policy::glob_match(glob, "deps/a*b!/f.c", policy::GlobSubject::path));
    }
}
