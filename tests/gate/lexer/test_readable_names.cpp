// SPDX-License-Identifier: MIT
// Names a reviewer can read, no phantom functions, and leading specifier macros counted.
#include "lexer_test_support.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;

namespace {

// A test macro made the way common C++ test frameworks make theirs (common practice, no
// source): a class per test, its body the definition of a member.
const char* const k_test_macros = R"(#pragma once
#define TEST(suite, name) \
    class suite##_##name##_Test { public: void TestBody(); }; \
    void suite##_##name##_Test::TestBody()
#define TEST_F(fixture, name) TEST(fixture, name)
#define TEST_CASE_NAME2(line) check_test_##line
#define TEST_CASE_NAME(line) TEST_CASE_NAME2(line)
#define TEST_CASE(...) static void TEST_CASE_NAME(__LINE__)()
)";

std::vector<std::string> names_of(const lexer::FileFunctions& file) {
    std::vector<std::string> names;
    for (const auto& function : file.functions) {
        names.push_back(function.qualified_name);
    }
    return names;
}

} // namespace

TEST_CASE("lex_functions names test-macro functions by the macro and its arguments", "[lexer]") {
    const std::vector<SourceFile> files = {
        {"tests/test_macros.hpp", k_test_macros},
        {"tests/emitter_test.cpp",
         "#include \"test_macros.hpp\"\n"
         "namespace yaml {\n"
         "TEST(EmitterTest, MultiDocs) {\n"
         "    int docs = 2;\n"
         "    (void)docs;\n"
         "}\n"
         "TEST_F(EmitterTest, Empty) { }\n"
         "}\n"
         "TEST_CASE(\"parses a key\", \"[yaml]\") { int k = 1; (void)k; }\n"},
    };
    const auto context = lexer::make_parse_context(files);
    lexer::Lexer lexer;
    const auto file = lexer.lex_functions(files[1], context);
    INFO("first warning: " << (file.warnings.empty() ? "" : file.warnings[0].message));
    CHECK(file.warnings.empty());
    const std::vector<std::string> expected = {"yaml::TEST(EmitterTest, MultiDocs)",
                                               "yaml::TEST_F(EmitterTest, Empty)",
                                               "TEST_CASE(\"parses a key\", \"[yaml]\")"};
    CHECK(names_of(file) == expected);
    SECTION("the USR of the generated function is kept for pairing") {
        const auto& multi = test::function_named(file, "yaml::TEST(EmitterTest, MultiDocs)");
        CHECK(multi.usr.find("EmitterTest_MultiDocs_Test") != std::string::npos);
        CHECK(multi.signature.empty());
        CHECK(multi.fallback_key == "yaml::TEST(EmitterTest, MultiDocs)()#0");
        CHECK(multi.start_line == 3);
        CHECK(multi.end_line == 6);
    }
}

TEST_CASE("lex_functions names a test macro it cannot expand the same way", "[lexer]") {
    // Without the framework's header the parser reads TEST(A, B) { ... } as a function TEST with
    // parameters of unknown types; it is the same test as with the header.
    const auto file = test::lex_snippet("suite_test.cpp", "TEST(Suite, Name) { int x = 1; }\n");
    REQUIRE(file.functions.size() == 1);
    CHECK(file.functions[0].qualified_name == "TEST(Suite, Name)");
    CHECK(file.functions[0].signature.empty());
    CHECK(file.functions[0].potential_operands == 0);
}

TEST_CASE("lex_functions reads conversion operators as written", "[lexer]") {
    const auto file =
        test::lex_snippet("holder.hpp", "struct Holder {\n"
                                        "    template <class T> operator T*() const {\n"
                                        "        return nullptr;\n"
                                        "    }\n"
                                        "    operator const char*() const { return \"\"; }\n"
                                        "};\n");
    const std::vector<std::string> expected = {"Holder::operator T*",
                                               "Holder::operator const char*"};
    CHECK(names_of(file) == expected);
}

TEST_CASE("the lexical scan takes no macro-made type for a function", "[lexer]") {
    // A header that does not compile alone: the enumeration's base comes from a macro of a
    // header it does not include, so only the lexical scan sees this file's definitions.
    const auto file = test::lex_snippet("kinds.h", "enum class Kind KINDS_BASE(unsigned char) {\n"
                                                   "    k_one,\n"
                                                   "    k_two\n"
                                                   "};\n"
                                                   "typedef struct PACKED(4) { int a; } packed_t;\n"
                                                   "enum Colour COLOUR_BASE(int) { red, green };\n"
                                                   "int count(void) { return 2; }\n");
    CHECK(names_of(file) == std::vector<std::string>{"count"});
    for (const auto& warning : file.warnings) {
        CHECK(warning.message.find("measured lexically") == std::string::npos);
    }
}

TEST_CASE("the lexical scan finds explicit specialisations", "[lexer]") {
    // Needs convert.h first, so it does not compile alone (every definition is lexical).
    const auto file = test::lex_snippet(
        "convert_node.h",
        "template <> bool Converter::decode<Node>(const Node& node, Node& out) {\n"
        "  out = node;\n"
        "  return true;\n"
        "}\n"
        "template <>\n"
        "inline bool Converter::decode<std::pair<int, int>>(const Node& n, std::pair<int, int>& "
        "out) {\n"
        "  return n.size() == 2;\n"
        "}\n");
    REQUIRE(file.functions.size() == 2);
    CHECK(file.functions[0].qualified_name == "Converter::decode");
    CHECK(file.functions[0].signature == "const Node &, Node &");
    CHECK(file.functions[0].start_line == 1);
    CHECK(file.functions[0].end_line == 4);
    CHECK(file.functions[0].potential_operands == 3);
    CHECK(file.functions[1].start_line == 5); // the template header
    CHECK(file.functions[1].end_line == 8);
}

TEST_CASE("the lexical scan names test macros in skipped branches as the parser does", "[lexer]") {
    const auto file = test::lex_snippet("slow_test.cpp", "#ifdef SLOW_TESTS\n"
                                                         "TEST(Codec, Roundtrip) { run(1); }\n"
                                                         "#endif\n");
    REQUIRE(file.functions.size() == 1);
    CHECK(file.functions[0].inactive);
    CHECK(file.functions[0].qualified_name == "TEST(Codec, Roundtrip)");
    CHECK(file.functions[0].signature.empty());
}

TEST_CASE("a leading specifier macro counts as it does anywhere in the declaration", "[lexer]") {
    // Tollgate convention c-family/2 (core/README.md, "Scope"): from the first declaration token.
    const auto file =
        test::lex_snippet("box.cpp", "#define SOMELIB_CONSTEXPR\n"
                                     "#define SOMELIB_API(kind)\n"
                                     "struct Box {\n"
                                     "    SOMELIB_CONSTEXPR explicit Box(long v) "
                                     ": m(v) {}\n"
                                     "    long m;\n"
                                     "};\n"
                                     "struct Crate {\n"
                                     "    explicit SOMELIB_CONSTEXPR Crate(long v) "
                                     ": m(v) {}\n"
                                     "    long m;\n"
                                     "};\n"
                                     "SOMELIB_API(export) int first(int a) { return a; }\n");
    const auto& box = test::function_named(file, "Box::Box");
    const auto& crate = test::function_named(file, "Crate::Crate");
    CHECK(box.tokens.size() == crate.tokens.size());
    CHECK(test::count_key(box.tokens, "SOMELIB_CONSTEXPR", core::Role::operand_token) == 1);
    CHECK(test::count_key(crate.tokens, "SOMELIB_CONSTEXPR", core::Role::operand_token) == 1);
    CHECK(box.tokens.front().spelling == "SOMELIB_CONSTEXPR");
    const auto& first = test::function_named(file, "first");
    CHECK(first.tokens.front().spelling == "SOMELIB_API");
}

TEST_CASE("a macro that ends a declaration is not taken into the next function", "[lexer]") {
    const auto file = test::lex_snippet("registry.c", "#define DECLARE_COUNTER(name) int name;\n"
                                                      "DECLARE_COUNTER(hits)\n"
                                                      "int bump(void) { return ++hits; }\n");
    const auto& bump = test::function_named(file, "bump");
    CHECK(bump.start_line == 3);
    CHECK(bump.tokens.front().spelling == "int");
}
