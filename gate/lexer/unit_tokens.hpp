// SPDX-License-Identifier: MIT
// The main file's tokens as libclang lexed and annotated them, directive lines set apart.
#pragma once

#include "gate/lexer/source_token.hpp"

#include <clang-c/Index.h>
#include <string>
#include <vector>

namespace tollgate::lexer {

// Everything one parse of one file produced.
struct ParsedFile {
    std::vector<SourceToken> tokens;       // the main file's tokens, comments and directives out
    std::vector<CXCursor> cursors;         // libclang's annotation of each token
    std::vector<DirectiveMark> directives; // where each directive line stood among the tokens
    std::vector<unsigned> lines;           // line starts of the main file (line_starts)
};

// Tokenize and annotate the whole main file `main_file` of `unit` (whose text is `content`) once;
// drop comments and directive lines, noting where each directive was.
ParsedFile tokenize_file(CXTranslationUnit unit, CXFile main_file, const std::string& content);

} // namespace tollgate::lexer
