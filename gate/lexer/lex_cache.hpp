// SPDX-License-Identifier: MIT
// The interface of a store of lexed files that the measuring pipeline consults before parsing.
#pragma once

#include "gate/common/source.hpp"
#include "gate/lexer/function_span.hpp"
#include "gate/lexer/lexer.hpp"

#include <optional>

namespace tollgate::lexer {

// A store of lexed files. Implementations decide the key (it must cover everything the result
// depends on: the file's content and path, the headers it can reach, its flags and the
// convention) and must be safe to call from several threads at once.
class LexCache {
public:
    virtual ~LexCache() = default;
    // Return the functions of `file` lexed earlier with an equivalent `context`, or nothing when
    // the store has no usable entry. Never throws for a missing or damaged entry.
    virtual std::optional<FileFunctions> find(const SourceFile& file,
                                              const ParseContext& context) = 0;
    // Keep `functions`, the result of lexing `file` with `context`. Failing to keep it is not an
    // error: the next run parses again.
    virtual void store(const SourceFile& file, const ParseContext& context,
                       const FileFunctions& functions) = 0;
    // Keep nothing for `file` with `context` after a find that missed: its result depends on
    // more than the key (the parser passed a time limit). The default does nothing.
    virtual void abandon(const SourceFile& file, const ParseContext& context) {
        (void)file;
        (void)context;
    }
};

} // namespace tollgate::lexer
