// SPDX-License-Identifier: MIT
// Extents are honest when the parse is not: libclang's extents checked against brace matching.
#include "gate/lexer/extent_check.hpp"
#include "lexer_test_support.hpp"

#include <catch2/catch.hpp>
#include <set>
#include <sstream>

using namespace tollgate;
using lexer::ExtentVerdict;

namespace {

// Split `text` at spaces into tokens of one line each (a token "\n" starts the next line).
std::vector<lexer::SourceToken> tokens_of(const std::string& text) {
    static const std::set<std::string> k_keywords = {"int",   "void",   "return", "try",
                                                     "catch", "static", "const"};
    std::vector<lexer::SourceToken> tokens;
    std::istringstream in(text);
    std::string word;
    unsigned line = 1;
    unsigned offset = 0;
    while (in >> word) {
        if (word == "\\n") {
            ++line;
            continue;
        }
        lexer::SourceToken token;
        token.spelling = word;
        token.line = line;
        token.offset = offset;
        offset += static_cast<unsigned>(word.size()) + 1;
        const char c = word[0];
        if (k_keywords.count(word) != 0) {
            token.kind = core::LexKind::keyword;
        } else if (std::isalpha(static_cast<unsigned char>(c)) || c == '_') {
            token.kind = core::LexKind::identifier;
        } else if (std::isdigit(static_cast<unsigned char>(c)) || c == '"') {
            token.kind = core::LexKind::literal;
        } else {
            token.kind = core::LexKind::punctuation;
        }
        tokens.push_back(token);
    }
    return tokens;
}

bool has_warning_about(const lexer::FileFunctions& file, const std::string& text) {
    for (const auto& warning : file.warnings) {
        if (warning.message.find(text) != std::string::npos) {
            return true;
        }
    }
    return false;
}

bool has_function(const lexer::FileFunctions& file, const std::string& name) {
    for (const auto& function : file.functions) {
        if (function.qualified_name == name) {
            return true;
        }
    }
    return false;
}

} // namespace

TEST_CASE("check_extent compares a parsed extent with brace matching", "[lexer]") {
    // Tokens 0-8 are f (name at 1), 9-17 are g (name at 10).
    const auto tokens = tokens_of("int f ( ) { return 1 ; } \\n int g ( ) { return 2 ; }");
    const auto definitions = lexer::scan_definitions(tokens, {});
    REQUIRE(definitions.size() == 2);

    SECTION("the same extent agrees") {
        const auto check = lexer::check_extent(tokens, {0, 8}, 1, definitions, {});
        CHECK(check.verdict == ExtentVerdict::agrees);
    }
    SECTION("an extent that runs over the next function takes the brace-matched end") {
        const auto check = lexer::check_extent(tokens, {0, 17}, 1, definitions, {});
        CHECK(check.verdict == ExtentVerdict::braces);
        CHECK(check.braces == lexer::TokenRange{0, 8});
    }
    SECTION("an extent that starts before a closing brace takes the brace-matched start") {
        const auto check = lexer::check_extent(tokens, {0, 17}, 10, definitions, {});
        CHECK(check.verdict == ExtentVerdict::braces);
        CHECK(check.braces == lexer::TokenRange{9, 17});
    }
    SECTION("an end in a macro rather than at a closing brace cannot be judged") {
        const auto check = lexer::check_extent(tokens, {0, 7}, 1, definitions, {});
        CHECK(check.verdict == ExtentVerdict::agrees);
    }
    SECTION("a closing brace in a skipped branch cannot judge") {
        const lexer::SkippedRange skipped{tokens[8].offset, tokens[8].offset + 1};
        const auto check = lexer::check_extent(tokens, {0, 17}, 1, definitions, {skipped});
        CHECK(check.verdict == ExtentVerdict::agrees);
    }
}

TEST_CASE("check_extent accepts the handlers of a function-try-block", "[lexer]") {
    // ISO/IEC 14882:2017 [except] 18/1: a function-try-block's handlers follow the body.
    const auto tokens = tokens_of("void f ( ) try { g ( ) ; } catch ( ... ) { h ( ) ; }");
    const auto definitions = lexer::scan_definitions(tokens, {});
    REQUIRE_FALSE(definitions.empty());
    const auto check = lexer::check_extent(tokens, {0, tokens.size() - 1}, 1, definitions, {});
    CHECK(check.verdict == ExtentVerdict::agrees);
}

TEST_CASE("lex_functions drops a function the parser made of an unknown macro", "[lexer]") {
    // A missing header leaves LUA_API_DECLARE undefined: libclang reads it as a K&R-style
    // function whose parameter declarations are the next lines and whose body is helper's
    // (ISO/IEC 9899:1990 6.7.1, identifier lists with declarations before the body).
    const auto file = test::lex_snippet("knr.c", "LUA_API_DECLARE(lua_State)\n"
                                                 "int a;\n"
                                                 "int b;\n"
                                                 "static int helper(int x)\n"
                                                 "{\n"
                                                 "  return x + a + b;\n"
                                                 "}\n");
    CHECK_FALSE(has_function(file, "LUA_API_DECLARE"));
    const auto& helper = test::function_named(file, "helper");
    CHECK(helper.start_line == 4);
    CHECK(helper.end_line == 7);
    CHECK(helper.brace_extent);
    CHECK(has_warning_about(file, "disagreed with brace matching"));
    CHECK_FALSE(has_warning_about(file, "the parser did not report it"));
}

TEST_CASE("lex_functions drops a function whose body is an initializer", "[lexer]") {
    const auto file = test::lex_snippet("table.c", "UNKNOWN_BEGIN(foo)\n"
                                                   "static int table[] = { 1, 2, 3 };\n"
                                                   "int f(void)\n"
                                                   "{\n"
                                                   "  return table[0];\n"
                                                   "}\n");
    CHECK_FALSE(has_function(file, "UNKNOWN_BEGIN"));
    REQUIRE(file.functions.size() == 1);
    CHECK(file.functions[0].qualified_name == "f");
    CHECK(file.functions[0].start_line == 3);
    std::size_t warnings = 0;
    for (const auto& warning : file.warnings) {
        warnings += warning.message.find("brace matching") != std::string::npos ? 1 : 0;
    }
    CHECK(warnings == 1); // once per file
}

TEST_CASE("lex_functions keeps a sound extent whose #if 0 branch holds a brace", "[lexer]") {
    const auto file = test::lex_snippet("if0.c", "int f(void) {\n"
                                                 "#if 0\n"
                                                 "}\n"
                                                 "#endif\n"
                                                 "  return 1;\n"
                                                 "}\n"
                                                 "int g(void) { return 2; }\n");
    const auto& f = test::function_named(file, "f");
    CHECK(f.end_line == 6);
    CHECK_FALSE(f.brace_extent);
    CHECK(test::function_named(file, "g").start_line == 7);
}
