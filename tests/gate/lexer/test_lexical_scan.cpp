// SPDX-License-Identifier: MIT
// The lexical scanner across #if branches, and the inputs its fuzzer kept.
#include "fuzz/lexical_stream.hpp"
#include "gate/lexer/lexical_scan.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <set>
#include <sstream>

using namespace tollgate::lexer;

namespace {

// Split `text` at spaces into tokens, one line per token (directives take a line too); "#if",
// "#else" and "#endif" become directive marks. Keywords are the few this file uses.
tollgate::fuzz::Stream tokens_of(const std::string& text) {
    static const std::set<std::string> keywords = {"void", "int", "return", "if", "else"};
    tollgate::fuzz::Stream stream;
    std::istringstream words(text);
    std::string word;
    unsigned line = 0;
    unsigned offset = 0;
    while (words >> word) {
        ++line;
        if (word == "#if" || word == "#else" || word == "#endif") {
            const DirectiveKind kind = word == "#if"     ? DirectiveKind::open_condition
                                       : word == "#else" ? DirectiveKind::alternative
                                                         : DirectiveKind::close_condition;
            stream.directives.push_back({stream.tokens.size(), kind});
            continue;
        }
        SourceToken token;
        token.spelling = word;
        token.line = line;
        token.offset = offset;
        offset += static_cast<unsigned>(word.size()) + 1;
        if (keywords.count(word) != 0) {
            token.kind = tollgate::core::LexKind::keyword;
        } else if (std::isalpha(static_cast<unsigned char>(word[0])) || word[0] == '_') {
            token.kind = tollgate::core::LexKind::identifier;
        } else if (std::isdigit(static_cast<unsigned char>(word[0]))) {
            token.kind = tollgate::core::LexKind::literal;
        }
        stream.tokens.push_back(token);
    }
    return stream;
}

} // namespace

TEST_CASE("scan_definitions", "[lexer]") {
    SECTION("a function defined in both branches of an #if is two definitions, apart") {
        const auto stream = tokens_of("int g ( ) ; #if int f ( ) { return 1 ; } #else "
                                      "int f ( ) { return 2 ; } #endif");
        const auto found = scan_definitions(stream.tokens, stream.directives);
        REQUIRE(found.size() == 2);
        CHECK(stream.tokens[found[0].first].line == 7);       // the first branch's `int`
        CHECK(stream.tokens[found[0].body_close].line == 15); // its `}`
        CHECK(stream.tokens[found[1].first].line == 17);      // the second branch's `int`, not
                                                              // the statement before the #if
        CHECK(found[1].first > found[0].body_close);
        CHECK(tollgate::fuzz::check_lexical_path(stream).empty());
    }
    SECTION("a body closed in both branches of an #if is one definition to its last brace") {
        const auto stream = tokens_of("void f ( ) { int x ; #if } #else } #endif");
        const auto found = scan_definitions(stream.tokens, stream.directives);
        REQUIRE(found.size() == 1);
        CHECK(found[0].qualified_name == "f");
        CHECK(found[0].body_close == stream.tokens.size() - 1);
    }
}

TEST_CASE("scan_definitions and classify_tokens survive the fuzzer's regression inputs",
          "[lexer]") {
    namespace fs = std::filesystem;
    const fs::path folder =
        fs::path(TOLLGATE_SOURCE_DIR) / "tests" / "fuzz" / "regressions" / "lexical";
    REQUIRE(fs::is_directory(folder));
    std::size_t replayed = 0;
    for (const auto& entry : fs::directory_iterator(folder)) {
        if (!entry.is_regular_file() || entry.path().filename() == "README.md") {
            continue;
        }
        INFO(entry.path().string());
        const std::string bytes = tollgate::test::read_text(entry.path().string());
        const auto stream = tollgate::fuzz::decode_stream(
            reinterpret_cast<const std::uint8_t*>(bytes.data()), bytes.size());
        CHECK(tollgate::fuzz::check_lexical_path(stream) == "");
        ++replayed;
    }
    CHECK(replayed > 0);
}
