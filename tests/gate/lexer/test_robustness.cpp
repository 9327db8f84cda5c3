// SPDX-License-Identifier: MIT
// Broken, odd and large sources: the lexer measures what it can, warns, and never crashes.
#include "lexer_test_support.hpp"

#include <catch2/catch.hpp>
#include <sstream>

using namespace tollgate;

namespace {

bool has_warning_at(const lexer::FileFunctions& file, unsigned line) {
    for (const auto& warning : file.warnings) {
        if (warning.line == line) {
            return true;
        }
    }
    return false;
}

} // namespace

TEST_CASE("lex_functions survives broken and unusual sources", "[lexer]") {
    // common practice, no source: real code bases contain all of these.
    SECTION("a syntax error is a warning and every function is still listed") {
        const auto file = test::lex_snippet("broken.c", "int ok(int a) { return a; }\n"
                                                        "int broken(int a) {\n"
                                                        "  return a +;\n"
                                                        "}\n"
                                                        "int later(void) { return 2; }\n");
        CHECK(file.functions.size() == 3);
        CHECK(has_warning_at(file, 3));
        CHECK(test::function_named(file, "later").end_line == 5);
    }
    SECTION("a missing closing brace is a warning") {
        const auto file = test::lex_snippet("missing.c", "int ok(int a) { return a; }\n"
                                                         "int open(int a) {\n"
                                                         "  if (a) {\n"
                                                         "    return 1;\n"
                                                         "}\n");
        CHECK_FALSE(file.warnings.empty());
        CHECK(test::function_named(file, "ok").tokens.size() == 9);
    }
    SECTION("an unknown macro between type and name keeps the function and those after it") {
        const auto file = test::lex_snippet("export.c", "EXPORT_API int f(int x) {\n"
                                                        "  return x * 2;\n"
                                                        "}\n"
                                                        "int g(int y) { return y; }\n");
        CHECK(has_warning_at(file, 1));
        REQUIRE(file.functions.size() == 2);
        CHECK(test::function_named(file, "f").start_line == 1);
        CHECK(test::function_named(file, "f").end_line == 3);
        CHECK(test::function_named(file, "g").start_line == 4);
    }
    SECTION("a trailing attribute macro is recovered lexically") {
        const auto file = test::lex_snippet("attr.cpp", "void g() NOEXCEPT_MACRO {\n"
                                                        "  int y = 3;\n"
                                                        "  y++;\n"
                                                        "}\n"
                                                        "int h(int z) { return -z; }\n");
        REQUIRE(file.functions.size() == 2);
        const auto& g = test::function_named(file, "g");
        CHECK(g.mode == lexer::ExtentMode::lexical);
        CHECK(g.usr.empty());
        CHECK(g.start_line == 1);
        CHECK(g.end_line == 4);
        CHECK(g.potential_operands == 0);
        CHECK(test::token_spelled(g.tokens, "++").basis == core::Basis::lexical);
        CHECK(test::count_key(g.tokens, "++ (postfix)", core::Role::operator_token) == 1);
        const auto& h = test::function_named(file, "h");
        CHECK(test::count_key(h.tokens, "- (unary)", core::Role::operator_token) == 1);
        CHECK(file.lexically_recovered >= 1);
        CHECK(has_warning_at(file, 1));
    }
    SECTION("an #ifdef that splits braces keeps one function spanning both headers") {
        const auto file = test::lex_snippet("split.c", "#ifdef FAST\n"
                                                       "int compute(int x) {\n"
                                                       "#else\n"
                                                       "int compute(int x, int y) {\n"
                                                       "#endif\n"
                                                       "  return x - y;\n"
                                                       "}\n"
                                                       "int after(int z) { return z; }\n");
        REQUIRE(file.functions.size() == 2);
        const auto& compute = test::function_named(file, "compute");
        CHECK(compute.end_line == 7);
        CHECK(compute.signature == "int, int");
        CHECK(test::function_named(file, "after").start_line == 8);
    }
    SECTION("non-UTF-8 bytes in a string and a comment are measured as written") {
        const std::string code = "/* caf\xe9 */\nconst char* name() { return \"caf\xe9\"; }\n";
        const auto file = test::lex_snippet("latin1.c", code);
        REQUIRE(file.functions.size() == 1);
        CHECK(test::count_key(file.functions[0].tokens, "\"caf\xe9\"", core::Role::operand_token) ==
              1);
    }
    SECTION("a UTF-8 byte order mark and CRLF line endings change nothing") {
        const std::string plain = "int f(int a)\n{\n    return a + 1;\n}\n";
        const std::string odd = "\xEF\xBB\xBFint f(int a)\r\n{\r\n    return a + 1;\r\n}\r\n";
        const auto base = test::lex_snippet("plain.c", plain);
        const auto head = test::lex_snippet("plain.c", odd);
        REQUIRE(base.functions.size() == 1);
        REQUIRE(head.functions.size() == 1);
        CHECK(head.functions[0].tokens == base.functions[0].tokens);
        CHECK(head.functions[0].token_hash == base.functions[0].token_hash);
        CHECK(head.functions[0].end_line == 4);
    }
    SECTION("comments and whitespace leave the token hash unchanged, an edit changes it") {
        const auto base = test::lex_snippet("hash.c", "int f(int a) { return a + 1; }\n");
        const auto moved =
            test::lex_snippet("hash.c", "\n// note\nint f(int a)\n{\n  return a /* x */ + 1;\n}\n");
        const auto edited = test::lex_snippet("hash.c", "int f(int a) { return a - 1; }\n");
        CHECK(moved.functions.at(0).token_hash == base.functions.at(0).token_hash);
        CHECK(edited.functions.at(0).token_hash != base.functions.at(0).token_hash);
        CHECK(base.functions.at(0).token_hash.size() == 16);
    }
    SECTION("a generated 50,000-line file is lexed completely") {
        std::ostringstream code;
        const int count = 10000;
        for (int i = 0; i < count; ++i) {
            code << "int fn_" << i << "(int a)\n{\n    int b = a * " << i
                 << ";\n    return b - a;\n}\n";
        }
        const auto file = test::lex_snippet("generated.c", code.str());
        CHECK(file.functions.size() == static_cast<std::size_t>(count));
        CHECK(file.warnings.empty());
        CHECK(file.functions.back().end_line == 50000);
        CHECK(file.functions.back().qualified_name == "fn_9999");
    }
}
