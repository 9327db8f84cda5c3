// SPDX-License-Identifier: MIT
// AngleLists, the linear-time answer to "does this `<` open a template argument list?", against
// the direct answer (match_bracket from each `<`, then a scan of what lies between) on every `<`
// of many generated token sequences and sub-ranges of them.
#include "gate/lexer/angle_lists.hpp"
#include "gate/lexer/lexical_scan.hpp"

#include <catch2/catch.hpp>
#include <random>

using namespace tollgate;

namespace {

// The direct answer, as the classifier computed it before AngleLists: quadratic on nested lists.
bool direct_answer(const std::vector<lexer::SourceToken>& tokens, std::size_t open,
                   std::size_t end) {
    const std::size_t close = lexer::match_bracket(tokens, open);
    if (close >= tokens.size() || close > end) {
        return false;
    }
    for (std::size_t k = open + 1; k < close; ++k) {
        const auto& t = tokens[k];
        if (lexer::is_punct(t, "&&") || lexer::is_punct(t, "||") || lexer::is_punct(t, "=") ||
            lexer::is_punct(t, "?") || lexer::is_punct(t, "<=") || lexer::is_punct(t, ">=")) {
            return false;
        }
    }
    return true;
}

std::vector<lexer::SourceToken> generated_tokens(std::mt19937& random, std::size_t size) {
    static const std::vector<std::string> alphabet = {"<", "<",  "<",  ">",  ">", ">", ">>", "(",
                                                      ")", "[",  "]",  "{",  "}", ";", "&&", "=",
                                                      "?", "<=", ">=", "::", ",", "a", "b",  "T"};
    std::uniform_int_distribution<std::size_t> pick(0, alphabet.size() - 1);
    std::vector<lexer::SourceToken> tokens;
    for (std::size_t i = 0; i < size; ++i) {
        lexer::SourceToken token;
        token.spelling = alphabet[pick(random)];
        const bool name = token.spelling == "a" || token.spelling == "b" || token.spelling == "T";
        token.kind = name ? core::LexKind::identifier : core::LexKind::punctuation;
        tokens.push_back(token);
    }
    return tokens;
}

} // namespace

TEST_CASE("AngleLists", "[lexer]") {
    SECTION("agrees with the direct answer on every `<` of generated sequences and sub-ranges") {
        std::mt19937 random(20240601); // fixed seed: the same sequences on every run
        std::size_t compared = 0;
        for (int round = 0; round < 400; ++round) {
            const auto tokens = generated_tokens(random, 1 + static_cast<std::size_t>(round % 60));
            std::uniform_int_distribution<std::size_t> position(0, tokens.size() - 1);
            std::size_t begin = position(random);
            std::size_t end = position(random);
            if (begin > end) {
                std::swap(begin, end);
            }
            for (const auto& [from, to] :
                 {std::make_pair(std::size_t{0}, tokens.size() - 1), std::make_pair(begin, end)}) {
                const lexer::AngleLists lists(tokens, from, to);
                for (std::size_t open = from; open <= to; ++open) {
                    if (!lexer::is_punct(tokens[open], "<")) {
                        continue;
                    }
                    INFO("round " << round << " range " << from << ".." << to << " open " << open);
                    CHECK(lists.looks_like_template_list(open) == direct_answer(tokens, open, to));
                    ++compared;
                }
            }
        }
        CHECK(compared > 1000);
    }
    SECTION("answers for 20,000 nested lists, each closed") {
        std::vector<lexer::SourceToken> tokens;
        for (int i = 0; i < 20000; ++i) {
            tokens.push_back({core::LexKind::identifier, "A", 0, 1});
            tokens.push_back({core::LexKind::punctuation, "<", 0, 1});
        }
        tokens.push_back({core::LexKind::keyword, "int", 0, 1});
        for (int i = 0; i < 10000; ++i) {
            tokens.push_back({core::LexKind::punctuation, ">>", 0, 1});
        }
        const lexer::AngleLists lists(tokens, 0, tokens.size() - 1);
        CHECK(lists.looks_like_template_list(1));
        CHECK(lists.looks_like_template_list(39999));
        CHECK_FALSE(lists.looks_like_template_list(0));
    }
}
