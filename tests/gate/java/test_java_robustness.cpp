// SPDX-License-Identifier: MIT
// The Java front end on bad input: broken, binary, huge, non-UTF-8 and deeply nested files are
// measured lexically or skipped with a warning, never a crash.
#include "gate/java/java_lexical.hpp"
#include "gate/java/java_scan.hpp"
#include "java_test_support.hpp"

#if TOLLGATE_JAVA_ENABLED

using namespace tollgate;
using test::lex_java;

namespace {

bool has_warning(const lexer::FileFunctions& file, const std::string& part) {
    for (const auto& warning : file.warnings) {
        if (warning.message.find(part) != std::string::npos) {
            return true;
        }
    }
    return false;
}

} // namespace

TEST_CASE("lex_java_file survives broken and unusual sources", "[java]") {
    SECTION("a syntax error is a warning and the other methods are still measured") {
        const auto file = lex_java("class A {\n"
                                   "  int ok() { return 1; }\n"
                                   "  void broken() { int x = ; if (x) { }\n"
                                   "  int after() { return 2; }\n"
                                   "}\n");
        CHECK(has_warning(file, "syntax error"));
        CHECK_FALSE(file.functions.empty());
        bool ok = false;
        for (const auto& f : file.functions) {
            ok = ok || f.qualified_name == "A.ok";
        }
        CHECK(ok);
    }
    SECTION("a method the tree loses is recovered lexically and flagged") {
        // A stray token before a member throws the tree off balance.
        const auto file = lex_java("class A {\n"
                                   "  int first() { return 1; }\n"
                                   "  ) ) int second(int v) { return v + 1; }\n"
                                   "}\n");
        bool second = false;
        for (const auto& f : file.functions) {
            second = second || f.qualified_name == "A.second";
        }
        CHECK(second);
    }
    SECTION("a NUL byte marks a binary file: skipped with a warning") {
        const auto file = lex_java(std::string("class A { void f() {} }\0\x01\x02", 26));
        CHECK(file.functions.empty());
        CHECK(has_warning(file, "binary content"));
    }
    SECTION("a file that is not UTF-8 is measured lexically, with a warning") {
        const auto file =
            lex_java("class A {\n  // caf\xe9 in Latin-1\n  int f() { return 1; }\n}\n");
        CHECK(has_warning(file, "not valid UTF-8"));
        REQUIRE(file.functions.size() == 1);
        CHECK(file.functions[0].mode == lexer::ExtentMode::lexical);
        CHECK(file.functions[0].qualified_name == "A.f");
    }
    SECTION("a file over the size limit is measured lexically, with a warning") {
        std::string code = "class Big {\n";
        for (int i = 0; code.size() <= java::k_max_tree_bytes; ++i) {
            code += "  int f" + std::to_string(i) + "(int v) { return v * " + std::to_string(i) +
                    " + 1; }\n";
        }
        code += "}\n";
        const auto file = lex_java(code);
        CHECK(has_warning(file, "larger than 4 MiB"));
        CHECK(file.functions.size() > 50000);
        CHECK(file.functions.front().mode == lexer::ExtentMode::lexical);
    }
    SECTION("deep nesting costs no stack: 200,000 parentheses and braces") {
        std::string code = "class Deep { int f() { return ";
        code += std::string(200000, '(') + "1" + std::string(200000, ')') + "; }\n void g() ";
        code += std::string(200000, '{') + std::string(200000, '}') + "\n}\n";
        const auto file = lex_java(code);
        CHECK(file.functions.size() == 2);
    }
    SECTION("unterminated comments, strings and text blocks end the file quietly") {
        for (const char* code : {"class A { void f() { /* never closed", "class A { String s = \"x",
                                 "class A { void f() { String t = \"\"\"\n open", "@", "{", "}",
                                 "class", "class A { A( }", "enum E { A( { , ; }"}) {
            CAPTURE(code);
            const auto file = lex_java(code);
            for (const auto& f : file.functions) {
                CHECK(f.start_line <= f.end_line);
            }
        }
    }
    SECTION("an empty file has no functions and no warnings") {
        const auto file = lex_java("");
        CHECK(file.functions.empty());
        CHECK(file.warnings.empty());
    }
}

TEST_CASE("scan_java splits Java source into tokens", "[java]") {
    const auto scan = java::scan_java("a >>>= 0x1F_FFL; // note\n/* x */ s = \"\"\"\n q\"\"\"; "
                                      "c = '\\''; non-sealed x; 1.5e-3 ... ::\n");
    std::vector<std::string> spellings;
    for (const auto& token : scan.tokens) {
        spellings.push_back(token.spelling);
    }
    CHECK(spellings == std::vector<std::string>{"a", ">>>=", "0x1F_FFL", ";", "s", "=",
                                                "\"\"\"\n q\"\"\"", ";", "c", "=", "'\\''", ";",
                                                "non-sealed", "x", ";", "1.5e-3", "...", "::"});
    CHECK(scan.tokens[4].line == 2);
    CHECK(scan.tokens[8].line == 3);
    CHECK(scan.problems.empty());
    CHECK(java::is_valid_utf8("caf\xc3\xa9"));
    CHECK_FALSE(java::is_valid_utf8("caf\xe9"));
    CHECK_FALSE(java::is_valid_utf8("\xc0\xaf"));     // overlong
    CHECK_FALSE(java::is_valid_utf8("\xed\xa0\x80")); // a surrogate
}

#endif
