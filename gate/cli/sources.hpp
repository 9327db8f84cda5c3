// SPDX-License-Identifier: MIT
// Pick the source files a command measures: a revision's tree, the working tree, or plain files.
#pragma once

#include "gate/common/source.hpp"
#include "gate/lexer/lexer.hpp"

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace tollgate {

// What the user asked to read.
struct SourceRequest {
    std::string revision;           // a git revision; empty reads the working tree
    std::vector<std::string> paths; // files or folders (relative to the current folder);
                                    // empty selects every C/C++ file
    std::string compile_commands;   // compile_commands.json given by the user, or empty
    std::string cache_dir;          // precompiled-header cache; empty picks the default
    bool no_cache = false;          // disable the precompiled-header cache
    std::optional<lexer::Language> force_language;         // override the extension rule
    std::uint64_t max_file_size = k_default_max_file_size; // bytes; larger files are not read
    std::vector<std::string> include_dirs; // include folders for files without compile-database
                                           // flags (absolute, or relative to the current folder)
};

// The files to measure and the parse context they share.
struct LoadedSources {
    std::string label;                    // "working tree", "revision 3f2a91c (HEAD~1)" or a folder
    std::string root;                     // absolute root the repository-relative paths start at
    std::vector<SourceFile> selected;     // the files to measure, sorted by path
    lexer::ParseContext context;          // every header of the source, include folders, flags
    std::vector<OversizedFile> oversized; // files of the selection left unread for their size
};

// Read the sources `request` names. Inside a git repository paths are repository-relative and
// `revision` reads blobs from the object database; outside one, the current folder is the root
// and only the working tree can be read. Files over `request.max_file_size` are never read (their
// size is asked first) and those the paths select are listed in `oversized`. Throws UsageError for
// an unknown revision, a path that does not exist or names no C/C++ file, and for a repository
// owned by another user.
LoadedSources load_sources(const SourceRequest& request);

// Return the text of the compile database `given` (a path; UsageError when it does not exist), or
// when `given` is empty of compile_commands.json or build/compile_commands.json under `root`, or
// empty when there is none.
std::string read_compile_commands(const std::string& given, const std::string& root);

// Return the folders of `given` (absolute, or relative to the current folder) as libclang is to
// see them: a folder inside `root` (the repository root) under lexer::k_virtual_root, so that
// the measured revision's folder is read; any other as an absolute path. Throws UsageError when
// such another folder does not exist.
std::vector<std::string> resolve_include_dirs(const std::vector<std::string>& given,
                                              const std::string& root);

// Return the precompiled-header cache folder to use: none when `no_cache`, else `given`, else
// default_cache_dir().
std::string resolve_cache_dir(bool no_cache, const std::string& given);

// Return the default folder for the precompiled-header cache: $TOLLGATE_CACHE_DIR, else
// $XDG_CACHE_HOME/tollgate, else $HOME/.cache/tollgate, else empty (no cache).
std::string default_cache_dir();

} // namespace tollgate
