// SPDX-License-Identifier: MIT
// Honest extents: a parsed function's token range checked against brace matching.
#include "gate/lexer/extent_check.hpp"

#include <algorithm>

namespace tollgate::lexer {

namespace {

constexpr std::size_t k_npos = static_cast<std::size_t>(-1);

// Return the definition among `definitions` that is the parsed function `parsed`: the one with
// the same name token, or (the name not being in the file) one that starts or ends where it does.
const LexicalDefinition* same_function(TokenRange parsed, std::size_t name,
                                       const std::vector<LexicalDefinition>& definitions) {
    for (const LexicalDefinition& definition : definitions) {
        if (name != k_npos) {
            if (definition.name == name) {
                return &definition;
            }
        } else if (definition.first == parsed.first || definition.body_close == parsed.last) {
            return &definition;
        }
    }
    return nullptr;
}

bool is_boundary(const SourceToken& token) {
    return is_punct(token, ";") || is_punct(token, "{") || is_punct(token, "}");
}

} // namespace

std::optional<TokenRange> check_extent(const std::vector<SourceToken>& tokens, TokenRange parsed,
                                       std::size_t name,
                                       const std::vector<LexicalDefinition>& definitions) {
    if (parsed.last >= tokens.size() || !is_punct(tokens[parsed.last], "}")) {
        return std::nullopt; // the end is a macro's: braces cannot judge it
    }
    const LexicalDefinition* definition = same_function(parsed, name, definitions);
    if (definition == nullptr || definition->body_close >= tokens.size()) {
        return std::nullopt;
    }
    bool ends_agree = definition->body_close == parsed.last;
    if (!ends_agree && parsed.last > definition->body_close &&
        definition->body_close + 1 < tokens.size() &&
        is_keyword(tokens[definition->body_close + 1], "catch")) {
        ends_agree = true; // a function-try-block: its handlers follow the body
    }
    bool starts_agree = true;
    if (parsed.first < definition->first) {
        starts_agree =
            std::none_of(tokens.begin() + static_cast<long>(parsed.first),
                         tokens.begin() + static_cast<long>(definition->first), is_boundary);
    }
    if (ends_agree && starts_agree) {
        return std::nullopt;
    }
    TokenRange braces;
    braces.first = starts_agree ? parsed.first : definition->first;
    braces.last = definition->body_close;
    if (braces.first > braces.last) {
        braces.first = definition->first;
    }
    return braces;
}

void BraceExtentNotes::add(const std::string& name, unsigned line) {
    if (m_count++ == 0) {
        m_first_name = name;
        m_first_line = line;
    }
}

void BraceExtentNotes::warn(const std::string& path, std::vector<LexWarning>& warnings) const {
    if (m_count == 0) {
        return;
    }
    const std::string subject =
        m_count == 1 ? "the extent of function \"" + m_first_name + "\" disagreed"
                     : std::to_string(m_count) + " function extents disagreed (first \"" +
                           m_first_name + "\")";
    warnings.push_back({path, m_first_line,
                        subject + " with brace matching of the source: the brace-matched " +
                            (m_count == 1 ? "extent was" : "extents were") +
                            " taken (the parse is unreliable here: check the headers and macros "
                            "it needs)"});
}

} // namespace tollgate::lexer
