// SPDX-License-Identifier: MIT
// The lexical path's fuzz harness, shared by the libFuzzer target and the unit test that replays
// kept inputs: decode bytes into a token stream, scan and classify it, and check the promises the
// scanner and classifier make.
#pragma once

#include "gate/lexer/lexical_scan.hpp"
#include "gate/lexer/source_token.hpp"
#include "gate/lexer/token_classifier.hpp"
#include "tollgate/core/counts.hpp"
#include "tollgate/core/measures.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

namespace tollgate::fuzz {

struct Word {
    core::LexKind kind;
    const char* spelling;
};

// The vocabulary a byte picks from: the tokens the scanner and classifier decide on, plus a few
// ordinary names and literals. Structure comes from the fuzzer's choice of order.
inline constexpr std::array<Word, 64> k_words = {{
    {core::LexKind::punctuation, "{"},       {core::LexKind::punctuation, "}"},
    {core::LexKind::punctuation, "("},       {core::LexKind::punctuation, ")"},
    {core::LexKind::punctuation, "["},       {core::LexKind::punctuation, "]"},
    {core::LexKind::punctuation, "<"},       {core::LexKind::punctuation, ">"},
    {core::LexKind::punctuation, ">>"},      {core::LexKind::punctuation, ";"},
    {core::LexKind::punctuation, ","},       {core::LexKind::punctuation, "::"},
    {core::LexKind::punctuation, ":"},       {core::LexKind::punctuation, "="},
    {core::LexKind::punctuation, "*"},       {core::LexKind::punctuation, "&"},
    {core::LexKind::punctuation, "&&"},      {core::LexKind::punctuation, "+"},
    {core::LexKind::punctuation, "-"},       {core::LexKind::punctuation, "++"},
    {core::LexKind::punctuation, "--"},      {core::LexKind::punctuation, "->"},
    {core::LexKind::punctuation, "..."},     {core::LexKind::punctuation, "~"},
    {core::LexKind::punctuation, "."},       {core::LexKind::punctuation, "?"},
    {core::LexKind::punctuation, "!"},       {core::LexKind::punctuation, "#"},
    {core::LexKind::keyword, "template"},    {core::LexKind::keyword, "typename"},
    {core::LexKind::keyword, "class"},       {core::LexKind::keyword, "struct"},
    {core::LexKind::keyword, "enum"},        {core::LexKind::keyword, "namespace"},
    {core::LexKind::keyword, "operator"},    {core::LexKind::keyword, "const"},
    {core::LexKind::keyword, "return"},      {core::LexKind::keyword, "if"},
    {core::LexKind::keyword, "else"},        {core::LexKind::keyword, "void"},
    {core::LexKind::keyword, "int"},         {core::LexKind::keyword, "noexcept"},
    {core::LexKind::keyword, "try"},         {core::LexKind::keyword, "catch"},
    {core::LexKind::keyword, "throw"},       {core::LexKind::keyword, "sizeof"},
    {core::LexKind::keyword, "extern"},      {core::LexKind::keyword, "new"},
    {core::LexKind::keyword, "delete"},      {core::LexKind::identifier, "f"},
    {core::LexKind::identifier, "g"},        {core::LexKind::identifier, "T"},
    {core::LexKind::identifier, "Box"},      {core::LexKind::identifier, "value"},
    {core::LexKind::identifier, "API"},      {core::LexKind::identifier, "__attribute__"},
    {core::LexKind::identifier, "override"}, {core::LexKind::identifier, "main"},
    {core::LexKind::literal, "0"},           {core::LexKind::literal, "\"text\""},
    {core::LexKind::literal, "'c'"},         {core::LexKind::literal, "1.5f"},
    {core::LexKind::identifier, "x"},        {core::LexKind::identifier, "std"},
}};

// A decoded input: the convention switches and the token stream with its directives.
struct Stream {
    core::Convention convention;
    std::vector<lexer::SourceToken> tokens;
    std::vector<lexer::DirectiveMark> directives;
};

// Decode `data`: the first byte sets the convention switches; in each later byte the low six
// bits pick a word and the top two bits start a new line, or (bytes 0xC0-0xC3) put a conditional
// directive (#if, #else, #endif, other) before the next token.
inline Stream decode_stream(const std::uint8_t* data, std::size_t size) {
    Stream stream;
    if (size == 0) {
        return stream;
    }
    stream.convention.function_name_as_operand = (data[0] & 1) != 0;
    stream.convention.body_only = (data[0] & 2) != 0;
    stream.convention.merge_unary_binary = (data[0] & 4) != 0;
    unsigned line = 1;
    unsigned offset = 0;
    for (std::size_t i = 1; i < size; ++i) {
        const std::uint8_t byte = data[i];
        const unsigned high = byte >> 6;
        if (high == 3 && (byte & 0x3f) < 4) {
            stream.directives.push_back(
                {stream.tokens.size(), static_cast<lexer::DirectiveKind>(byte & 0x3)});
            ++line;
            continue;
        }
        if (high >= 2) {
            ++line;
        }
        const Word& word = k_words[byte & 0x3f];
        lexer::SourceToken token;
        token.kind = word.kind;
        token.spelling = word.spelling;
        token.offset = offset;
        token.line = line;
        offset += static_cast<unsigned>(token.spelling.size()) + 1;
        stream.tokens.push_back(std::move(token));
    }
    return stream;
}

// Return true when counting only `{` and `}` from the body's opening brace first returns to zero
// at its closing one.
inline bool braces_close_at(const std::vector<lexer::SourceToken>& tokens,
                            const lexer::LexicalDefinition& definition) {
    int depth = 0;
    for (std::size_t i = definition.body_open; i <= definition.body_close; ++i) {
        if (lexer::is_punct(tokens[i], "{")) {
            ++depth;
        } else if (lexer::is_punct(tokens[i], "}") && --depth == 0) {
            return i == definition.body_close;
        }
    }
    return false;
}

// Return the first broken promise of classifying `range` (empty when none): closing halves are
// dropped and nothing is invented, only spelling and neighbours decide without a syntax tree,
// and every measure of the result is finite.
inline std::string check_classified(const Stream& stream, const lexer::ClassifyRange& range,
                                    std::uint64_t potential_operands) {
    const core::TokenList counted =
        lexer::classify_tokens(stream.tokens, nullptr, range, stream.convention);
    if (counted.size() > range.end - range.begin + 1) {
        return "classify_tokens returned more tokens than its range holds";
    }
    for (const core::Token& token : counted) {
        if (token.key.empty()) {
            return "a counted token has no key";
        }
        if (token.basis != core::Basis::lexical && token.basis != core::Basis::spelling) {
            return "a token without a syntax tree claims another basis";
        }
    }
    const core::Measures measures =
        core::compute_measures(core::count_tokens(counted), potential_operands);
    for (core::MeasureId id : core::k_all_measures) {
        if (!std::isfinite(core::measure_value(measures, id))) {
            return "measure " + std::string(core::measure_name(id)) + " is not finite";
        }
    }
    return {};
}

// Scan and classify `stream`; return the first broken promise, or an empty string.
inline std::string check_lexical_path(const Stream& stream) {
    const auto& tokens = stream.tokens;
    const auto definitions = lexer::scan_definitions(tokens, stream.directives);
    for (std::size_t d = 0; d < definitions.size(); ++d) {
        const lexer::LexicalDefinition& definition = definitions[d];
        if (!(definition.first <= definition.name && definition.name < definition.body_open &&
              definition.body_open < definition.body_close &&
              definition.body_close < tokens.size())) {
            return "definition " + std::to_string(d) + " has its parts out of order";
        }
        if (!lexer::is_punct(tokens[definition.body_open], "{") ||
            !lexer::is_punct(tokens[definition.body_close], "}")) {
            return "definition " + std::to_string(d) + " has a body not from { to }";
        }
        // Without directives (an #else may restore an earlier brace count) the braces of a
        // body balance exactly at its close; parentheses need not: a macro may leave one open.
        if (stream.directives.empty() && !braces_close_at(tokens, definition)) {
            return "definition " + std::to_string(d) + " closes where its braces do not";
        }
        if (d > 0 && definition.first <= definitions[d - 1].body_close) {
            return "definition " + std::to_string(d) + " overlaps the one before it";
        }
        lexer::ClassifyRange range;
        range.begin = definition.first;
        range.end = definition.body_close;
        range.defined_name = definition.name;
        if (std::string broken = check_classified(stream, range, definition.potential_operands);
            !broken.empty()) {
            return "definition " + std::to_string(d) + ": " + broken;
        }
    }
    // Classifying any range, not only found definitions, must be safe as well.
    if (tokens.size() >= 2) {
        lexer::ClassifyRange range;
        range.begin = tokens.size() / 3;
        range.end = tokens.size() - 1;
        return check_classified(stream, range, 0);
    }
    return {};
}

} // namespace tollgate::fuzz
