// SPDX-License-Identifier: MIT
// The Java lexical scanner: the tokens of a Java file without a syntax tree.
#pragma once

#include "tollgate/core/classify.hpp"

#include <string>
#include <vector>

namespace tollgate::java {

// One token of a Java file (comments and white space are not tokens).
struct JavaToken {
    core::LexKind kind = core::LexKind::punctuation; // keyword, identifier, literal or punctuation
    std::string spelling;                            // the source bytes of the token
    unsigned offset = 0;                             // byte offset in the file
    unsigned line = 0;                               // 1-based line

    bool operator==(const JavaToken& other) const {
        return kind == other.kind && spelling == other.spelling && offset == other.offset &&
               line == other.line;
    }
};

// What the scanner met that a compiler would refuse, for a warning.
struct ScanProblem {
    unsigned line = 0;   // 1-based line where it starts
    std::string message; // lowercase, e.g. "unterminated string literal"
};

// The tokens of one Java file.
struct JavaScan {
    std::vector<JavaToken> tokens;     // in source order
    std::vector<ScanProblem> problems; // unterminated comments and literals, stray bytes
};

// Split `content` into Java tokens (Java Language Specification, SE 17, chapter 3): identifiers
// (any byte from 0x80 up counts as a letter), keywords, literals (numbers, characters, strings
// and text blocks, each one token), separators and operators by longest match. Comments and
// white space are dropped; a byte that starts no token becomes a one-byte punctuation token.
// Unicode escapes (\uXXXX) are not translated. Never fails; linear in the size of `content`.
JavaScan scan_java(const std::string& content);

// Return true when `text` is valid UTF-8 (no overlong forms, no surrogates, nothing past
// U+10FFFF).
bool is_valid_utf8(const std::string& text);

} // namespace tollgate::java
