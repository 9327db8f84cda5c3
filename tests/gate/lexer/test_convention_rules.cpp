// SPDX-License-Identifier: MIT
// Every rule of the counting convention on minimal C and C++ snippets, through libclang.
#include "lexer_test_support.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;
using core::Basis;
using core::Role;
using test::count_key;
using test::function_named;
using test::keys_of;
using test::token_spelled;

namespace {

const char* const k_c_snippet = R"(#define SQUARE(x) ((x) * (x))
#define LIMIT 10
int helper(int v);
int rules(int a, int b, int *p)
{
    int d = -a - b;
    int e = *p * a;
    int *q = &a;
    int f = a & b;
    a++;
    --b;
    int arr[3];
    arr[0] = a > b ? a : b;
    helper(SQUARE(a));
    char ch = 'x';
    const char *text = "hi";
    return LIMIT + d + e + f + *q + ch + text[0];
}
)";

const char* const k_cxx_snippet = R"(#include <vector>
namespace demo {
struct Box {
    int size() const { return n; }
    int n = 0;
};
void take(int&& moved);
template <typename T> int dependent(T t) { return probe(t) + t.length(); }
int rules(Box& box, const std::vector<int>& values, int a, int b)
{
    std::vector<int> local;
    bool less = a < b;
    int& ref = a;
    Box* self = nullptr;
    auto twice = [&](int x) { return x * 2 + a; };
    take(static_cast<int&&>(b));
    bool flag = true || false;
    return box.size() + twice(a) + static_cast<int>(values.size()) + ref + (less ? 1 : 0) +
           (self == nullptr ? 0 : 1) + (flag ? 1 : 0);
}
struct Counter {
    int value = 0;
    int bump() { return this->value++; }
};
}
)";

} // namespace

TEST_CASE("lex_functions applies the convention to C", "[lexer]") {
    // Tollgate convention c-family/1, DESIGN.md "Counting convention".
    const auto file = test::lex_snippet("rules.c", k_c_snippet);
    REQUIRE(file.functions.size() == 1);
    const auto& tokens = function_named(file, "rules").tokens;

    SECTION("unary minus and binary minus are different operators") {
        CHECK(count_key(tokens, "- (unary)", Role::operator_token) == 1);
        CHECK(count_key(tokens, "-", Role::operator_token) == 1);
        CHECK(token_spelled(tokens, "-").basis == Basis::syntax_tree);
    }
    SECTION("dereference, multiplication and pointer declarator are told apart") {
        // `int *p`, `int *q`, `const char *text` declare; `*p`, `*q` dereference; one multiplies.
        CHECK(count_key(tokens, "* (declarator)", Role::operator_token) == 3);
        CHECK(count_key(tokens, "* (unary)", Role::operator_token) == 2);
        CHECK(count_key(tokens, "*", Role::operator_token) == 1);
    }
    SECTION("address-of and bitwise and are told apart") {
        CHECK(count_key(tokens, "& (unary)", Role::operator_token) == 1);
        CHECK(count_key(tokens, "&", Role::operator_token) == 1);
    }
    SECTION("postfix and prefix increments are told apart") {
        CHECK(count_key(tokens, "++ (postfix)", Role::operator_token) == 1);
        CHECK(count_key(tokens, "-- (prefix)", Role::operator_token) == 1);
    }
    SECTION("pairs count once and their closing halves add nothing") {
        CHECK(count_key(tokens, "()", Role::operator_token) == 3); // header, helper, SQUARE
        CHECK(count_key(tokens, "[]", Role::operator_token) == 3);
        CHECK(count_key(tokens, "{}", Role::operator_token) == 1);
        CHECK(count_key(tokens, ")", Role::operator_token) == 0);
        CHECK(count_key(tokens, "]", Role::operator_token) == 0);
        CHECK(count_key(tokens, "}", Role::operator_token) == 0);
    }
    SECTION("the conditional counts once as ?:") {
        CHECK(count_key(tokens, "?:", Role::operator_token) == 1);
        CHECK(count_key(tokens, ":", Role::operator_token) == 0);
    }
    SECTION(
        "called functions and function-like macros are operators, object-like macros operands") {
        CHECK(token_spelled(tokens, "helper").role == Role::operator_token);
        CHECK(token_spelled(tokens, "helper").form == "call");
        CHECK(token_spelled(tokens, "SQUARE").role == Role::operator_token);
        CHECK(token_spelled(tokens, "SQUARE").form == "macro call");
        CHECK(token_spelled(tokens, "LIMIT").role == Role::operand_token);
    }
    SECTION("literals of every kind are operands") {
        CHECK(count_key(tokens, "'x'", Role::operand_token) == 1);
        CHECK(count_key(tokens, "\"hi\"", Role::operand_token) == 1);
        CHECK(count_key(tokens, "3", Role::operand_token) == 1);
        CHECK(count_key(tokens, "0", Role::operand_token) == 2);
    }
    SECTION("type keywords and the defined function's name are operators") {
        CHECK(count_key(tokens, "int", Role::operator_token) == 9);
        CHECK(count_key(tokens, "char", Role::operator_token) == 2);
        CHECK(token_spelled(tokens, "rules").role == Role::operator_token);
        CHECK(token_spelled(tokens, "rules").form == "defined function");
    }
    SECTION("variables and parameters are operands") {
        CHECK(count_key(tokens, "a", Role::operand_token) == 9);
        CHECK(count_key(tokens, "p", Role::operand_token) == 2);
    }
    SECTION("preprocessor lines are not part of the function") {
        CHECK(count_key(tokens, "define", Role::operator_token) == 0);
        CHECK(count_key(tokens, "10", Role::operand_token) == 0);
    }
}

TEST_CASE("lex_functions applies the convention to C++", "[lexer]") {
    // Tollgate convention c-family/1, DESIGN.md "Counting convention".
    const auto file = test::lex_snippet("rules.cpp", k_cxx_snippet);
    const auto& tokens = function_named(file, "demo::rules").tokens;

    SECTION("template brackets count once, less-than is an operator of its own") {
        // std::vector<int> twice, static_cast<int&&> and static_cast<int>: four lists.
        CHECK(count_key(tokens, "<>", Role::operator_token) == 4);
        CHECK(count_key(tokens, "<", Role::operator_token) == 1);
        CHECK(count_key(tokens, ">", Role::operator_token) == 0);
    }
    SECTION("reference declarators, rvalue references and logical and are told apart") {
        CHECK(count_key(tokens, "& (declarator)", Role::operator_token) == 4); // Box&, vector&,
                                                                               // int&, [&]
        CHECK(count_key(tokens, "&& (declarator)", Role::operator_token) == 1);
        CHECK(count_key(tokens, "* (declarator)", Role::operator_token) == 1);
        CHECK(count_key(tokens, "||", Role::operator_token) == 1);
    }
    SECTION("method calls name an operator") {
        CHECK(token_spelled(tokens, "size").role == Role::operator_token);
        CHECK(token_spelled(tokens, "size").form == "call");
        CHECK(token_spelled(tokens, "take").role == Role::operator_token);
    }
    SECTION("a lambda's tokens belong to the enclosing function") {
        CHECK(count_key(tokens, "x", Role::operand_token) == 2);
        CHECK(count_key(tokens, "2", Role::operand_token) == 1);
        CHECK(count_key(tokens, "{}", Role::operator_token) == 2);
        for (const auto& function : file.functions) {
            CHECK(function.qualified_name.find("lambda") == std::string::npos);
        }
        CHECK(file.functions.size() == 4); // Box::size, dependent, rules, Counter::bump
    }
    SECTION("true, false and nullptr are operands; type and namespace names operators") {
        CHECK(count_key(tokens, "true", Role::operand_token) == 1);
        CHECK(count_key(tokens, "false", Role::operand_token) == 1);
        CHECK(count_key(tokens, "nullptr", Role::operand_token) == 2);
        CHECK(count_key(tokens, "Box", Role::operator_token) == 2);
        CHECK(count_key(tokens, "std", Role::operator_token) == 2);
        CHECK(token_spelled(tokens, "vector").form == "type name");
    }
    SECTION("this is an operand") {
        const auto& bump = function_named(file, "demo::Counter::bump").tokens;
        CHECK(count_key(bump, "this", Role::operand_token) == 1);
        CHECK(count_key(bump, "++ (postfix)", Role::operator_token) == 1);
    }
    SECTION("unresolved calls in a template are operators") {
        const auto& dependent = function_named(file, "demo::dependent").tokens;
        CHECK(token_spelled(dependent, "probe").role == Role::operator_token);
        CHECK(token_spelled(dependent, "probe").form == "call");
        CHECK(token_spelled(dependent, "length").role == Role::operator_token);
        CHECK(count_key(dependent, "t", Role::operand_token) == 3);
    }
}

TEST_CASE("lex_functions honours the convention switches", "[lexer]") {
    const std::string code = "int twice(int a) { return -a + a * 2; }\n";
    lexer::ParseContext context;

    SECTION("the defined function's name can be an operand") {
        context.convention.function_name_as_operand = true;
        const auto file = test::lex_snippet("switch.c", code, context);
        CHECK(token_spelled(file.functions.at(0).tokens, "twice").role == Role::operand_token);
    }
    SECTION("unary and binary forms can be merged") {
        context.convention.merge_unary_binary = true;
        const auto file = test::lex_snippet("switch.c", code, context);
        const auto& tokens = file.functions.at(0).tokens;
        CHECK(count_key(tokens, "- (unary)", Role::operator_token) == 0);
        CHECK(count_key(tokens, "-", Role::operator_token) == 1);
    }
    SECTION("the signature can be left out") {
        context.convention.body_only = true;
        const auto file = test::lex_snippet("switch.c", code, context);
        const auto keys = keys_of(file.functions.at(0).tokens);
        REQUIRE_FALSE(keys.empty());
        CHECK(keys.front() == "{}");
        CHECK(count_key(file.functions.at(0).tokens, "twice", Role::operator_token) == 0);
    }
}
