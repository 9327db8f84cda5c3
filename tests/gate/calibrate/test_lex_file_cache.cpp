// SPDX-License-Identifier: MIT
// The lexed-file cache's keys: content digest against the FNV definition, and which headers count.
#include "gate/calibrate/lex_file_cache.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>

using tollgate::SourceFile;
using tollgate::calibrate::content_key;
using tollgate::calibrate::lex_cache_key;
using tollgate::calibrate::LexFileCache;

namespace {

tollgate::lexer::ParseContext context_with(std::vector<SourceFile> headers) {
    tollgate::lexer::ParseContext context;
    context.headers = std::move(headers);
    context.include_dirs = {""};
    return context;
}

} // namespace

TEST_CASE("content_key", "[calibrate]") {
    SECTION("it is 128-bit FNV-1a of the bytes followed by one 0xff separator") {
        // Reference: the FNV-1a definition (Fowler, Noll, Vo; IETF draft-eastlake-fnv, section
        // 2: offset basis and prime for 128 bits), computed independently with Python integers.
        const auto py = tollgate::test::run_command(
            "python3 -c \"h = 0x6c62272e07bb014262b821756295c58d\n"
            "for b in b'tollgate' + bytes([255]):\n"
            "    h = ((h ^ b) * 0x0000000001000000000000000000013B) % (1 << 128)\n"
            "print('%032x' % h)\"",
            ".");
        REQUIRE(py.exit_code == 0);
        CHECK(content_key("tollgate") + "\n" == py.out);
    }
    SECTION("different bytes give different keys") {
        CHECK(content_key("int f();") != content_key("int g();"));
        CHECK(content_key("").size() == 32);
    }
}

TEST_CASE("lex_cache_key", "[calibrate]") {
    const SourceFile file{"src/a.cpp", "#include \"a.hpp\"\nint f() { return 1; }\n"};
    const SourceFile a_hpp{"src/a.hpp", "#include \"b.hpp\"\nint f();\n"};
    const SourceFile b_hpp{"include/b.hpp", "int b();\n"};
    const SourceFile other{"src/other.hpp", "int other();\n"};
    const auto key = lex_cache_key(file, context_with({b_hpp, a_hpp, other}));

    SECTION("a header the file does not reach does not change the key") {
        const SourceFile other_edited{"src/other.hpp", "int other(int);\n"};
        CHECK(lex_cache_key(file, context_with({b_hpp, a_hpp, other_edited})) == key);
        CHECK(lex_cache_key(file, context_with({b_hpp, a_hpp})) == key);
    }
    SECTION("a header reached directly or through another header changes it") {
        const SourceFile a_edited{"src/a.hpp", "#include \"b.hpp\"\nint f(int = 0);\n"};
        const SourceFile b_edited{"include/b.hpp", "int b(int);\n"};
        CHECK(lex_cache_key(file, context_with({b_hpp, a_edited, other})) != key);
        CHECK(lex_cache_key(file, context_with({b_edited, a_hpp, other})) != key);
    }
    SECTION("the path, the content and the convention are part of it") {
        CHECK(lex_cache_key({"src/b.cpp", file.content}, context_with({b_hpp, a_hpp, other})) !=
              key);
        CHECK(lex_cache_key({file.path, file.content + "\n"},
                            context_with({b_hpp, a_hpp, other})) != key);
        auto context = context_with({b_hpp, a_hpp, other});
        context.convention.body_only = true;
        CHECK(lex_cache_key(file, context) != key);
    }
    SECTION("an include the scan cannot follow makes every header count") {
        const SourceFile computed{"src/c.cpp", "#include HEADER\nint c() { return 2; }\n"};
        const auto computed_key = lex_cache_key(computed, context_with({b_hpp, a_hpp, other}));
        const SourceFile other_edited{"src/other.hpp", "int other(int);\n"};
        CHECK(lex_cache_key(computed, context_with({b_hpp, a_hpp, other_edited})) != computed_key);
    }
}

TEST_CASE("LexFileCache", "[calibrate]") {
    tollgate::test::TempDir dir;
    LexFileCache cache(dir.path() + "/cache");
    const SourceFile file{"src/a.c", "int f(int x) { return x + 1; }\n"};
    const auto context = context_with({});
    tollgate::lexer::FileFunctions lexed;
    lexed.path = file.path;
    tollgate::lexer::FunctionSpan span;
    span.qualified_name = "f";
    span.fallback_key = "f(int)#0";
    span.path = file.path;
    span.start_line = 1;
    span.end_line = 1;
    span.tokens.push_back({"int", "int", tollgate::core::Role::operator_token, "",
                           tollgate::core::Basis::spelling, 1});
    span.tokens.push_back(
        {"x", "x", tollgate::core::Role::operand_token, "", tollgate::core::Basis::syntax_tree, 1});
    span.token_hash = "abc";
    lexed.functions.push_back(span);
    lexed.warnings.push_back({file.path, 1, "a warning"});

    SECTION("a stored entry comes back equal, from another instance too") {
        CHECK_FALSE(cache.find(file, context));
        cache.store(file, context, lexed);
        LexFileCache again(dir.path() + "/cache");
        const auto found = again.find(file, context);
        REQUIRE(found);
        CHECK(found->functions == lexed.functions);
        CHECK(found->warnings.size() == 1);
        CHECK(found->warnings[0].message == "a warning");
        CHECK(again.counts().hits == 1);
        CHECK(cache.counts().parses == 1);
    }
}

TEST_CASE("LexFileCache keeps text that is not UTF-8 byte for byte", "[calibrate]") {
    tollgate::test::TempDir dir;
    LexFileCache cache(dir.path() + "/cache");
    const auto context = context_with({});
    // A Latin-1 file whose string literals differ only in a Latin-1 byte: replacing either
    // with U+FFFD would merge two distinct operands and change n2.
    const SourceFile latin1{"src/caf\xE9.c", "char* s() { return \"\xE9\" \"\xE8\"; }\n"};
    tollgate::lexer::FileFunctions bytes;
    bytes.path = latin1.path;
    tollgate::lexer::FunctionSpan span;
    span.path = latin1.path;
    span.usr = "c:caf\xE9.c@F@s";
    span.qualified_name = "s\x1b[2J";
    span.fallback_key = "s\x1b[2J()#0";
    span.start_line = 1;
    span.end_line = 1;
    span.token_hash = "abc";
    span.tokens = {
        {"\"\xE9\"", "\"\xE9\"", tollgate::core::Role::operand_token, "",
         tollgate::core::Basis::spelling, 1},
        {"\"\xE8\"", "\"\xE8\"", tollgate::core::Role::operand_token, "",
         tollgate::core::Basis::spelling, 1},
        {"%d", "%d", tollgate::core::Role::operand_token, "", tollgate::core::Basis::spelling, 1}};
    bytes.functions.push_back(span);
    bytes.warnings = {{latin1.path, 1, "caf\xE9 \xFF"}};
    // Before: nlohmann's dump threw type_error 316 in store() and ended the run.
    REQUIRE_NOTHROW(cache.store(latin1, context, bytes));
    CHECK(cache.counts().write_failures == 0);
    LexFileCache again(dir.path() + "/cache");
    const auto found = again.find(latin1, context);
    REQUIRE(found);
    CHECK(found->path == latin1.path);
    CHECK(found->functions == bytes.functions);
    REQUIRE(found->warnings.size() == 1);
    CHECK(found->warnings[0].path == latin1.path);
    CHECK(found->warnings[0].message == "caf\xE9 \xFF");
    CHECK(again.counts().damaged == 0);
}
