// SPDX-License-Identifier: MIT
// glob_match: `*`, `**`, `?` and classes on paths and on function names. The expected results
// follow the usual shell and gitignore conventions for these wildcards (common practice, no
// source), with `**` crossing folders as in git's pathspec "**/" form.
#include "gate/policy/glob.hpp"

#include <catch2/catch.hpp>
#include <string>

using tollgate::policy::glob_match;
using tollgate::policy::GlobSubject;

TEST_CASE("glob_match matches paths", "[policy]") {
    const auto path = [](const char* pattern, const char* text) {
        return glob_match(pattern, text, GlobSubject::path);
    };
    SECTION("a star stays within one folder") {
        CHECK(path("src/*.c", "src/a.c"));
        CHECK_FALSE(path("src/*.c", "src/deep/a.c"));
        CHECK_FALSE(path("*", "src/a.c"));
        CHECK(path("*", "a.c"));
    }
    SECTION("a double star crosses folders") {
        CHECK(path("**", "src/deep/a.c"));
        CHECK(path("src/**", "src/deep/er/a.c"));
        CHECK_FALSE(path("src/**", "srcx/a.c"));
        CHECK(path("src/**/*.c", "src/a/b/c.c"));
    }
    SECTION("a leading or inner \"**/\" also matches no folder") {
        CHECK(path("**/generated/**", "generated/x.c"));
        CHECK(path("**/generated/**", "a/b/generated/x.c"));
        CHECK_FALSE(path("**/generated/**", "a/notgenerated/x.c"));
        CHECK(path("src/**/a.c", "src/a.c"));
    }
    SECTION("a question mark and classes take one character, never a slash") {
        CHECK(path("file?.c", "file1.c"));
        CHECK_FALSE(path("a?b", "a/b"));
        CHECK(path("[a-c]x.c", "bx.c"));
        CHECK_FALSE(path("[!a-c]x.c", "bx.c"));
        CHECK(path("[!a-c]x.c", "dx.c"));
        CHECK(path("a[", "a[")); // an unterminated class is a literal "["
    }
    SECTION("the whole text must match") {
        CHECK_FALSE(path("src", "src/a.c"));
        CHECK_FALSE(path("a.c", "xa.c"));
        CHECK(path("", ""));
        CHECK_FALSE(path("", "a"));
    }
    SECTION("many stars stay fast") {
        const std::string text(4000, 'a');
        CHECK_FALSE(path("*a*a*a*a*a*a*a*a*a*a*a*a*b", text.c_str()));
    }
}

TEST_CASE("glob_match matches function names", "[policy]") {
    const auto name = [](const char* pattern, const char* text) {
        return glob_match(pattern, text, GlobSubject::name);
    };
    CHECK(name("Parser::*", "Parser::parse"));
    CHECK(name("Parser::*", "Parser::Inner::parse"));
    CHECK_FALSE(name("Parser::*", "Lexer::next"));
    CHECK(name("*::operator/", "Vec::operator/"));
    CHECK(name("*", "operator/"));
}
