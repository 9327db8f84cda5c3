// SPDX-License-Identifier: MIT
// The interface of a store of lexed files that the measuring pipeline consults before parsing.
#pragma once

#include "gate/common/source.hpp"
#include "gate/lexer/function_span.hpp"
#include "gate/lexer/lexer.hpp"

#include <optional>

namespace tollgate::lexer {

// What a lookup in a LexCache found.
enum class LookupState {
    found,   // the entry is there: `functions` holds it
    claimed, // no entry: the caller parses the file and must then store, share or abandon it
    pending, // another caller has claimed the file: ask again with await once the caller
             // holds no claim of its own
};

// The answer of LexCache::lookup and LexCache::await.
struct Lookup {
    LookupState state = LookupState::claimed; // found, claimed or pending
    std::optional<FileFunctions> functions;   // the entry when found
};

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
    // Return the entry of `file` with `context`, or claim it for the caller, without waiting:
    // when another caller holds the claim, say so (pending). The default asks find and never
    // answers pending.
    virtual Lookup lookup(const SourceFile& file, const ParseContext& context) {
        Lookup result;
        result.functions = find(file, context);
        result.state = result.functions ? LookupState::found : LookupState::claimed;
        return result;
    }
    // Wait for a pending entry (call it only while holding no claim): return it when its holder
    // stored or shared it, or claim it when the holder gave up. The default is lookup.
    virtual Lookup await(const SourceFile& file, const ParseContext& context) {
        return lookup(file, context);
    }
    // Hand `functions` to the callers waiting for `file` with `context` for this run only, and
    // keep nothing (see abandon). The default abandons.
    virtual void share(const SourceFile& file, const ParseContext& context,
                       const FileFunctions& functions) {
        (void)functions;
        abandon(file, context);
    }
};

} // namespace tollgate::lexer
