// SPDX-License-Identifier: MIT
// libclang front end: parse one C/C++ file from memory and list its functions' tokens.
#pragma once

#include "gate/common/source.hpp"
#include "gate/lexer/function_span.hpp"
#include "tollgate/core/convention.hpp"

#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::lexer {

// The language a file is parsed as.
enum class Language { c, cxx };

// The folder under which the revision's files are given to libclang (they exist only in memory).
inline constexpr const char* k_virtual_root = "/tollgate-src/";

// Return the language of `path` by extension (.c is C; .cc .cpp .cxx .c++ and headers are C++),
// or nothing when the extension is not C/C++. `force` overrides the extension when given.
std::optional<Language> language_for_path(const std::string& path,
                                          std::optional<Language> force = std::nullopt);

// Everything one revision's files share when they are parsed: built once per revision.
struct ParseContext {
    std::vector<SourceFile> headers;       // every header of the revision, repository-relative
    std::vector<std::string> include_dirs; // repository-relative include folders to search
    std::map<std::string, std::vector<std::string>>
        file_flags;                         // per repository-relative path:
                                            // extra flags (-D, -U, -std, -I, -isystem, -iquote,
                                            // -include; paths inside the repository moved under
                                            // k_virtual_root) from compile_commands.json
    std::optional<Language> force_language; // override the extension rule
    core::Convention convention;            // counting convention switches
    std::string cache_dir;                  // where precompiled standard headers are kept;
                                            // empty disables the cache
    std::vector<std::string> trusted_dirs;  // folders outside the repository the parser may read
                                            // (-I, -isystem, -iquote and -include of a compile
                                            // database the pipeline gave with --compile-commands)
};

// Where a compile database came from, which decides whether its folders outside the repository
// may be read.
enum class DatabaseOrigin {
    given, // named by the pipeline (--compile-commands): trusted, its folders may be read
    found, // found in the working tree (it may come with the change): its folders outside the
           // repository are left out unless they are system include folders
};

// Build the shared parse context of one revision: keep the headers of `files`, and derive include
// folders (the repository root "" and every folder named include/). `compile_commands_json`, when
// non-empty, is the text of a compile_commands.json; its file paths and path flags are made
// relative to `repository_root` (an absolute path in the user's checkout); entries outside it are
// left out. Path flags outside the repository are kept (and their folders become trusted_dirs)
// when `origin` is given; when it is found, only those under a system include folder are kept.
// Throws UsageError when `compile_commands_json` is not a JSON list.
ParseContext make_parse_context(const std::vector<SourceFile>& files,
                                const std::string& compile_commands_json = {},
                                const std::string& repository_root = {},
                                DatabaseOrigin origin = DatabaseOrigin::found);

// Return the compile-database flags for `path`: its own entry, else (a header, or a source the
// build does not list) the entry of the same language whose folder shares the longest leading
// path with `path`'s folder, as an IDE infers a header's flags from a neighbouring source. Return
// null when the database has no entry to borrow from.
const std::vector<std::string>* flags_for(const ParseContext& context, const std::string& path);

// Give every file of `files` that has no compile-database flags (its own or borrowed, see
// flags_for) an -I flag for each folder of `folders`, as libclang is to see it: under
// k_virtual_root for a folder of the revision, an absolute path for a folder on disk. Nothing
// changes when `folders` is empty.
void add_include_dirs(ParseContext& context, const std::vector<SourceFile>& files,
                      const std::vector<std::string>& folders);

// A libclang front end. One per thread: it owns a CXIndex. Not copyable.
class Lexer {
public:
    Lexer();
    ~Lexer();
    Lexer(const Lexer&) = delete;
    Lexer& operator=(const Lexer&) = delete;

    // Parse `file` (with the headers of `context` as in-memory files) and return every function
    // definition in it with classified tokens. Never throws for bad source: syntax errors become
    // warnings and what can be measured is measured. Throws Failure when libclang itself fails.
    FileFunctions lex_functions(const SourceFile& file, const ParseContext& context);

    // Drop what was prepared for `context` (its in-memory file list); call it before `context`
    // is destroyed if another context may later live at the same address.
    void forget(const ParseContext& context);

    // Keep up to `units` translation units alive (least recently used dropped first), each
    // built with a precompiled preamble, and reparse one with the new main-file contents when
    // the same path comes again with the same flags and the same headers; anything else (or a
    // failed reparse) parses from scratch. The results are the same either way. 0 (the default)
    // keeps none.
    void keep_preambles(std::size_t units);

    // Precompile the shared headers of a file (shared_headers.hpp) in `folder` the second time a
    // parse asks for the same ones, and parse with them instead of the standard headers alone.
    // The results are the same (a header refused by libclang is parsed without). Empty: never.
    void share_headers(const std::string& folder);

private:
    struct Impl;
    std::unique_ptr<Impl> m_impl;
};

} // namespace tollgate::lexer
