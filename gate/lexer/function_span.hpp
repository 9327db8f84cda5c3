// SPDX-License-Identifier: MIT
// What the lexer hands the rest of the pipeline: functions with classified tokens.
#pragma once

#include "tollgate/core/token.hpp"

#include <cstdint>
#include <string>
#include <vector>

namespace tollgate::lexer {

// How a function's extent was found.
enum class ExtentMode {
    syntax_tree,    // libclang's AST gave the definition and its extent
    lexical,        // libclang lost it; balanced braces after a parameter list gave the extent
    parser_stopped, // the parser stopped on the whole file (crash, memory, time): the lexical
                    // scanner found the extent and neighbouring tokens classified every token
};

// Return the name reports use for `mode`: "syntax-tree", "lexical" or "parser-stopped".
const char* extent_name(ExtentMode mode);

// Why the parser gave up on a whole file, which was then measured by the lexical scanner alone.
enum class ParserStop {
    none,          // the parser finished the file
    crashed,       // the parser process died on a signal (stack exhaustion, a bug)
    out_of_memory, // it reached its address-space limit
    timed_out,     // it passed its processor-time or wall-clock limit
    failed,        // libclang reported that it could not parse the file
};

// One function definition of one file, with its counted tokens.
struct FunctionSpan {
    std::string usr;            // libclang's unified symbol resolution; empty for lexical ones
    std::string fallback_key;   // qualified name + "(" signature ")" + "#" ordinal in the file
    std::string qualified_name; // e.g. "skyline::RingBuffer::push"
    std::string signature;      // parameter types as written, e.g. "int, const char *"
    std::string path;           // repository-relative path of the file holding the definition
    unsigned start_line = 0;    // first line of the definition (1-based, inclusive)
    unsigned end_line = 0;      // line of the closing brace (inclusive)
    ExtentMode mode = ExtentMode::syntax_tree; // how the extent was found
    std::uint64_t potential_operands = 0;      // n2*: parameters plus one for a non-void result
    core::TokenList tokens;    // counted tokens in source order (closing halves left out)
    std::string token_hash;    // hex digest of the tokens' keys and roles (not lines)
    bool inactive = false;     // defined in a preprocessor branch the flags in use skip (measured
                               // lexically, from the raw tokens of the branch)
    bool brace_extent = false; // libclang's extent disagreed with brace matching of the raw
                               // tokens, and the brace-matched extent was taken

    bool operator==(const FunctionSpan& other) const {
        return usr == other.usr && fallback_key == other.fallback_key &&
               qualified_name == other.qualified_name && signature == other.signature &&
               path == other.path && start_line == other.start_line && end_line == other.end_line &&
               mode == other.mode && potential_operands == other.potential_operands &&
               tokens == other.tokens && token_hash == other.token_hash &&
               inactive == other.inactive && brace_extent == other.brace_extent;
    }
};

// A warning about one file: what could not be measured and why.
struct LexWarning {
    std::string path;    // repository-relative path
    unsigned line = 0;   // 1-based, 0 when not tied to a line
    std::string message; // lowercase sentence, e.g. "expected ';' after expression"
};

// The functions of one file.
struct FileFunctions {
    std::string path;                          // repository-relative path
    std::vector<FunctionSpan> functions;       // ordered by start line, then fallback key
    std::vector<LexWarning> warnings;          // parse errors and recovered regions
    unsigned lexically_recovered = 0;          // functions whose extent came from the lexical check
    ParserStop parser_stop = ParserStop::none; // set when the whole file was measured lexically
};

} // namespace tollgate::lexer
