// SPDX-License-Identifier: MIT
// Names a reviewer can read: test-macro functions and operator names as written.
#include "gate/lexer/macro_names.hpp"

#include "gate/lexer/clang_handles.hpp"
#include "gate/lexer/lexical_scan.hpp"

namespace tollgate::lexer {

namespace {

bool is_word(const SourceToken& token) {
    return token.kind != core::LexKind::punctuation;
}

constexpr std::size_t k_npos = static_cast<std::size_t>(-1);

// Return the names of the namespaces enclosing `cursor`, each followed by "::".
std::string namespace_prefix(CXCursor cursor) {
    std::string prefix;
    for (CXCursor parent = clang_getCursorSemanticParent(cursor);
         !clang_Cursor_isNull(parent) && parent.kind != CXCursor_TranslationUnit &&
         !clang_isInvalid(parent.kind);
         parent = clang_getCursorSemanticParent(parent)) {
        if (parent.kind == CXCursor_Namespace) {
            std::string part = take_string(clang_getCursorSpelling(parent));
            prefix = (part.empty() ? std::string("(anonymous namespace)") : part) + "::" + prefix;
        }
    }
    return prefix;
}

// Return the conversion operator's name as written from its `operator` keyword, or nothing.
std::optional<std::string> conversion_text(const std::vector<SourceToken>& tokens,
                                           std::size_t first, std::size_t last) {
    for (std::size_t i = first; i <= last && i < tokens.size(); ++i) {
        if (!is_keyword(tokens[i], "operator")) {
            continue;
        }
        for (std::size_t j = i + 1; j <= last && j < tokens.size(); ++j) {
            if (is_punct(tokens[j], "(")) {
                return join_written(tokens, i, j);
            }
            if (is_punct(tokens[j], "<")) {
                j = match_bracket(tokens, j);
            }
        }
        return std::nullopt;
    }
    return std::nullopt;
}

} // namespace

ReadableName readable_name(CXCursor cursor, const std::string& qualified,
                           const std::vector<SourceToken>& tokens, std::size_t first,
                           std::size_t last, std::size_t name) {
    const std::string spelling = take_string(clang_getCursorSpelling(cursor));
    if (cursor.kind == CXCursor_ConversionFunction ||
        (cursor.kind == CXCursor_FunctionTemplate &&
         clang_getTemplateCursorKind(cursor) == CXCursor_ConversionFunction)) {
        const auto written = conversion_text(tokens, first, last);
        if (written && qualified.size() >= spelling.size() &&
            qualified.compare(qualified.size() - spelling.size(), spelling.size(), spelling) == 0) {
            return {qualified.substr(0, qualified.size() - spelling.size()) + *written, false};
        }
        return {qualified, false};
    }
    // A name token spelled otherwise than the function is a macro's argument or the macro.
    const bool renamed =
        name == k_npos || (name < tokens.size() && tokens[name].spelling != spelling);
    const bool unknown_macro = name == first && is_macro_style_name(spelling);
    if (renamed || unknown_macro) {
        if (const auto invocation = macro_invocation_name(tokens, first)) {
            return {namespace_prefix(cursor) + *invocation, true};
        }
    }
    return {qualified, false};
}

std::string join_written(const std::vector<SourceToken>& tokens, std::size_t begin,
                         std::size_t end) {
    std::string text;
    for (std::size_t i = begin; i < end && i < tokens.size(); ++i) {
        if (i > begin && is_word(tokens[i]) && is_word(tokens[i - 1])) {
            text += ' ';
        }
        text += tokens[i].spelling;
        if (is_punct(tokens[i], ",") && i + 1 < end) {
            text += ' ';
        }
    }
    return text;
}

std::optional<std::string> macro_invocation_name(const std::vector<SourceToken>& tokens,
                                                 std::size_t first) {
    if (first + 1 >= tokens.size() || tokens[first].kind != core::LexKind::identifier ||
        !is_punct(tokens[first + 1], "(")) {
        return std::nullopt;
    }
    const std::size_t close = match_bracket(tokens, first + 1);
    if (close + 1 >= tokens.size() || !is_punct(tokens[close + 1], "{")) {
        return std::nullopt;
    }
    return join_written(tokens, first, close + 1);
}

bool is_macro_style_name(const std::string& spelling) {
    std::size_t letters = 0;
    for (const char c : spelling) {
        if (c >= 'A' && c <= 'Z') {
            ++letters;
        } else if (!(c >= '0' && c <= '9') && c != '_') {
            return false;
        }
    }
    return letters >= 2;
}

} // namespace tollgate::lexer
