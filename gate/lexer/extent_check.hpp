// SPDX-License-Identifier: MIT
// Honest extents: a parsed function's token range checked against brace matching of the raw
// tokens.
#pragma once

#include "gate/lexer/function_span.hpp"
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

// Compare the extent `parsed` libclang gave a function (its name token at `name`, or
// static_cast<std::size_t>(-1) when the name is not spelled in the file) with the brace-matched
// definition of the same function among `definitions` (see scan_definitions). Return the
// brace-matched range when they disagree: the parsed extent ends at another closing brace, or
// starts before a `;`, `{` or `}` that the brace-matched declaration starts after (an extent
// that swallowed earlier code). Return nothing when they agree, when no definition of the
// function was found by brace matching, or when the parsed extent ends in a macro (not at a
// `}` of the file). A function-try-block, whose handlers follow the body, agrees.
std::optional<TokenRange> check_extent(const std::vector<SourceToken>& tokens, TokenRange parsed,
                                       std::size_t name,
                                       const std::vector<LexicalDefinition>& definitions);

// The functions of one file whose extents were taken from brace matching, for one warning.
class BraceExtentNotes {
public:
    // Note that the extent of the function `name`, starting at `line`, came from brace matching.
    void add(const std::string& name, unsigned line);
    // Append one warning about every noted function of the file `path` to `warnings`; nothing
    // when none was noted.
    void warn(const std::string& path, std::vector<LexWarning>& warnings) const;

private:
    std::string m_first_name;
    unsigned m_first_line = 0;
    std::size_t m_count = 0;
};

} // namespace tollgate::lexer
