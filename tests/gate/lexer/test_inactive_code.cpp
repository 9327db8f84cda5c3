// SPDX-License-Identifier: MIT
// Code the preprocessor skipped is still code: functions of inactive #if branches are measured.
#include "lexer_test_support.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;

namespace {

bool has_warning_about(const lexer::FileFunctions& file, const std::string& text) {
    for (const auto& warning : file.warnings) {
        if (warning.message.find(text) != std::string::npos) {
            return true;
        }
    }
    return false;
}

} // namespace

TEST_CASE("lex_functions measures the functions of skipped #if branches", "[lexer]") {
    // The C standard (ISO/IEC 9899:2011, 6.10.1 "Conditional inclusion"): a group whose
    // condition is false is skipped, and only directive names in it are processed. Whether a
    // branch is active here is decided by the flags in use (no SOMETHING_TEST is defined).
    const auto file = test::lex_snippet("selftest.c", "int active(int x) { return x + 1; }\n"
                                                      "#ifdef SOMETHING_TEST\n"
                                                      "static int self_test(void) {\n"
                                                      "    return active(2) == 3;\n"
                                                      "}\n"
                                                      "#endif\n"
                                                      "#if 0\n"
                                                      "int never(int y) { return y * 2; }\n"
                                                      "#else\n"
                                                      "int other(int y) { return y * 3; }\n"
                                                      "#endif\n");
    REQUIRE(file.functions.size() == 4);

    SECTION("a function of an #ifdef branch is listed, marked inactive and measured lexically") {
        const auto& self_test = test::function_named(file, "self_test");
        CHECK(self_test.inactive);
        CHECK(self_test.mode == lexer::ExtentMode::lexical);
        CHECK(self_test.usr.empty());
        CHECK(self_test.start_line == 3);
        CHECK(self_test.end_line == 5);
        CHECK(self_test.potential_operands == 1);
        // static int self_test ( void ) { return active ( 2 ) == 3 ; } counted by hand under
        // c-family/2: operators static int self_test () void {} return active () == ;
        CHECK(self_test.tokens.size() == 13);
    }
    SECTION("a function of an #if 0 branch is listed too, its #else function is parsed") {
        const auto& never = test::function_named(file, "never");
        CHECK(never.inactive);
        CHECK(never.start_line == 8);
        const auto& other = test::function_named(file, "other");
        CHECK_FALSE(other.inactive);
        CHECK(other.mode == lexer::ExtentMode::syntax_tree);
        CHECK_FALSE(test::function_named(file, "active").inactive);
    }
    SECTION("inactive functions are expected, not warned about or counted as recovered") {
        CHECK_FALSE(has_warning_about(file, "self_test"));
        CHECK_FALSE(has_warning_about(file, "never"));
        CHECK(file.lexically_recovered == 0);
    }
}

TEST_CASE("lex_functions measures a whole file under a false #if", "[lexer]") {
    // common practice, no source: a TLS back end compiled only when it is selected.
    const auto file = test::lex_snippet("tls_other.c", "#if USE_OTHER_TLS == 1\n"
                                                       "#include <other_tls.h>\n"
                                                       "static int open_session(int fd) {\n"
                                                       "    return tls_open(fd, 0);\n"
                                                       "}\n"
                                                       "int tls_read(int fd, char *buf, int n) {\n"
                                                       "    return tls_recv(fd, buf, n);\n"
                                                       "}\n"
                                                       "#endif\n");
    REQUIRE(file.functions.size() == 2);
    for (const auto& function : file.functions) {
        CHECK(function.inactive);
    }
    CHECK(test::function_named(file, "tls_read").signature == "int, char *, int");
    CHECK(file.warnings.empty());
}

TEST_CASE("lex_functions takes the branches a -D flag selects as active", "[lexer]") {
    const std::string code = "#ifdef FAST\n"
                             "int pick(int a) { return a; }\n"
                             "#else\n"
                             "int pick(int a) { return a + 1; }\n"
                             "#endif\n";
    lexer::ParseContext context;
    context.file_flags["pick.c"] = {"-DFAST"};
    const auto file = test::lex_snippet("pick.c", code, context);
    REQUIRE(file.functions.size() == 2);
    CHECK_FALSE(file.functions[0].inactive); // line 2, FAST is defined
    CHECK(file.functions[0].start_line == 2);
    CHECK(file.functions[1].inactive); // line 4, the #else branch
    // Same name and signature: the fallback keys number them in source order.
    CHECK(file.functions[0].fallback_key == "pick(int)#0");
    CHECK(file.functions[1].fallback_key == "pick(int)#1");
}
