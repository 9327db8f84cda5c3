// SPDX-License-Identifier: MIT
// Languages by extension and the parse context built from files and compile_commands.json.
#include "gate/common/errors.hpp"
#include "lexer_test_support.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;

TEST_CASE("language_for_path", "[lexer]") {
    // common practice, no source: the usual C and C++ extensions.
    CHECK(lexer::language_for_path("src/a.c") == lexer::Language::c);
    CHECK(lexer::language_for_path("src/a.cc") == lexer::Language::cxx);
    CHECK(lexer::language_for_path("src/a.cpp") == lexer::Language::cxx);
    CHECK(lexer::language_for_path("src/a.c++") == lexer::Language::cxx);
    CHECK(lexer::language_for_path("include/a.h") == lexer::Language::cxx);
    CHECK(lexer::language_for_path("include/a.hpp") == lexer::Language::cxx);
    CHECK_FALSE(lexer::language_for_path("README.md").has_value());
    CHECK(lexer::language_for_path("include/a.h", lexer::Language::c) == lexer::Language::c);
}

TEST_CASE("make_parse_context", "[lexer]") {
    const std::vector<SourceFile> files = {
        {"include/top.h", "int top(void);"},
        {"lib/core/include/core/api.hpp", "int api();"},
        {"lib/core/src/api.cpp", "int api() { return 1; }"},
        {"tools/main.c", "int main(void) { return 0; }"},
    };

    SECTION("headers are kept and every include folder is searched") {
        const auto context = lexer::make_parse_context(files);
        CHECK(context.headers.size() == 2);
        const std::vector<std::string> expected = {"", "include", "lib/core/include"};
        CHECK(context.include_dirs == expected);
        CHECK(context.file_flags.empty());
    }
    SECTION("compile_commands.json flags are mapped to repository paths") {
        const std::string database = R"([
          {"directory": "/home/dev/repo/build",
           "file": "/home/dev/repo/lib/core/src/api.cpp",
           "arguments": ["c++", "-DFAST=1", "-I../lib/core/include", "-isystem", "/opt/x/include",
                         "-std=gnu++17", "-O2", "-Wall", "-c", "../lib/core/src/api.cpp"]},
          {"directory": "/home/dev/repo",
           "file": "tools/main.c",
           "command": "cc -U NDEBUG -I include -include \"include/top.h\" -c tools/main.c"},
          {"directory": "/elsewhere", "file": "/elsewhere/x.c", "command": "cc -DX -c x.c"}
        ])";
        const auto context = lexer::make_parse_context(files, database, "/home/dev/repo",
                                                       lexer::DatabaseOrigin::given);
        REQUIRE(context.file_flags.size() == 2);
        const std::vector<std::string> api = {"-DFAST=1", "-I/tollgate-src/lib/core/include",
                                              "-isystem", "/opt/x/include", "-std=gnu++17"};
        CHECK(context.file_flags.at("lib/core/src/api.cpp") == api);
        const std::vector<std::string> main_flags = {"-UNDEBUG", "-I", "/tollgate-src/include",
                                                     "-include", "/tollgate-src/include/top.h"};
        CHECK(context.file_flags.at("tools/main.c") == main_flags);
        // A database the pipeline names is trusted: its folders outside the repository may be read.
        CHECK(context.trusted_dirs == std::vector<std::string>{"/opt/x/include"});
    }
    SECTION("a database found in the working tree names no host folder but system ones") {
        // It may come with the change under review: "-I/etc" must not make /etc readable.
        const std::string database = R"([
          {"directory": "/home/dev/repo",
           "file": "src/api.cpp",
           "arguments": ["c++", "-I/etc", "-isystem", "/opt/x/include", "-I/usr/include/libxml2",
                         "-I", "../../../../etc", "-include", "/etc/passwd", "-Iinclude",
                         "-c", "src/api.cpp"]}
        ])";
        const auto context = lexer::make_parse_context(files, database, "/home/dev/repo",
                                                       lexer::DatabaseOrigin::found);
        const std::vector<std::string> api = {"-I/usr/include/libxml2", "-I/tollgate-src/include"};
        CHECK(context.file_flags.at("src/api.cpp") == api);
        CHECK(context.trusted_dirs.empty());
    }
    SECTION("a file without an entry borrows the nearest entry of its language") {
        // common practice, no source: editors infer a header's flags from a nearby source.
        const std::string database = R"([
          {"directory": "/r", "file": "lib/core/src/api.cpp", "command": "c++ -DCORE -c x"},
          {"directory": "/r", "file": "tools/main.c", "command": "cc -DTOOL -c x"},
          {"directory": "/r", "file": "lib/other/o.cpp", "command": "c++ -DOTHER -c x"}
        ])";
        const auto context = lexer::make_parse_context(files, database, "/r");
        const auto* header = lexer::flags_for(context, "lib/core/include/core/api.hpp");
        REQUIRE(header != nullptr);
        CHECK(*header == std::vector<std::string>{"-DCORE"});
        const auto* c_file = lexer::flags_for(context, "tools/other.c");
        REQUIRE(c_file != nullptr);
        CHECK(*c_file == std::vector<std::string>{"-DTOOL"});
        CHECK(lexer::flags_for(lexer::make_parse_context(files), "x.hpp") == nullptr);
    }
    SECTION("a header parses with the flags it borrowed") {
        const std::string database = R"json([{"directory": "/r", "file": "src/use.cpp",
                                           "arguments": ["c++", "-DSCALE=3", "-c", "src/use.cpp"]}])json";
        const auto context = lexer::make_parse_context({}, database, "/r");
        const auto file = test::lex_snippet(
            "src/scale.hpp", "inline int scaled(int a) { return a * SCALE; }\n", context);
        REQUIRE(file.functions.size() == 1);
        CHECK(file.warnings.empty());
    }
    SECTION("a broken compile_commands.json is a usage error") {
        CHECK_THROWS_AS(lexer::make_parse_context(files, "{not json", "/r"), UsageError);
        CHECK_THROWS_AS(lexer::make_parse_context(files, "{}", "/r"), UsageError);
    }
    SECTION("compile database flags reach the parser") {
        const std::string database = R"json([{"directory": "/r", "file": "flags.c",
                                           "arguments": ["cc", "-DTWICE(x)=((x)*2)", "-c", "flags.c"]}])json";
        const auto context = lexer::make_parse_context({}, database, "/r");
        const auto file =
            test::lex_snippet("flags.c", "int f(int a) { return TWICE(a); }\n", context);
        REQUIRE(file.functions.size() == 1);
        CHECK(file.warnings.empty());
        CHECK(test::token_spelled(file.functions[0].tokens, "TWICE").form == "macro call");
    }
}
