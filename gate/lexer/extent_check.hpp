// SPDX-License-Identifier: MIT
// Honest extents: a parsed function's token range checked against brace matching of the raw
// tokens.
#pragma once

#include "gate/lexer/function_span.hpp"
#include "gate/lexer/inactive_code.hpp"
#include "gate/lexer/lexical_scan.hpp"
#include "gate/lexer/source_token.hpp"

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::lexer {

// A function's tokens, first to last (inclusive).
struct TokenRange {
    std::size_t first = 0; // first token of the declaration
    std::size_t last = 0;  // the body's closing brace

    bool operator==(const TokenRange& other) const {
        return first == other.first && last == other.last;
    }
};

// What brace matching says about a parsed function's extent.
enum class ExtentVerdict {
    agrees,  // the parsed extent stands (or braces cannot judge it)
    braces,  // the extents disagree: take the brace-matched range
    phantom, // the parser made a function of code that holds none (a K&R-style reading of an
             // unknown macro): drop it; `braces` is the real function whose body it took, or
             // both ends are static_cast<std::size_t>(-1) when its "body" is an initializer
};

// The outcome of check_extent.
struct ExtentCheck {
    ExtentVerdict verdict = ExtentVerdict::agrees; // what to do with the parsed function
    TokenRange braces;                             // the brace-matched range (braces, phantom)
};

// Compare the extent `parsed` libclang gave a function (its name token at `name`, or
// static_cast<std::size_t>(-1) when the name is not spelled in the file) with the brace-matched
// definitions `definitions` (see scan_definitions). The definition with the same name token
// disagrees when its body closes at another brace, or when the parsed extent starts before a
// `;`, `{` or `}` that the definition starts after (an extent that swallowed earlier code).
// When no definition has the name but one ends at the same brace after such a boundary, the
// parsed function is a phantom, and so is one whose body follows `=` (an initializer). Braces
// cannot judge (agrees) when no definition matches, when the parsed extent ends in a macro
// rather than at a `}` of the file, or when the definition's closing brace lies in a branch the
// preprocessor skipped (`skipped`: an unbalanced brace there misleads brace matching). A
// function-try-block, whose handlers follow the body, agrees.
ExtentCheck check_extent(const std::vector<SourceToken>& tokens, TokenRange parsed,
                         std::size_t name, const std::vector<LexicalDefinition>& definitions,
                         const std::vector<SkippedRange>& skipped);

// The functions of one file whose extents brace matching corrected, for one warning.
class BraceExtentNotes {
public:
    // Note that the extent of the function `name`, starting at `line`, came from brace matching.
    void add(const std::string& name, unsigned line);
    // Note that the parser's function `name` at `line` was a phantom and was left out.
    void add_phantom(const std::string& name, unsigned line);
    // Append one warning about every noted function of the file `path` to `warnings`; nothing
    // when none was noted.
    void warn(const std::string& path, std::vector<LexWarning>& warnings) const;

private:
    std::string m_first_name; // the first function noted
    unsigned m_first_line = 0;
    std::size_t m_corrected = 0; // extents taken from brace matching
    std::size_t m_phantoms = 0;  // functions left out
};

} // namespace tollgate::lexer
