// SPDX-License-Identifier: MIT
// The main file's tokens as libclang lexed and annotated them, directive lines set apart.
#include "gate/lexer/unit_tokens.hpp"

#include "gate/lexer/clang_handles.hpp"
#include "gate/lexer/source_lines.hpp"

namespace tollgate::lexer {

namespace {

core::LexKind lex_kind(CXTokenKind kind) {
    switch (kind) {
    case CXToken_Keyword:
        return core::LexKind::keyword;
    case CXToken_Identifier:
        return core::LexKind::identifier;
    case CXToken_Literal:
        return core::LexKind::literal;
    case CXToken_Punctuation:
    case CXToken_Comment:
        break;
    }
    return core::LexKind::punctuation;
}

} // namespace

ParsedFile tokenize_file(CXTranslationUnit unit, CXFile main_file, const std::string& content) {
    ParsedFile parsed;
    parsed.lines = line_starts(content);
    if (content.empty() || main_file == nullptr) {
        return parsed;
    }
    const CXSourceRange whole = clang_getRange(
        clang_getLocationForOffset(unit, main_file, 0),
        clang_getLocationForOffset(unit, main_file, static_cast<unsigned>(content.size())));
    TokenArray tokens(unit, whole);
    std::vector<CXCursor> cursors(tokens.size());
    if (tokens.size() > 0) {
        clang_annotateTokens(unit, tokens.data(), tokens.size(), cursors.data());
    }
    parsed.tokens.reserve(tokens.size());
    parsed.cursors.reserve(tokens.size());
    unsigned previous_line = 0;
    unsigned directive_end = 0; // last line of the directive being skipped
    for (unsigned i = 0; i < tokens.size(); ++i) {
        const CXToken token = tokens.data()[i];
        const CXTokenKind kind = clang_getTokenKind(token);
        if (kind == CXToken_Comment) {
            continue;
        }
        const CXSourceRange extent = clang_getTokenExtent(unit, token);
        unsigned begin = 0;
        unsigned end = 0;
        clang_getSpellingLocation(clang_getRangeStart(extent), nullptr, nullptr, nullptr, &begin);
        clang_getSpellingLocation(clang_getRangeEnd(extent), nullptr, nullptr, nullptr, &end);
        if (end < begin || end > content.size()) {
            end = begin;
        }
        const unsigned line = line_of(parsed.lines, begin);
        if (line <= directive_end) {
            continue;
        }
        if (kind == CXToken_Punctuation && line != previous_line && end == begin + 1 &&
            content[begin] == '#') {
            directive_end = line;
            while (continues(content, parsed.lines, directive_end)) {
                ++directive_end;
            }
            std::string word;
            if (i + 1 < tokens.size()) {
                word = take_string(clang_getTokenSpelling(unit, tokens.data()[i + 1]));
            }
            parsed.directives.push_back({parsed.tokens.size(), directive_kind(word)});
            previous_line = line;
            continue;
        }
        previous_line = line;
        SourceToken source;
        source.kind = lex_kind(kind);
        source.spelling = content.substr(begin, end - begin);
        source.offset = begin;
        source.line = line;
        parsed.tokens.push_back(std::move(source));
        parsed.cursors.push_back(cursors[i]);
    }
    return parsed;
}

} // namespace tollgate::lexer
