// SPDX-License-Identifier: MIT
// The raw lexer behind the lexical fallback: one pass over the bytes, no recursion, no includes.
#include "gate/lexer/raw_lexer.hpp"

#include "gate/lexer/source_lines.hpp"

#include <array>
#include <cstring>
#include <string_view>
#include <unordered_set>

namespace tollgate::lexer {

namespace {

// Keywords of both languages (clang 14 reports these as keywords in C11 with GNU extensions and
// in C++17 alike), then those of one language only.
constexpr std::string_view k_common_keywords[] = {"auto",
                                                  "break",
                                                  "case",
                                                  "char",
                                                  "const",
                                                  "continue",
                                                  "default",
                                                  "do",
                                                  "double",
                                                  "else",
                                                  "enum",
                                                  "extern",
                                                  "float",
                                                  "for",
                                                  "goto",
                                                  "if",
                                                  "inline",
                                                  "int",
                                                  "long",
                                                  "register",
                                                  "return",
                                                  "short",
                                                  "signed",
                                                  "sizeof",
                                                  "static",
                                                  "struct",
                                                  "switch",
                                                  "typedef",
                                                  "union",
                                                  "unsigned",
                                                  "void",
                                                  "volatile",
                                                  "while",
                                                  "asm",
                                                  "_Alignas",
                                                  "_Alignof",
                                                  "_Atomic",
                                                  "_Bool",
                                                  "_Complex",
                                                  "_Generic",
                                                  "_Imaginary",
                                                  "_Noreturn",
                                                  "_Static_assert",
                                                  "_Thread_local",
                                                  "__func__",
                                                  "__FUNCTION__",
                                                  "__PRETTY_FUNCTION__",
                                                  "__alignof",
                                                  "__alignof__",
                                                  "__asm",
                                                  "__asm__",
                                                  "__attribute",
                                                  "__attribute__",
                                                  "__builtin_offsetof",
                                                  "__builtin_va_arg",
                                                  "__builtin_choose_expr",
                                                  "__builtin_types_compatible_p",
                                                  "__complex",
                                                  "__complex__",
                                                  "__const",
                                                  "__const__",
                                                  "__extension__",
                                                  "__imag",
                                                  "__imag__",
                                                  "__inline",
                                                  "__inline__",
                                                  "__int128",
                                                  "__label__",
                                                  "__real",
                                                  "__real__",
                                                  "__restrict",
                                                  "__restrict__",
                                                  "__signed",
                                                  "__signed__",
                                                  "__thread",
                                                  "__typeof",
                                                  "__typeof__",
                                                  "__volatile",
                                                  "__volatile__",
                                                  "__auto_type",
                                                  "__float128",
                                                  "__fp16",
                                                  "_Float16",
                                                  "__bf16",
                                                  "__null",
                                                  "__decltype",
                                                  "__builtin_bit_cast",
                                                  "__builtin_convertvector",
                                                  "__private_extern__"};

constexpr std::string_view k_c_keywords[] = {"restrict", "typeof"};

constexpr std::string_view k_cxx_keywords[] = {
    "alignas", "alignof", "bool", "catch", "char16_t", "char32_t", "class", "const_cast",
    "constexpr", "decltype", "delete", "dynamic_cast", "explicit", "export", "false", "friend",
    "mutable", "namespace", "new", "noexcept", "nullptr", "operator", "private", "protected",
    "public", "reinterpret_cast", "static_assert", "static_cast", "template", "this",
    "thread_local", "throw", "true", "try", "typeid", "typename", "using", "virtual", "wchar_t",
    // Alternative operator spellings: clang reports them as keywords.
    "and", "and_eq", "bitand", "bitor", "compl", "not", "not_eq", "or", "or_eq", "xor", "xor_eq"};

// Punctuators by length, longest first within the lists that are tried in order.
constexpr std::string_view k_punctuators4[] = {"%:%:"};
constexpr std::string_view k_punctuators3[] = {"...", "<<=", ">>=", "->*"};
constexpr std::string_view k_punctuators2[] = {
    "->", "++", "--", "<<", ">>", "<=", ">=", "==", "!=", "&&", "||", "+=", "-=", "*=",
    "/=", "%=", "&=", "|=", "^=", "##", "::", ".*", "<:", ":>", "<%", "%>", "%:"};

const std::unordered_set<std::string_view>& keywords(Language language) {
    static const auto make = [](Language for_language) {
        std::unordered_set<std::string_view> set(std::begin(k_common_keywords),
                                                 std::end(k_common_keywords));
        if (for_language == Language::c) {
            set.insert(std::begin(k_c_keywords), std::end(k_c_keywords));
        } else {
            set.insert(std::begin(k_cxx_keywords), std::end(k_cxx_keywords));
        }
        return set;
    };
    static const auto c_set = make(Language::c);
    static const auto cxx_set = make(Language::cxx);
    return language == Language::c ? c_set : cxx_set;
}

bool is_identifier_start(unsigned char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_' || c == '$' || c >= 0x80;
}

bool is_identifier_char(unsigned char c) {
    return is_identifier_start(c) || (c >= '0' && c <= '9');
}

bool is_digit(unsigned char c) {
    return c >= '0' && c <= '9';
}

class RawLexer {
public:
    RawLexer(const std::string& content, Language language, std::size_t max_tokens)
        : m_text(content), m_language(language), m_keywords(keywords(language)),
          m_lines(line_starts(content)), m_max_tokens(max_tokens) {}

    RawTokens run() {
        while (skip_space_and_comments()) {
            if (m_result.tokens.size() >= m_max_tokens) {
                m_result.complete = false;
                break;
            }
            const std::size_t begin = m_at;
            const core::LexKind kind = lex_token();
            emit(begin, kind);
        }
        return std::move(m_result);
    }

private:
    // The byte at `at`, or 0 past the end.
    unsigned char at(std::size_t at) const {
        return at < m_text.size() ? static_cast<unsigned char>(m_text[at]) : 0;
    }

    // Length of a line splice (backslash, optional CR, newline) at `at`, else 0.
    std::size_t splice_at(std::size_t at) const {
        if (this->at(at) != '\\') {
            return 0;
        }
        if (this->at(at + 1) == '\n') {
            return 2;
        }
        if (this->at(at + 1) == '\r' && this->at(at + 2) == '\n') {
            return 3;
        }
        return 0;
    }

    // The byte at `at` with splices stepped over; `next` receives the index after it.
    unsigned char peek(std::size_t at, std::size_t* next = nullptr) const {
        while (std::size_t length = splice_at(at)) {
            at += length;
        }
        if (next != nullptr) {
            *next = at + 1;
        }
        return this->at(at);
    }

    // Skip blanks, splices and comments; return false at the end of the text.
    bool skip_space_and_comments() {
        while (m_at < m_text.size()) {
            const unsigned char c = at(m_at);
            if (c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' || c == '\v') {
                ++m_at;
            } else if (std::size_t length = splice_at(m_at)) {
                m_at += length;
            } else if (c == '/' && at(m_at + 1) == '/') {
                // A line comment ends at a newline that is not spliced.
                m_at += 2;
                while (m_at < m_text.size() && at(m_at) != '\n') {
                    m_at += std::max<std::size_t>(1, splice_at(m_at));
                }
            } else if (c == '/' && at(m_at + 1) == '*') {
                const std::size_t end = m_text.find("*/", m_at + 2);
                m_at = end == std::string::npos ? m_text.size() : end + 2;
            } else {
                return true;
            }
        }
        return false;
    }

    core::LexKind lex_token() {
        const unsigned char c = at(m_at);
        if (is_identifier_start(c) || (c == '\\' && (at(m_at + 1) == 'u' || at(m_at + 1) == 'U'))) {
            return lex_word();
        }
        if (is_digit(c) || (c == '.' && is_digit(peek(m_at + 1)))) {
            lex_number();
            return core::LexKind::literal;
        }
        if (c == '"' || c == '\'') {
            return lex_quoted(c);
        }
        lex_punctuator();
        return core::LexKind::punctuation;
    }

    core::LexKind lex_word() {
        const std::size_t begin = m_at;
        std::string word;
        for (;;) {
            std::size_t next = 0;
            const unsigned char c = peek(m_at, &next);
            if (is_identifier_char(c)) {
                word += static_cast<char>(c);
                m_at = next;
            } else if (c == '\\' && (peek(next) == 'u' || peek(next) == 'U')) {
                word += '\\';
                m_at = next; // a universal character name continues the identifier
            } else {
                break;
            }
        }
        if (m_at == begin) {
            ++m_at; // a lone backslash
            return core::LexKind::punctuation;
        }
        const unsigned char quote = peek(m_at);
        if ((quote == '"' || quote == '\'') && is_encoding_prefix(word, quote)) {
            return lex_quoted(quote, word.back() == 'R');
        }
        return m_keywords.count(word) != 0 ? core::LexKind::keyword : core::LexKind::identifier;
    }

    bool is_encoding_prefix(const std::string& word, unsigned char quote) const {
        const bool cxx = m_language == Language::cxx;
        if (word == "L" || word == "u" || word == "U") {
            return true;
        }
        if (word == "u8") {
            return quote == '"' || cxx;
        }
        return cxx && quote == '"' &&
               (word == "R" || word == "LR" || word == "uR" || word == "UR" || word == "u8R");
    }

    void lex_number() {
        for (;;) {
            std::size_t next = 0;
            const unsigned char c = peek(m_at, &next);
            if (is_identifier_char(c) || c == '.') {
                const bool exponent = c == 'e' || c == 'E' || c == 'p' || c == 'P';
                m_at = next;
                const unsigned char sign = peek(m_at, &next);
                if (exponent && (sign == '+' || sign == '-')) {
                    m_at = next;
                }
            } else if (c == '\'' && m_language == Language::cxx && is_identifier_char(peek(next))) {
                m_at = next; // a digit separator
            } else {
                return;
            }
        }
    }

    // Lex a character or string literal whose quote is at m_at (after any prefix).
    core::LexKind lex_quoted(unsigned char quote, bool raw = false) {
        std::size_t next = 0;
        peek(m_at, &next);
        m_at = next;
        if (raw) {
            return lex_raw_string();
        }
        bool first = true;
        for (;;) {
            const unsigned char c = peek(m_at, &next);
            if (next > m_text.size() || c == '\n') {
                return unterminated();
            }
            m_at = next;
            if (c == '\\') {
                if (peek(m_at, &next) == '\n' || next > m_text.size()) {
                    return unterminated();
                }
                m_at = next;
            } else if (c == quote) {
                if (quote == '\'' && first) {
                    return core::LexKind::punctuation; // '' is no character: clang's unknown token
                }
                break;
            }
            first = false;
        }
        user_suffix();
        return core::LexKind::literal;
    }

    core::LexKind lex_raw_string() {
        // R"delimiter( ... )delimiter"
        const std::size_t open = m_text.find('(', m_at);
        const std::size_t newline = m_text.find('\n', m_at);
        if (open == std::string::npos || open - m_at > 16 ||
            (newline != std::string::npos && newline < open)) {
            return unterminated();
        }
        const std::string closing = ")" + m_text.substr(m_at, open - m_at) + "\"";
        const std::size_t end = m_text.find(closing, open + 1);
        if (end == std::string::npos) {
            m_at = m_text.size();
            return core::LexKind::punctuation;
        }
        m_at = end + closing.size();
        user_suffix();
        return core::LexKind::literal;
    }

    // An unterminated literal: an unknown token up to the end of its line.
    core::LexKind unterminated() {
        while (m_at < m_text.size() && at(m_at) != '\n') {
            ++m_at;
        }
        if (m_at > 0 && at(m_at - 1) == '\r') {
            --m_at;
        }
        return core::LexKind::punctuation;
    }

    void user_suffix() {
        if (m_language != Language::cxx) {
            return;
        }
        std::size_t next = 0;
        while (is_identifier_char(peek(m_at, &next))) {
            m_at = next;
        }
    }

    void lex_punctuator() {
        // "<::" in C++ is "<" then "::" unless the next byte is ':' or '>'.
        if (m_language == Language::cxx && m_text.compare(m_at, 3, "<::") == 0 &&
            at(m_at + 3) != ':' && at(m_at + 3) != '>') {
            ++m_at;
            return;
        }
        const auto try_list = [this](const auto& list, std::size_t size) {
            for (std::string_view punctuator : list) {
                if (m_text.compare(m_at, size, punctuator.data(), size) == 0) {
                    if (!allowed(punctuator)) {
                        continue;
                    }
                    m_at += size;
                    return true;
                }
            }
            return false;
        };
        if (try_list(k_punctuators4, 4) || try_list(k_punctuators3, 3) ||
            try_list(k_punctuators2, 2)) {
            return;
        }
        ++m_at;
    }

    bool allowed(std::string_view punctuator) const {
        if (m_language == Language::cxx) {
            return true;
        }
        return punctuator != "::" && punctuator != ".*" && punctuator != "->*";
    }

    void emit(std::size_t begin, core::LexKind kind) {
        const unsigned line = line_of(m_lines, static_cast<unsigned>(begin));
        if (line <= m_directive_end) {
            return;
        }
        if (kind == core::LexKind::punctuation && line != m_previous_line && m_at == begin + 1 &&
            m_text[begin] == '#') {
            m_directive_end = line;
            while (continues(m_text, m_lines, m_directive_end)) {
                ++m_directive_end;
            }
            m_result.directives.push_back({m_result.tokens.size(), directive_kind(next_word())});
            m_previous_line = line;
            return;
        }
        m_previous_line = line;
        SourceToken token;
        token.kind = kind;
        token.spelling = m_text.substr(begin, m_at - begin);
        token.offset = static_cast<unsigned>(begin);
        token.line = line;
        m_result.tokens.push_back(std::move(token));
    }

    // The word after a directive's `#` (without consuming it).
    std::string next_word() const {
        std::size_t i = m_at;
        while (i < m_text.size() && (m_text[i] == ' ' || m_text[i] == '\t')) {
            ++i;
        }
        std::string word;
        while (i < m_text.size() && is_identifier_char(static_cast<unsigned char>(m_text[i]))) {
            word += m_text[i++];
        }
        return word;
    }

    const std::string& m_text;
    Language m_language;
    const std::unordered_set<std::string_view>& m_keywords;
    std::vector<unsigned> m_lines;
    std::size_t m_max_tokens;
    std::size_t m_at = 0;
    unsigned m_previous_line = 0;
    unsigned m_directive_end = 0;
    RawTokens m_result;
};

} // namespace

RawTokens tokenize_raw(const std::string& content, Language language, std::size_t max_tokens) {
    if (content.size() >= static_cast<std::size_t>(UINT32_MAX)) {
        RawTokens none; // offsets are 32-bit; such a file is not source code
        none.complete = false;
        return none;
    }
    return RawLexer(content, language, max_tokens).run();
}

} // namespace tollgate::lexer
