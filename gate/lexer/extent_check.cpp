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

// Return the `{` that the `}` at `close` closes, looking no further back than `first`.
std::size_t opening_brace(const std::vector<SourceToken>& tokens, std::size_t first,
                          std::size_t close) {
    int depth = 0;
    for (std::size_t i = close + 1; i-- > first;) {
        if (is_punct(tokens[i], "}")) {
            ++depth;
        } else if (is_punct(tokens[i], "{") && --depth == 0) {
            return i;
        }
    }
    return k_npos;
}

bool is_boundary(const SourceToken& token) {
    return is_punct(token, ";") || is_punct(token, "{") || is_punct(token, "}");
}

} // namespace

ExtentCheck check_extent(const std::vector<SourceToken>& tokens, TokenRange parsed,
                         std::size_t name, const std::vector<LexicalDefinition>& definitions,
                         const std::vector<SkippedRange>& skipped) {
    ExtentCheck check;
    if (parsed.last >= tokens.size() || !is_punct(tokens[parsed.last], "}")) {
        return check; // the end is a macro's: braces cannot judge it
    }
    const auto swallows = [&](std::size_t from, std::size_t to) {
        return std::any_of(tokens.begin() + static_cast<long>(from),
                           tokens.begin() + static_cast<long>(to), is_boundary);
    };
    const std::size_t open = opening_brace(tokens, parsed.first, parsed.last);
    if (open != k_npos && open > parsed.first && is_punct(tokens[open - 1], "=")) {
        // "= { ... }" is an initializer: no function has such a body.
        check.verdict = ExtentVerdict::phantom;
        check.braces = {k_npos, k_npos};
        return check;
    }
    const LexicalDefinition* definition = same_function(parsed, name, definitions);
    if (definition == nullptr) {
        for (const LexicalDefinition& other : definitions) {
            if (other.body_close == parsed.last && other.first > parsed.first &&
                swallows(parsed.first, other.first)) {
                check.verdict = ExtentVerdict::phantom;
                check.braces = {other.first, other.body_close};
                break;
            }
        }
        return check;
    }
    if (definition->body_close >= tokens.size() ||
        inside_skipped(skipped, tokens[definition->body_close].offset,
                       tokens[definition->body_close].offset)) {
        return check;
    }
    bool ends_agree = definition->body_close == parsed.last;
    if (!ends_agree && parsed.last > definition->body_close &&
        definition->body_close + 1 < tokens.size() &&
        is_keyword(tokens[definition->body_close + 1], "catch")) {
        ends_agree = true; // a function-try-block: its handlers follow the body
    }
    const bool starts_agree =
        parsed.first >= definition->first || !swallows(parsed.first, definition->first);
    if (ends_agree && starts_agree) {
        return check;
    }
    check.verdict = ExtentVerdict::braces;
    check.braces.first = starts_agree ? parsed.first : definition->first;
    check.braces.last = definition->body_close;
    if (check.braces.first > check.braces.last) {
        check.braces.first = definition->first;
    }
    return check;
}

void BraceExtentNotes::add(const std::string& name, unsigned line) {
    if (m_corrected++ + m_phantoms == 0) {
        m_first_name = name;
        m_first_line = line;
    }
}

void BraceExtentNotes::add_phantom(const std::string& name, unsigned line) {
    if (m_corrected + m_phantoms++ == 0) {
        m_first_name = name;
        m_first_line = line;
    }
}

void BraceExtentNotes::warn(const std::string& path, std::vector<LexWarning>& warnings) const {
    const std::size_t count = m_corrected + m_phantoms;
    if (count == 0) {
        return;
    }
    std::string message =
        count == 1 ? "the extent of function \"" + m_first_name + "\""
                   : std::to_string(count) + " function extents (first \"" + m_first_name + "\")";
    message += " disagreed with brace matching of the source:";
    if (m_corrected > 0) {
        message += " " + std::to_string(m_corrected) + " brace-matched extent" +
                   (m_corrected == 1 ? "" : "s") + " taken";
    }
    if (m_phantoms > 0) {
        message += std::string(m_corrected > 0 ? "," : "") + " " + std::to_string(m_phantoms) +
                   " function" + (m_phantoms == 1 ? "" : "s") +
                   " without a body of its own left out";
    }
    warnings.push_back({path, m_first_line,
                        message + " (the parse is unreliable here: check the headers and macros "
                                  "it needs)"});
}

} // namespace tollgate::lexer
