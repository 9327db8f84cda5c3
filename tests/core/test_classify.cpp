// SPDX-License-Identifier: MIT
// The counting convention's tables (Tollgate convention c-family/1, DESIGN.md "Counting
// convention") applied to single tokens and to a hand-classified token list.
#include "tollgate/core/classify.hpp"
#include "tollgate/core/counts.hpp"

#include <catch2/catch.hpp>

using namespace tollgate::core;

namespace {

RawToken punct(const std::string& spelling, Form form = Form::plain) {
    RawToken raw;
    raw.spelling = spelling;
    raw.kind = LexKind::punctuation;
    raw.form = form;
    return raw;
}

RawToken ident(const std::string& spelling, NameKind name) {
    RawToken raw;
    raw.spelling = spelling;
    raw.kind = LexKind::identifier;
    raw.name = name;
    return raw;
}

RawToken keyword(const std::string& spelling) {
    RawToken raw;
    raw.spelling = spelling;
    raw.kind = LexKind::keyword;
    return raw;
}

RawToken literal(const std::string& spelling) {
    RawToken raw;
    raw.spelling = spelling;
    raw.kind = LexKind::literal;
    return raw;
}

} // namespace

TEST_CASE("classify_token counts closing halves of pairs as nothing", "[core]") {
    CHECK_FALSE(classify_token(punct(")")).has_value());
    CHECK_FALSE(classify_token(punct("]")).has_value());
    CHECK_FALSE(classify_token(punct("}")).has_value());
    CHECK_FALSE(classify_token(punct(">", Form::pair_close)).has_value());
    CHECK_FALSE(classify_token(punct(":", Form::pair_close)).has_value());
    CHECK(classify_token(punct("(")).value().key == "()");
    CHECK(classify_token(punct("[")).value().key == "[]");
    CHECK(classify_token(punct("{")).value().key == "{}");
    CHECK(classify_token(punct("?")).value().key == "?:");
    CHECK(classify_token(punct("<", Form::template_open)).value().key == "<>");
}

TEST_CASE("classify_token keeps unary, binary and declarator forms apart", "[core]") {
    SECTION("minus") {
        CHECK(classify_token(punct("-", Form::unary))->key == "- (unary)");
        CHECK(classify_token(punct("-", Form::binary))->key == "-");
        CHECK(classify_token(punct("-", Form::unary))->form == "unary minus");
    }
    SECTION("star") {
        CHECK(classify_token(punct("*", Form::unary))->form == "dereference");
        CHECK(classify_token(punct("*", Form::binary))->form == "multiplication");
        CHECK(classify_token(punct("*", Form::declarator))->key == "* (declarator)");
        CHECK(classify_token(punct("*", Form::declarator))->form == "pointer declarator");
    }
    SECTION("ampersand") {
        CHECK(classify_token(punct("&", Form::unary))->form == "address-of");
        CHECK(classify_token(punct("&", Form::binary))->form == "bitwise and");
        CHECK(classify_token(punct("&", Form::declarator))->form == "reference declarator");
        CHECK(classify_token(punct("&&", Form::declarator))->form == "rvalue reference declarator");
        CHECK(classify_token(punct("&&", Form::binary))->key == "&&");
    }
    SECTION("increment") {
        CHECK(classify_token(punct("++", Form::prefix))->key == "++ (prefix)");
        CHECK(classify_token(punct("++", Form::postfix))->key == "++ (postfix)");
        CHECK(classify_token(punct("--", Form::postfix))->form == "postfix decrement");
    }
    SECTION("the merged-forms switch counts unary and binary as one") {
        Convention merged;
        merged.merge_unary_binary = true;
        CHECK(classify_token(punct("-", Form::unary), merged)->key == "-");
        CHECK(classify_token(punct("-", Form::binary), merged)->key == "-");
        CHECK(fingerprint(merged) == "c-family/2+merged-forms");
    }
}

TEST_CASE("classify_token splits names into operators and operands", "[core]") {
    CHECK(classify_token(ident("count", NameKind::value))->role == Role::operand_token);
    CHECK(classify_token(ident("mystery", NameKind::unknown))->role == Role::operand_token);
    CHECK(classify_token(ident("printf", NameKind::function))->role == Role::operator_token);
    CHECK(classify_token(ident("MAX", NameKind::macro_function))->role == Role::operator_token);
    CHECK(classify_token(ident("Buffer", NameKind::type))->role == Role::operator_token);
    CHECK(classify_token(ident("std", NameKind::namespace_name))->role == Role::operator_token);
    CHECK(classify_token(ident("update", NameKind::defined))->role == Role::operator_token);
    Convention name_operand;
    name_operand.function_name_as_operand = true;
    CHECK(classify_token(ident("update", NameKind::defined), name_operand)->role ==
          Role::operand_token);
    CHECK(fingerprint(name_operand) == "c-family/2+name-operand");
}

TEST_CASE("classify_token counts value keywords and literals as operands", "[core]") {
    for (const char* word : {"true", "false", "nullptr", "this"}) {
        INFO(word);
        CHECK(classify_token(keyword(word))->role == Role::operand_token);
    }
    for (const char* word : {"int", "return", "if", "const", "sizeof"}) {
        INFO(word);
        CHECK(classify_token(keyword(word))->role == Role::operator_token);
    }
    CHECK(classify_token(literal("42"))->role == Role::operand_token);
    CHECK(classify_token(literal("'x'"))->role == Role::operand_token);
    CHECK(classify_token(literal("\"text\""))->role == Role::operand_token);
}

TEST_CASE("count_tokens reproduces the encyclopedia's counts from hand-classified tokens",
          "[core]") {
    // Wikipedia contributors, "Halstead complexity measures", English Wikipedia, section
    // "Example": 12 distinct operators, 7 distinct operands (seen); N1 = 27, N2 = 15 (from
    // memory, recomputed by counting). Tokens classified by hand here; the lexer tests run the
    // same program through libclang.
    std::vector<RawToken> raw = {
        ident("main", NameKind::defined),
        punct("("),
        punct(")"),
        punct("{"),
        keyword("int"),
        ident("a", NameKind::value),
        punct(","),
        ident("b", NameKind::value),
        punct(","),
        ident("c", NameKind::value),
        punct(","),
        ident("avg", NameKind::value),
        punct(";"),
        ident("scanf", NameKind::function),
        punct("("),
        literal("\"%d %d %d\""),
        punct(","),
        punct("&", Form::unary),
        ident("a", NameKind::value),
        punct(","),
        punct("&", Form::unary),
        ident("b", NameKind::value),
        punct(","),
        punct("&", Form::unary),
        ident("c", NameKind::value),
        punct(")"),
        punct(";"),
        ident("avg", NameKind::value),
        punct("=", Form::binary),
        punct("("),
        ident("a", NameKind::value),
        punct("+", Form::binary),
        ident("b", NameKind::value),
        punct("+", Form::binary),
        ident("c", NameKind::value),
        punct(")"),
        punct("/"),
        literal("3"),
        punct(";"),
        ident("printf", NameKind::function),
        punct("("),
        literal("\"avg = %d\""),
        punct(","),
        ident("avg", NameKind::value),
        punct(")"),
        punct(";"),
        punct("}"),
    };
    TokenList tokens;
    for (const auto& r : raw) {
        if (auto token = classify_token(r)) {
            tokens.push_back(*token);
        }
    }
    const Counts counts = count_tokens(tokens);
    CHECK(counts.distinct_operators == 12);
    CHECK(counts.distinct_operands == 7);
    CHECK(counts.total_operators == 27);
    CHECK(counts.total_operands == 15);
    CHECK(counts.operators.at("()").count == 4);
    CHECK(counts.operators.at(",").count == 7);
    CHECK(counts.operators.at(";").count == 4);
    CHECK(counts.operators.at("& (unary)").count == 3);
    CHECK(counts.operators.at("& (unary)").form == "address-of");
    CHECK(counts.operands.at("avg").count == 3);
}

TEST_CASE("count_tokens of nothing is all zero", "[core]") {
    const Counts counts = count_tokens({});
    CHECK(counts.distinct_operators == 0);
    CHECK(counts.total_operands == 0);
    CHECK(counts.operators.empty());
}

TEST_CASE("fingerprint names the default convention and every switch", "[core]") {
    CHECK(fingerprint(Convention{}) == "c-family/2");
    Convention all{true, true, true};
    CHECK(fingerprint(all) == "c-family/2+name-operand+body-only+merged-forms");
}
