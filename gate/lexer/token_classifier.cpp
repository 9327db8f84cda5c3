// SPDX-License-Identifier: MIT
// From annotated source tokens to counted tokens under the counting convention.
#include "gate/lexer/token_classifier.hpp"

#include "gate/lexer/angle_lists.hpp"
#include "gate/lexer/lexical_scan.hpp"

#include <array>
#include <string_view>

namespace tollgate::lexer {

namespace {

using core::Basis;
using core::Form;
using core::LexKind;
using core::NameKind;
using core::RawToken;

constexpr std::size_t k_npos = static_cast<std::size_t>(-1);

bool is_one_of(const std::string& spelling, std::initializer_list<std::string_view> words) {
    for (auto word : words) {
        if (spelling == word) {
            return true;
        }
    }
    return false;
}

bool is_type_keyword(const SourceToken& token) {
    return token.kind == LexKind::keyword &&
           is_one_of(token.spelling,
                     {"void",     "char",     "short",    "int",        "long",        "float",
                      "double",   "signed",   "unsigned", "bool",       "_Bool",       "auto",
                      "const",    "volatile", "wchar_t",  "char8_t",    "char16_t",    "char32_t",
                      "__int128", "_Complex", "restrict", "__restrict", "__restrict__"});
}

bool is_cast_keyword(const SourceToken& token) {
    return token.kind == LexKind::keyword &&
           is_one_of(token.spelling,
                     {"static_cast", "dynamic_cast", "reinterpret_cast", "const_cast"});
}

// Keywords after which + - * & start an operand rather than continue an expression.
bool is_expression_start_keyword(const SourceToken& token) {
    return token.kind == LexKind::keyword &&
           is_one_of(token.spelling, {"return", "case", "throw", "co_return", "co_yield",
                                      "co_await", "else", "do", "sizeof", "delete", "new",
                                      "alignof", "_Alignof", "goto", "typeof", "decltype"});
}

bool is_function_kind(CXCursorKind kind) {
    return kind == CXCursor_FunctionDecl || kind == CXCursor_CXXMethod ||
           kind == CXCursor_FunctionTemplate || kind == CXCursor_Constructor ||
           kind == CXCursor_Destructor || kind == CXCursor_ConversionFunction;
}

bool is_value_kind(CXCursorKind kind) {
    return kind == CXCursor_VarDecl || kind == CXCursor_ParmDecl || kind == CXCursor_FieldDecl ||
           kind == CXCursor_EnumConstantDecl || kind == CXCursor_NonTypeTemplateParameter ||
           kind == CXCursor_LabelStmt || kind == CXCursor_LabelRef ||
           kind == CXCursor_VariableRef || kind == CXCursor_MemberRef;
}

bool is_type_kind(CXCursorKind kind) {
    return kind == CXCursor_TypeRef || kind == CXCursor_TemplateRef || kind == CXCursor_ClassDecl ||
           kind == CXCursor_StructDecl || kind == CXCursor_UnionDecl || kind == CXCursor_EnumDecl ||
           kind == CXCursor_ClassTemplate || kind == CXCursor_ClassTemplatePartialSpecialization ||
           kind == CXCursor_TypedefDecl || kind == CXCursor_TypeAliasDecl ||
           kind == CXCursor_TypeAliasTemplateDecl || kind == CXCursor_TemplateTypeParameter ||
           kind == CXCursor_TemplateTemplateParameter || kind == CXCursor_CXXBaseSpecifier;
}

bool is_namespace_kind(CXCursorKind kind) {
    return kind == CXCursor_NamespaceRef || kind == CXCursor_Namespace ||
           kind == CXCursor_NamespaceAlias;
}

// Cursor kinds that hold a declarator: a * & && annotated with one of them is a declarator.
bool is_declarator_context(CXCursorKind kind) {
    return kind == CXCursor_VarDecl || kind == CXCursor_ParmDecl || kind == CXCursor_FieldDecl ||
           is_function_kind(kind) || kind == CXCursor_TypedefDecl ||
           kind == CXCursor_TypeAliasDecl || kind == CXCursor_TypeRef ||
           kind == CXCursor_TemplateRef || kind == CXCursor_NonTypeTemplateParameter ||
           kind == CXCursor_TemplateTypeParameter;
}

unsigned spelling_offset(CXSourceLocation location) {
    unsigned offset = 0;
    clang_getSpellingLocation(location, nullptr, nullptr, nullptr, &offset);
    return offset;
}

// Classification of one function's tokens, in order, with the state pairs need.
class Classifier {
public:
    Classifier(const std::vector<SourceToken>& tokens, const std::vector<CXCursor>* cursors,
               const ClassifyRange& range)
        : m_tokens(tokens), m_cursors(cursors), m_range(range),
          m_fallback(cursors != nullptr ? Basis::previous_token : Basis::lexical),
          m_name_fallback(cursors != nullptr ? Basis::next_token : Basis::lexical),
          m_angles(tokens, range.begin, range.end) {}

    std::vector<RawToken> run() {
        std::vector<RawToken> result;
        if (m_range.end < m_range.begin || m_range.end >= m_tokens.size()) {
            return result;
        }
        result.reserve(m_range.end - m_range.begin + 1);
        for (std::size_t i = m_range.begin; i <= m_range.end; ++i) {
            result.push_back(describe(i, result));
        }
        return result;
    }

private:
    const std::vector<SourceToken>& m_tokens;
    const std::vector<CXCursor>* m_cursors;
    ClassifyRange m_range;
    Basis m_fallback;
    Basis m_name_fallback;
    int m_depth = 0;                       // ( [ { nesting inside the function
    std::vector<int> m_template_depths;    // depth of each open template argument list
    std::vector<int> m_conditional_depths; // depth of each `?` waiting for its `:`
    AngleLists m_angles;                   // which `<` open template argument lists

    const SourceToken* token_at(std::size_t i) const {
        return i < m_tokens.size() ? &m_tokens[i] : nullptr;
    }
    const SourceToken* previous(std::size_t i) const {
        return i > m_range.begin ? &m_tokens[i - 1] : nullptr;
    }
    const SourceToken* next(std::size_t i) const {
        return i < m_range.end ? &m_tokens[i + 1] : nullptr;
    }
    CXCursor cursor(std::size_t i) const {
        return m_cursors != nullptr ? (*m_cursors)[i] : clang_getNullCursor();
    }
    CXCursorKind cursor_kind(std::size_t i) const {
        return m_cursors != nullptr ? (*m_cursors)[i].kind : CXCursor_UnexposedDecl;
    }

    RawToken describe(std::size_t i, const std::vector<RawToken>& done) {
        const SourceToken& token = m_tokens[i];
        RawToken raw;
        raw.spelling = token.spelling;
        raw.kind = token.kind;
        raw.line = token.line;
        switch (token.kind) {
        case LexKind::identifier:
            name_of(i, raw);
            break;
        case LexKind::punctuation:
            form_of(i, raw, done);
            break;
        case LexKind::keyword:
        case LexKind::literal:
            break;
        }
        return raw;
    }

    // What an identifier names.
    void name_of(std::size_t i, RawToken& raw) const {
        if (i == m_range.defined_name) {
            raw.name = NameKind::defined;
            raw.basis = m_cursors != nullptr ? Basis::syntax_tree : Basis::lexical;
            return;
        }
        if (m_cursors != nullptr && name_from_tree(i, raw)) {
            raw.basis = Basis::syntax_tree;
            return;
        }
        name_from_neighbours(i, raw);
    }

    bool name_from_tree(std::size_t i, RawToken& raw) const {
        const CXCursor c = cursor(i);
        const CXCursorKind kind = c.kind;
        if (kind == CXCursor_MacroExpansion) {
            const CXCursor definition = clang_getCursorReferenced(c);
            if (clang_Cursor_isNull(definition)) {
                return false;
            }
            raw.name = clang_Cursor_isMacroFunctionLike(definition) ? NameKind::macro_function
                                                                    : NameKind::value;
            return true;
        }
        if (is_type_kind(kind)) {
            raw.name = NameKind::type;
            return true;
        }
        if (is_namespace_kind(kind)) {
            raw.name = NameKind::namespace_name;
            return true;
        }
        if (kind == CXCursor_OverloadedDeclRef) {
            raw.name = NameKind::function;
            return true;
        }
        if (kind == CXCursor_DeclRefExpr || kind == CXCursor_MemberRefExpr ||
            kind == CXCursor_CallExpr || kind == CXCursor_MemberRef ||
            kind == CXCursor_VariableRef || kind == CXCursor_LabelRef) {
            const CXCursor target = clang_getCursorReferenced(c);
            if (clang_Cursor_isNull(target)) {
                return false;
            }
            if (kind == CXCursor_CallExpr && take_name(target) != m_tokens[i].spelling) {
                return false; // an argument token of a call with no cursor of its own
            }
            return name_from_kind(clang_getCursorKind(target), raw);
        }
        if (is_value_kind(kind) || is_function_kind(kind)) {
            // A declaration's own name: the token sits at the cursor's location.
            if (spelling_offset(clang_getCursorLocation(c)) != m_tokens[i].offset) {
                return false;
            }
            raw.name = is_function_kind(kind) ? NameKind::function : NameKind::value;
            return true;
        }
        return false;
    }

    static std::string take_name(CXCursor target) {
        CXString text = clang_getCursorSpelling(target);
        const char* chars = clang_getCString(text);
        std::string name = chars != nullptr ? chars : "";
        clang_disposeString(text);
        return name;
    }

    static bool name_from_kind(CXCursorKind kind, RawToken& raw) {
        if (is_function_kind(kind)) {
            raw.name = NameKind::function;
            return true;
        }
        if (is_value_kind(kind)) {
            raw.name = NameKind::value;
            return true;
        }
        if (is_type_kind(kind)) {
            raw.name = NameKind::type;
            return true;
        }
        if (is_namespace_kind(kind)) {
            raw.name = NameKind::namespace_name;
            return true;
        }
        return false;
    }

    // A name the tree did not explain: called if `(` follows, a type if `::`, a name or a
    // template list follows, else a value.
    void name_from_neighbours(std::size_t i, RawToken& raw) const {
        raw.basis = m_name_fallback;
        const SourceToken* after = next(i);
        if (after == nullptr) {
            raw.name = NameKind::value;
            return;
        }
        if (is_punct(*after, "(")) {
            raw.name = NameKind::function;
        } else if (is_punct(*after, "::") || after->kind == LexKind::identifier ||
                   (is_punct(*after, "<") && looks_like_template_list(i + 1))) {
            raw.name = NameKind::type;
        } else {
            raw.name = NameKind::value;
        }
    }

    // Return true when the `<` at `open` has a matching `>` before anything that cannot be
    // inside a template argument list.
    bool looks_like_template_list(std::size_t open) const {
        return m_angles.looks_like_template_list(open);
    }

    void form_of(std::size_t i, RawToken& raw, const std::vector<RawToken>& done) {
        const std::string& s = raw.spelling;
        if (s == "(" || s == "[" || s == "{") {
            ++m_depth;
            return;
        }
        if (s == ")" || s == "]" || s == "}") {
            --m_depth;
            while (!m_template_depths.empty() && m_template_depths.back() > m_depth) {
                m_template_depths.pop_back();
            }
            while (!m_conditional_depths.empty() && m_conditional_depths.back() > m_depth) {
                m_conditional_depths.pop_back();
            }
            raw.form = Form::pair_close;
            return;
        }
        if (s == "?") {
            m_conditional_depths.push_back(m_depth);
            return;
        }
        if (s == ":") {
            if (!m_conditional_depths.empty() && m_conditional_depths.back() == m_depth) {
                m_conditional_depths.pop_back();
                raw.form = Form::pair_close;
                raw.basis = cursor_kind(i) == CXCursor_ConditionalOperator ? Basis::syntax_tree
                                                                           : m_fallback;
            }
            return;
        }
        if (s == "<") {
            template_open_of(i, raw, done);
            return;
        }
        if (s == ">" || s == ">>") {
            const std::size_t closes = s == ">" ? 1 : 2;
            if (cursor_kind(i) == CXCursor_BinaryOperator ||
                cursor_kind(i) == CXCursor_CompoundAssignOperator) {
                return;
            }
            std::size_t closed = 0;
            while (closed < closes && !m_template_depths.empty() &&
                   m_template_depths.back() == m_depth) {
                m_template_depths.pop_back();
                ++closed;
            }
            if (closed > 0) {
                raw.form = Form::pair_close;
            }
            return;
        }
        if (s == "++" || s == "--") {
            increment_form(i, raw);
            return;
        }
        if (s == "*" || s == "&" || s == "&&" || s == "+" || s == "-") {
            star_form(i, raw, done);
        }
    }

    void template_open_of(std::size_t i, RawToken& raw, const std::vector<RawToken>& done) {
        const CXCursorKind kind = cursor_kind(i);
        if (m_cursors != nullptr &&
            (kind == CXCursor_BinaryOperator || kind == CXCursor_CompoundAssignOperator)) {
            raw.basis = Basis::syntax_tree;
            return;
        }
        const SourceToken* before = previous(i);
        if (before == nullptr) {
            return;
        }
        if (is_keyword(*before, "template") || is_cast_keyword(*before)) {
            open_template(raw, Basis::spelling);
            return;
        }
        if (before->kind != LexKind::identifier) {
            return;
        }
        const RawToken& name = done[i - 1 - m_range.begin];
        const bool after_template_keyword =
            i >= m_range.begin + 2 && is_keyword(m_tokens[i - 2], "template");
        if (name.basis == Basis::syntax_tree &&
            (name.name == NameKind::type || name.name == NameKind::function ||
             name.name == NameKind::defined)) {
            open_template(raw, Basis::syntax_tree);
            return;
        }
        if (after_template_keyword || looks_like_template_list(i)) {
            if (name.name == NameKind::value && name.basis == Basis::syntax_tree) {
                return; // a variable compared with something
            }
            open_template(raw, m_fallback);
        }
    }

    void open_template(RawToken& raw, Basis basis) {
        m_template_depths.push_back(m_depth);
        raw.form = Form::template_open;
        raw.basis = basis;
    }

    void increment_form(std::size_t i, RawToken& raw) const {
        if (cursor_kind(i) == CXCursor_UnaryOperator) {
            const CXSourceRange extent = clang_getCursorExtent(cursor(i));
            const bool starts = spelling_offset(clang_getRangeStart(extent)) == m_tokens[i].offset;
            raw.form = starts ? Form::prefix : Form::postfix;
            raw.basis = Basis::syntax_tree;
            return;
        }
        const SourceToken* before = previous(i);
        const bool postfix =
            before != nullptr &&
            (before->kind == LexKind::identifier || before->kind == LexKind::literal ||
             is_punct(*before, ")") || is_punct(*before, "]") || is_keyword(*before, "this"));
        raw.form = postfix ? Form::postfix : Form::prefix;
        raw.basis = m_fallback;
    }

    void star_form(std::size_t i, RawToken& raw, const std::vector<RawToken>& done) const {
        const std::string& s = raw.spelling;
        const bool declarator_spelling = s == "*" || s == "&" || s == "&&";
        if (m_cursors != nullptr) {
            const CXCursorKind kind = cursor_kind(i);
            if (kind == CXCursor_UnaryOperator) {
                raw.form = Form::unary;
                raw.basis = Basis::syntax_tree;
                return;
            }
            if (kind == CXCursor_BinaryOperator || kind == CXCursor_CompoundAssignOperator) {
                raw.form = Form::binary;
                raw.basis = Basis::syntax_tree;
                return;
            }
            if (declarator_spelling && is_declarator_context(kind)) {
                raw.form = Form::declarator;
                raw.basis = Basis::syntax_tree;
                return;
            }
            if (s == "&" && kind == CXCursor_LambdaExpr) {
                raw.form = Form::declarator; // capture by reference
                raw.basis = Basis::syntax_tree;
                return;
            }
        }
        raw.basis = m_fallback;
        const SourceToken* before = previous(i);
        if (declarator_spelling && before != nullptr && follows_type(i, done)) {
            raw.form = Form::declarator;
            return;
        }
        const bool unary = before == nullptr || is_expression_start_keyword(*before) ||
                           (before->kind == LexKind::punctuation && !is_punct(*before, ")") &&
                            !is_punct(*before, "]") && !is_punct(*before, "}") &&
                            done[i - 1 - m_range.begin].form != Form::pair_close &&
                            done[i - 1 - m_range.begin].form != Form::postfix);
        if (s == "&&" && !unary) {
            return; // logical and
        }
        raw.form = unary ? Form::unary : Form::binary;
    }

    // Return true when the token before `i` ends a type: a type keyword, a type name, the `>` of
    // a template argument list, another declarator, or (lexically) `Name * name =`.
    bool follows_type(std::size_t i, const std::vector<RawToken>& done) const {
        const SourceToken& before = m_tokens[i - 1];
        const RawToken& described = done[i - 1 - m_range.begin];
        if (is_type_keyword(before)) {
            return true;
        }
        if (described.form == Form::declarator) {
            return true;
        }
        if ((is_punct(before, ">") || is_punct(before, ">>")) &&
            described.form == Form::pair_close) {
            return true;
        }
        if (before.kind != LexKind::identifier) {
            return false;
        }
        if (described.name == NameKind::type && described.basis == Basis::syntax_tree) {
            return true;
        }
        // `Name * name` at the start of a statement or parameter, followed by = ; , ) [ (
        const SourceToken* start = i >= m_range.begin + 2 ? &m_tokens[i - 2] : nullptr;
        const bool at_start = start == nullptr || is_punct(*start, ";") || is_punct(*start, "{") ||
                              is_punct(*start, "}") || is_punct(*start, "(") ||
                              is_punct(*start, ",") || is_punct(*start, "::") ||
                              start->kind == LexKind::keyword;
        const SourceToken* name = next(i);
        const SourceToken* after = i + 1 < m_range.end ? &m_tokens[i + 2] : nullptr;
        return at_start && name != nullptr && name->kind == LexKind::identifier &&
               after != nullptr &&
               (is_punct(*after, "=") || is_punct(*after, ";") || is_punct(*after, ",") ||
                is_punct(*after, ")") || is_punct(*after, "[") || is_punct(*after, "(") ||
                is_punct(*after, "{"));
    }
};

} // namespace

std::vector<core::RawToken> describe_tokens(const std::vector<SourceToken>& tokens,
                                            const std::vector<CXCursor>* cursors,
                                            const ClassifyRange& range) {
    return Classifier(tokens, cursors, range).run();
}

core::TokenList classify_tokens(const std::vector<SourceToken>& tokens,
                                const std::vector<CXCursor>* cursors, const ClassifyRange& range,
                                const core::Convention& convention) {
    core::TokenList result;
    for (const RawToken& raw : describe_tokens(tokens, cursors, range)) {
        if (auto token = core::classify_token(raw, convention)) {
            result.push_back(std::move(*token));
        }
    }
    return result;
}

} // namespace tollgate::lexer
