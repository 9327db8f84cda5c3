// SPDX-License-Identifier: MIT
// A declaration's first token: leading specifier macros belong to the function they precede.
#include "gate/lexer/leading_macros.hpp"

#include "gate/lexer/clang_handles.hpp"

#include <algorithm>

namespace tollgate::lexer {

namespace {

constexpr std::size_t k_npos = static_cast<std::size_t>(-1);

// Return the `(` that the `)` at `close` closes, walking back; k_npos when there is none.
std::size_t open_before(const std::vector<SourceToken>& tokens, std::size_t close) {
    int depth = 0;
    for (std::size_t i = close + 1; i-- > 0;) {
        if (is_punct(tokens[i], ")")) {
            ++depth;
        } else if (is_punct(tokens[i], "(")) {
            if (--depth == 0) {
                return i;
            }
        } else if (is_punct(tokens[i], ";") || is_punct(tokens[i], "{") ||
                   is_punct(tokens[i], "}")) {
            return k_npos;
        }
    }
    return k_npos;
}

// Return true when the macro definition `definition` can only stand inside a declaration: its
// replacement holds no `;`, `{` or `}`.
bool specifier_like(CXCursor definition) {
    const CXTranslationUnit unit = clang_Cursor_getTranslationUnit(definition);
    if (unit == nullptr) {
        return false;
    }
    TokenArray tokens(unit, clang_getCursorExtent(definition));
    for (unsigned i = 0; i < tokens.size(); ++i) {
        if (clang_getTokenKind(tokens.data()[i]) != CXToken_Punctuation) {
            continue;
        }
        const std::string spelling = take_string(clang_getTokenSpelling(unit, tokens.data()[i]));
        if (spelling == ";" || spelling == "{" || spelling == "}") {
            return false;
        }
    }
    return true;
}

bool directive_before(const std::vector<DirectiveMark>& directives, std::size_t index) {
    return std::any_of(directives.begin(), directives.end(),
                       [index](const DirectiveMark& mark) { return mark.before == index; });
}

} // namespace

std::size_t leading_macro_start(const std::vector<SourceToken>& tokens,
                                const std::vector<CXCursor>& cursors,
                                const std::vector<DirectiveMark>& directives, std::size_t first) {
    std::size_t start = first;
    while (start > 0 && start <= tokens.size() && cursors.size() == tokens.size() &&
           !directive_before(directives, start)) {
        const std::size_t previous = start - 1;
        const bool with_arguments = is_punct(tokens[previous], ")");
        const std::size_t name = with_arguments ? open_before(tokens, previous) : previous;
        if (name == k_npos || (with_arguments && name == 0)) {
            break;
        }
        const std::size_t macro = with_arguments ? name - 1 : name;
        if (tokens[macro].kind != core::LexKind::identifier ||
            cursors[macro].kind != CXCursor_MacroExpansion ||
            (with_arguments && directive_before(directives, name))) {
            break;
        }
        const CXCursor definition = clang_getCursorReferenced(cursors[macro]);
        if (clang_Cursor_isNull(definition) ||
            (clang_Cursor_isMacroFunctionLike(definition) != 0) != with_arguments ||
            !specifier_like(definition)) {
            break;
        }
        start = macro;
    }
    return start;
}

} // namespace tollgate::lexer
