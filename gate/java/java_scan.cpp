// SPDX-License-Identifier: MIT
// The Java lexical scanner: the tokens of a Java file without a syntax tree.
#include "gate/java/java_scan.hpp"

#include "tollgate/core/classify_java.hpp"

#include <array>
#include <cstdint>
#include <string_view>

namespace tollgate::java {

namespace {

// Operators and separators, longest first so the first match is the longest (JLS 17, 3.11-3.12).
constexpr std::array<std::string_view, 52> k_operators = {
    ">>>=", "<<=", ">>=", ">>>", "...", "->", "::", "++", "--", "&&", "||", "==", "!=",
    "<=",   ">=",  "+=",  "-=",  "*=",  "/=", "&=", "|=", "^=", "%=", "<<", ">>", "(",
    ")",    "{",   "}",   "[",   "]",   ";",  ",",  ".",  "@",  "=",  ">",  "<",  "!",
    "~",    "?",   ":",   "+",   "-",   "*",  "/",  "&",  "|",  "^",  "%",  "\\", "#",
};

bool is_identifier_start(unsigned char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_' || c == '$' || c >= 0x80;
}

bool is_identifier_part(unsigned char c) {
    return is_identifier_start(c) || (c >= '0' && c <= '9');
}

bool is_digit(unsigned char c) {
    return c >= '0' && c <= '9';
}

class Scanner {
public:
    explicit Scanner(const std::string& content) : m_text(content) {}

    JavaScan run() {
        while (m_at < m_text.size()) {
            const unsigned char c = byte(m_at);
            if (c == '\n') {
                ++m_line;
                ++m_at;
            } else if (c == ' ' || c == '\t' || c == '\r' || c == '\f' || c == '\v') {
                ++m_at;
            } else if (c == '/' && byte(m_at + 1) == '/') {
                while (m_at < m_text.size() && m_text[m_at] != '\n') {
                    ++m_at;
                }
            } else if (c == '/' && byte(m_at + 1) == '*') {
                block_comment();
            } else if (is_identifier_start(c)) {
                word();
            } else if (is_digit(c) || (c == '.' && is_digit(byte(m_at + 1)))) {
                number();
            } else if (c == '"') {
                string_literal();
            } else if (c == '\'') {
                quoted('\'', "unterminated character literal");
            } else {
                punctuation();
            }
        }
        return std::move(m_result);
    }

private:
    unsigned char byte(std::size_t at) const {
        return at < m_text.size() ? static_cast<unsigned char>(m_text[at]) : 0;
    }

    void emit(core::LexKind kind, std::size_t begin, unsigned line) {
        m_result.tokens.push_back(
            {kind, m_text.substr(begin, m_at - begin), static_cast<unsigned>(begin), line});
    }

    void problem(unsigned line, const char* message) {
        m_result.problems.push_back({line, message});
    }

    void block_comment() {
        const unsigned line = m_line;
        m_at += 2;
        while (m_at < m_text.size() && !(m_text[m_at] == '*' && byte(m_at + 1) == '/')) {
            m_line += m_text[m_at] == '\n' ? 1 : 0;
            ++m_at;
        }
        if (m_at >= m_text.size()) {
            problem(line, "unterminated comment");
            return;
        }
        m_at += 2;
    }

    void word() {
        const std::size_t begin = m_at;
        while (is_identifier_part(byte(m_at))) {
            ++m_at;
        }
        // non-sealed is one keyword spelled with a hyphen.
        if (std::string_view(m_text).substr(begin, m_at - begin) == "non" &&
            std::string_view(m_text).substr(m_at, 7) == "-sealed" &&
            !is_identifier_part(byte(m_at + 7))) {
            m_at += 7;
        }
        const bool keyword = core::is_java_keyword(m_text.substr(begin, m_at - begin));
        emit(keyword ? core::LexKind::keyword : core::LexKind::identifier, begin, m_line);
    }

    void number() {
        const std::size_t begin = m_at;
        const bool hex = byte(m_at) == '0' && (byte(m_at + 1) == 'x' || byte(m_at + 1) == 'X');
        while (m_at < m_text.size()) {
            const unsigned char c = byte(m_at);
            const bool exponent = hex ? (c == 'p' || c == 'P') : (c == 'e' || c == 'E');
            if (exponent && (byte(m_at + 1) == '+' || byte(m_at + 1) == '-')) {
                m_at += 2;
            } else if (is_identifier_part(c) && c < 0x80) {
                ++m_at;
            } else if (c == '.' && byte(m_at + 1) != '.') {
                ++m_at;
            } else {
                break;
            }
        }
        emit(core::LexKind::literal, begin, m_line);
    }

    // A quoted literal on one line; a backslash escapes the next byte.
    void quoted(char quote, const char* unterminated) {
        const std::size_t begin = m_at;
        const unsigned line = m_line;
        ++m_at;
        while (m_at < m_text.size() && m_text[m_at] != quote && m_text[m_at] != '\n') {
            m_at += m_text[m_at] == '\\' && byte(m_at + 1) != '\n' ? 2 : 1;
        }
        if (m_at < m_text.size() && m_text[m_at] == quote) {
            ++m_at;
        } else {
            problem(line, unterminated);
        }
        if (m_at > m_text.size()) {
            m_at = m_text.size();
        }
        emit(core::LexKind::literal, begin, line);
    }

    void string_literal() {
        if (std::string_view(m_text).substr(m_at, 3) != "\"\"\"") {
            quoted('"', "unterminated string literal");
            return;
        }
        // A text block runs to the next unescaped """.
        const std::size_t begin = m_at;
        const unsigned line = m_line;
        m_at += 3;
        while (m_at < m_text.size() && std::string_view(m_text).substr(m_at, 3) != "\"\"\"") {
            if (m_text[m_at] == '\\' && m_at + 1 < m_text.size()) {
                ++m_at;
            }
            m_line += m_text[m_at] == '\n' ? 1 : 0;
            ++m_at;
        }
        if (m_at < m_text.size()) {
            m_at += 3;
        } else {
            problem(line, "unterminated text block");
        }
        emit(core::LexKind::literal, begin, line);
    }

    void punctuation() {
        const std::size_t begin = m_at;
        const std::string_view rest = std::string_view(m_text).substr(m_at, 4);
        for (const std::string_view op : k_operators) {
            if (rest.substr(0, op.size()) == op) {
                m_at += op.size();
                emit(core::LexKind::punctuation, begin, m_line);
                return;
            }
        }
        // A byte that starts no Java token (a control character, a backquote): one token.
        problem(m_line, "unexpected character");
        ++m_at;
        emit(core::LexKind::punctuation, begin, m_line);
    }

    const std::string& m_text;
    std::size_t m_at = 0;
    unsigned m_line = 1;
    JavaScan m_result;
};

} // namespace

JavaScan scan_java(const std::string& content) {
    return Scanner(content).run();
}

bool is_valid_utf8(const std::string& text) {
    std::size_t i = 0;
    const std::size_t n = text.size();
    while (i < n) {
        const auto c = static_cast<unsigned char>(text[i]);
        std::size_t length = 0;
        std::uint32_t code = 0;
        if (c < 0x80) {
            ++i;
            continue;
        }
        if ((c & 0xE0) == 0xC0) {
            length = 2;
            code = c & 0x1Fu;
        } else if ((c & 0xF0) == 0xE0) {
            length = 3;
            code = c & 0x0Fu;
        } else if ((c & 0xF8) == 0xF0) {
            length = 4;
            code = c & 0x07u;
        } else {
            return false;
        }
        if (i + length > n) {
            return false;
        }
        for (std::size_t k = 1; k < length; ++k) {
            const auto next = static_cast<unsigned char>(text[i + k]);
            if ((next & 0xC0) != 0x80) {
                return false;
            }
            code = (code << 6) | (next & 0x3Fu);
        }
        const std::uint32_t smallest = length == 2 ? 0x80 : length == 3 ? 0x800 : 0x10000;
        if (code < smallest || code > 0x10FFFF || (code >= 0xD800 && code <= 0xDFFF)) {
            return false;
        }
        i += length;
    }
    return true;
}

} // namespace tollgate::java
