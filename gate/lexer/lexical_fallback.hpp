// SPDX-License-Identifier: MIT
// Measuring a whole file without the parser: the raw lexer, the lexical scanner and neighbouring-
// token classification, for files the parser stopped on.
#pragma once

#include "gate/lexer/lexer.hpp"

#include <string>

namespace tollgate::lexer {

// Return a sentence part for `stop` ("crashed", "ran out of memory", "could not parse it"); for
// timed_out, "took longer than `seconds` s".
std::string parser_stop_text(ParserStop stop, unsigned seconds = 0);

// Return the functions of `file` found by the lexical scanner alone (never libclang), every one
// marked ExtentMode::parser_stopped and classified from neighbouring tokens, with `warning` as
// the file's one warning and `stop` recorded. Functions inside #if 0 regions are found too (no
// preprocessor runs). A file that is not C or C++ yields the usual "not a c or c++ file" warning;
// a file of more than 4,000,000 tokens yields no function and says so in the warning.
FileFunctions lex_lexically(const SourceFile& file, const ParseContext& context, ParserStop stop,
                            const std::string& warning);

} // namespace tollgate::lexer
