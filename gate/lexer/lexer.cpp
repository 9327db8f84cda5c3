// SPDX-License-Identifier: MIT
// libclang front end: parse one C/C++ file from memory and list its functions' tokens.
#include "gate/lexer/lexer.hpp"

#include "gate/common/errors.hpp"
#include "gate/common/fnv_digest.hpp"
#include "gate/lexer/clang_handles.hpp"
#include "gate/lexer/cursor_facts.hpp"
#include "gate/lexer/extent_check.hpp"
#include "gate/lexer/function_finish.hpp"
#include "gate/lexer/inactive_code.hpp"
#include "gate/lexer/leading_macros.hpp"
#include "gate/lexer/lexical_scan.hpp"
#include "gate/lexer/macro_names.hpp"
#include "gate/lexer/main_file_stand_ins.hpp"
#include "gate/lexer/parse_diagnostics.hpp"
#include "gate/lexer/pch_cache.hpp"
#include "gate/lexer/shared_header_cache.hpp"
#include "gate/lexer/source_lines.hpp"
#include "gate/lexer/source_token.hpp"
#include "gate/lexer/token_classifier.hpp"
#include "gate/lexer/unit_tokens.hpp"

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <list>
#include <map>
#include <set>
#include <spdlog/spdlog.h>

namespace tollgate::lexer {

namespace {

constexpr std::size_t k_npos = static_cast<std::size_t>(-1);

// The unsaved-file list and include flags of one ParseContext, built once.
struct PreparedContext {
    const SourceFile* header_data = nullptr; // identifies the headers the list points into
    std::size_t header_count = 0;
    std::vector<std::string> virtual_paths; // one per header, under k_virtual_root
    std::vector<CXUnsavedFile> unsaved;     // points into the context's headers
    std::vector<std::string> include_flags; // -I for every include folder
    std::string header_digest;              // of every header's path
};

// A translation unit kept for reparsing, with what it was built from.
struct LiveUnit {
    std::string key; // main path, arguments, precompiled header, header digest
    TranslationUnitHandle unit;
};

// One function found by libclang, before its tokens are classified.
struct FoundFunction {
    CXCursor cursor;
    std::size_t first = 0;
    std::size_t last = 0;
    std::size_t name = k_npos;
};

std::string folder_of(const std::string& path) {
    const auto slash = path.find_last_of('/');
    return slash == std::string::npos ? std::string() : path.substr(0, slash);
}

struct Collector {
    CXFile main_file = nullptr;
    std::vector<CXCursor> functions;
};

bool in_main_file(CXCursor cursor, CXFile main_file) {
    CXFile file = nullptr;
    clang_getExpansionLocation(clang_getCursorLocation(cursor), &file, nullptr, nullptr, nullptr);
    return file != nullptr && file == main_file;
}

CXChildVisitResult collect_functions(CXCursor cursor, CXCursor, CXClientData data) {
    auto& collector = *static_cast<Collector*>(data);
    const CXCursorKind kind = clang_getCursorKind(cursor);
    if (!is_function_cursor(kind) && !is_container_cursor(kind)) {
        return CXChildVisit_Continue;
    }
    if (!in_main_file(cursor, collector.main_file)) {
        // A namespace or class opened in a header holds nothing of the main file; extern "C"
        // blocks have no location of their own worth trusting, so look inside them.
        return kind == CXCursor_LinkageSpec || kind == CXCursor_UnexposedDecl
                   ? CXChildVisit_Recurse
                   : CXChildVisit_Continue;
    }
    if (is_function_cursor(kind)) {
        if (clang_isCursorDefinition(cursor) != 0) {
            collector.functions.push_back(cursor);
        }
        return CXChildVisit_Continue; // lambdas and local classes belong to this function
    }
    return CXChildVisit_Recurse;
}

// Return the index of the first token whose offset is at least `offset`.
std::size_t first_at(const std::vector<SourceToken>& tokens, unsigned offset) {
    return static_cast<std::size_t>(
        std::lower_bound(tokens.begin(), tokens.end(), offset,
                         [](const SourceToken& t, unsigned o) { return t.offset < o; }) -
        tokens.begin());
}

// Find the token range of a libclang function; an empty optional when it has no tokens here.
std::optional<FoundFunction> locate(CXCursor cursor, CXFile main_file,
                                    const std::vector<SourceToken>& tokens) {
    const CXSourceRange extent = clang_getCursorExtent(cursor);
    CXFile start_file = nullptr;
    CXFile end_file = nullptr;
    const unsigned start = expansion_offset(clang_getRangeStart(extent), &start_file);
    const unsigned end = expansion_offset(clang_getRangeEnd(extent), &end_file);
    if (start_file != main_file || tokens.empty()) {
        return std::nullopt;
    }
    FoundFunction found;
    found.cursor = cursor;
    found.first = first_at(tokens, start);
    if (found.first >= tokens.size()) {
        return std::nullopt;
    }
    std::size_t after = end_file == main_file ? first_at(tokens, end) : tokens.size();
    // A range end inside a macro expansion maps to the expansion's first token: keep it.
    unsigned end_spelling = 0;
    CXFile spelling_file = nullptr;
    clang_getSpellingLocation(clang_getRangeEnd(extent), &spelling_file, nullptr, nullptr,
                              &end_spelling);
    if (after < tokens.size() && tokens[after].offset == end &&
        (spelling_file != main_file || end_spelling != end)) {
        ++after;
    }
    if (after <= found.first) {
        // The whole function came out of one macro invocation: take the invocation.
        after = found.first + 1;
        if (after < tokens.size() && is_punct(tokens[after], "(")) {
            after = std::min(match_bracket(tokens, after), tokens.size() - 1) + 1;
        }
    }
    found.last = after - 1;
    unsigned name_offset = 0;
    CXFile name_file = nullptr;
    clang_getSpellingLocation(clang_getCursorLocation(cursor), &name_file, nullptr, nullptr,
                              &name_offset);
    if (name_file == main_file) {
        const std::size_t name = first_at(tokens, name_offset);
        if (name < tokens.size() && tokens[name].offset == name_offset && name >= found.first &&
            name <= found.last && tokens[name].kind == core::LexKind::identifier) {
            found.name = name;
        }
    }
    return found;
}

// Return true when `cursor` starts inside a macro expansion.
bool from_macro(CXCursor cursor) {
    const CXSourceLocation start = clang_getRangeStart(clang_getCursorExtent(cursor));
    unsigned spelling = 0;
    CXFile spelling_file = nullptr;
    clang_getSpellingLocation(start, &spelling_file, nullptr, nullptr, &spelling);
    CXFile expansion_file = nullptr;
    const unsigned expansion = expansion_offset(start, &expansion_file);
    return spelling != expansion || spelling_file != expansion_file;
}

// A file's flags from the compile database, split: the language flags (-x, -std, -D, -U) also
// key the precompiled headers.
struct FileFlags {
    std::vector<std::string> language;
    std::vector<std::string> other;
    bool has_include = false; // an -include flag: no precompiled header then
};

FileFlags file_flags(Language language, const ParseContext& context, const std::string& path) {
    FileFlags split;
    split.language = {"-x", language == Language::c ? "c" : "c++"};
    bool has_std = false;
    if (const auto* found = flags_for(context, path)) {
        for (const std::string& flag : *found) {
            if (flag.rfind("-std=", 0) == 0) {
                has_std = true;
                split.language.push_back(flag);
            } else if (flag.rfind("-D", 0) == 0 || flag.rfind("-U", 0) == 0) {
                split.language.push_back(flag);
            } else {
                split.has_include = split.has_include || flag == "-include";
                split.other.push_back(flag);
            }
        }
    }
    if (!has_std) {
        split.language.insert(split.language.begin() + 2,
                              language == Language::c ? "-std=gnu11" : "-std=c++17");
    }
    return split;
}

} // namespace

struct Lexer::Impl {
    IndexHandle index{clang_createIndex(1, 0)};
    std::map<const ParseContext*, PreparedContext> prepared;
    MainFileStandIns stand_ins;    // outlives the live units that read its files
    std::set<std::string> seen;    // main paths parsed before (reuse starts at a path's second
                                   // version: a file seen once would pay for a preamble for
                                   // nothing)
    std::set<std::string> refused; // main paths with errors before their main code
                                   // (errors_before_main_code): never reparsed from a preamble
    std::list<LiveUnit> live;      // most recently used first
    std::size_t live_limit = 0;
    SharedHeaderCache shared_headers;

    // Take the live unit built under `key` out of the list, or null.
    TranslationUnitHandle take_live(const std::string& key) {
        for (auto it = live.begin(); it != live.end(); ++it) {
            if (it->key == key) {
                TranslationUnitHandle unit = std::move(it->unit);
                live.erase(it);
                return unit;
            }
        }
        return TranslationUnitHandle();
    }

    void keep_live(std::string key, TranslationUnitHandle unit) {
        live.push_front({std::move(key), std::move(unit)});
        while (live.size() > live_limit) {
            live.pop_back();
        }
    }

    // Parse `main_path` from scratch with `args` and `pch` (when not empty) over `unsaved`; a
    // precompiled header libclang refuses is discarded (`pch` cleared) and the file parsed
    // without it. Null when libclang gives no unit.
    TranslationUnitHandle parse_fresh(const std::string& main_path,
                                      const std::vector<std::string>& args, std::string& pch,
                                      std::vector<CXUnsavedFile>& unsaved, unsigned options,
                                      const std::string& path) {
        TranslationUnitHandle unit;
        for (int attempt = 0; attempt < 2 && !unit; ++attempt) {
            std::vector<std::string> attempt_args = args;
            if (!pch.empty()) {
                attempt_args.push_back("-include-pch");
                attempt_args.push_back(pch);
            }
            std::vector<const char*> argv;
            for (const std::string& arg : attempt_args) {
                argv.push_back(arg.c_str());
            }
            CXTranslationUnit raw = nullptr;
            const CXErrorCode code = clang_parseTranslationUnit2(
                index.get(), main_path.c_str(), argv.data(), static_cast<int>(argv.size()),
                unsaved.data(), static_cast<unsigned>(unsaved.size()), options, &raw);
            unit.reset(code == CXError_Success ? raw : nullptr);
            if (code != CXError_Success && raw != nullptr) {
                clang_disposeTranslationUnit(raw);
            }
            if (pch.empty()) {
                break;
            }
            if (pch_refused(unit.get())) {
                spdlog::debug("precompiled header \"{}\" refused for \"{}\": parsing without it",
                              pch, path);
                discard_precompiled_header(pch);
                pch.clear();
                unit.reset();
            }
        }
        return unit;
    }

    const PreparedContext& prepare(const ParseContext& context) {
        PreparedContext& entry = prepared[&context];
        const SourceFile* data = context.headers.empty() ? nullptr : context.headers.data();
        if (entry.header_data == data && entry.header_count == context.headers.size() &&
            (data != nullptr || !entry.include_flags.empty())) {
            return entry;
        }
        entry = PreparedContext{};
        entry.header_data = data;
        entry.header_count = context.headers.size();
        entry.virtual_paths.reserve(context.headers.size());
        for (const SourceFile& header : context.headers) {
            entry.virtual_paths.push_back(k_virtual_root + header.path);
        }
        for (std::size_t i = 0; i < context.headers.size(); ++i) {
            entry.unsaved.push_back(
                {entry.virtual_paths[i].c_str(), context.headers[i].content.data(),
                 static_cast<unsigned long>(context.headers[i].content.size())});
        }
        for (const std::string& folder : context.include_dirs) {
            entry.include_flags.push_back("-I" + std::string(k_virtual_root) + folder);
        }
        if (entry.include_flags.empty()) {
            entry.include_flags.push_back("-I" + std::string(k_virtual_root));
        }
        // A digest of the header paths: a unit is reused only with the same set of in-memory
        // files. Their contents may differ: libclang checks every file its preamble read
        // (size and MD5 of each unsaved buffer) and builds the preamble anew when one changed;
        // the headers after the preamble are read from the new buffers on every reparse.
        FnvDigest digest;
        for (const SourceFile& header : context.headers) {
            digest.add_field(header.path);
        }
        entry.header_digest =
            std::to_string(context.headers.size()) + "." + std::to_string(digest.value());
        return entry;
    }
};

Lexer::Lexer() : m_impl(std::make_unique<Impl>()) {
    if (!m_impl->index) {
        throw Failure("libclang could not create an index (check the libclang-14 installation)");
    }
}

Lexer::~Lexer() = default;

void Lexer::forget(const ParseContext& context) {
    m_impl->prepared.erase(&context);
}

void Lexer::keep_preambles(std::size_t units) {
    m_impl->live_limit = units;
    while (m_impl->live.size() > units) {
        m_impl->live.pop_back();
    }
}

void Lexer::share_headers(const std::string& folder) {
    m_impl->shared_headers.set_folder(folder);
}

FileFunctions Lexer::lex_functions(const SourceFile& file, const ParseContext& context) {
    FileFunctions result;
    result.path = file.path;
    const auto language = language_for_path(file.path, context.force_language);
    if (!language) {
        result.warnings.push_back({file.path, 0, "not a c or c++ file: nothing measured"});
        return result;
    }
    const PreparedContext& prepared = m_impl->prepare(context);

    FileFlags flags = file_flags(*language, context, file.path);
    std::vector<std::string>& language_flags = flags.language;
    const std::vector<std::string>& other_flags = flags.other;
    const bool has_include = flags.has_include;
    // Reuse needs the main path on disk and, with it, the GCC headers under their own path
    // (main_file_stand_ins.hpp); without a stand-in the unit would be kept for nothing.
    const std::string main_path = k_virtual_root + file.path;
    std::optional<std::string> overlay;
    const bool seen_before = m_impl->live_limit > 0 && !m_impl->seen.insert(main_path).second;
    if (seen_before && m_impl->refused.count(main_path) == 0 && !chooses_toolchain(other_flags)) {
        overlay = m_impl->stand_ins.overlay_for(main_path);
    }
    if (overlay) {
        language_flags.push_back(k_stand_in_toolchain);
        if (*language != Language::c) {
            language_flags.push_back(k_preamble_instantiates);
        }
    }
    std::vector<std::string> args = language_flags;
    args.insert(args.end(), {"-w", "-ferror-limit=0"});
    args.push_back("-I" + std::string(k_virtual_root) + folder_of(file.path));
    args.insert(args.end(), other_flags.begin(), other_flags.end());
    args.insert(args.end(), prepared.include_flags.begin(), prepared.include_flags.end());

    std::string pch =
        has_include ? std::string() : precompiled_header(language_flags, context.cache_dir);
    std::vector<CXUnsavedFile> unsaved;
    unsaved.reserve(prepared.unsaved.size() + 1);
    for (std::size_t i = 0; i < prepared.unsaved.size(); ++i) {
        if (context.headers[i].path != file.path) {
            unsaved.push_back(prepared.unsaved[i]);
        }
    }
    bool with_shared = false;
    std::uint64_t shared_lines = 0;
    if (!pch.empty() && m_impl->shared_headers.enabled()) {
        if (auto shared = m_impl->shared_headers.pch_for(
                file, context.headers, language_flags,
                {args.begin() + static_cast<std::ptrdiff_t>(language_flags.size()), args.end()},
                unsaved, shared_lines)) {
            pch = std::move(*shared);
            with_shared = true;
        }
    }
    unsaved.push_back(
        {main_path.c_str(), file.content.data(), static_cast<unsigned long>(file.content.size())});

    const bool reuse = overlay.has_value();
    std::string live_key;
    TranslationUnitHandle unit;
    const auto started = std::chrono::steady_clock::now();
    const char* how = reuse         ? "parsed with a new preamble"
                      : with_shared ? "parsed after its precompiled shared headers"
                                    : "parsed";
    if (reuse) {
        args.insert(args.end(), {"-ivfsoverlay", *overlay});
        live_key = main_path + '\x1f' + pch + '\x1f' + prepared.header_digest;
        for (const std::string& arg : args) {
            live_key += '\x1f' + arg;
        }
        unit = m_impl->take_live(live_key);
        if (unit && clang_reparseTranslationUnit(unit.get(), static_cast<unsigned>(unsaved.size()),
                                                 unsaved.data(),
                                                 clang_defaultReparseOptions(unit.get())) != 0) {
            spdlog::debug("reparse of \"{}\" failed: parsing it from scratch", file.path);
            unit.reset(); // a unit whose reparse failed must be disposed of
        } else if (unit) {
            how = "reparsed (preamble kept unless its files changed)";
        }
    }
    const unsigned options =
        CXTranslationUnit_KeepGoing | CXTranslationUnit_DetailedPreprocessingRecord |
        (reuse
             ? CXTranslationUnit_PrecompiledPreamble | CXTranslationUnit_CreatePreambleOnFirstParse
             : 0u);
    if (!unit) {
        unit = m_impl->parse_fresh(main_path, args, pch, unsaved, options, file.path);
    }
    if (!unit) {
        throw Failure("libclang could not parse \"" + file.path +
                      "\" (run with --verbose for details)");
    }

    const auto parsed_at = std::chrono::steady_clock::now();

    // Parse errors become warnings, in words that never quote a header outside the revision.
    CXFile main_file = clang_getFile(unit.get(), main_path.c_str());
    const bool header_errors = (m_impl->live_limit > 0 || shared_lines != 0) &&
                               errors_before_main_code(unit.get(), main_file, file.content);
    if (header_errors && shared_lines != 0 && !with_shared) {
        // Headers that show errors here would not precompile either: never try.
        m_impl->shared_headers.refuse(shared_lines);
    }
    if (m_impl->live_limit > 0 && header_errors) {
        // With such errors a preamble could change how the rest parses: this path is parsed
        // from scratch from now on, this version too.
        m_impl->refused.insert(main_path);
        if (reuse) {
            spdlog::debug("\"{}\" has errors before its code: parsed again without a preamble",
                          file.path);
            unit.reset();
            return lex_functions(file, context);
        }
    }
    result.warnings = diagnostics_as_warnings(unit.get(), main_file, file.path);

    const ParsedFile parsed = tokenize_file(unit.get(), main_file, file.content);
    const std::vector<SourceToken>& tokens = parsed.tokens;

    Collector collector;
    collector.main_file = main_file;
    clang_visitChildren(clang_getTranslationUnitCursor(unit.get()), collect_functions, &collector);

    std::vector<PendingFunction> pending;
    std::vector<std::pair<std::size_t, std::size_t>> taken; // token ranges of parsed functions
    std::vector<FoundFunction> located;
    for (const CXCursor& cursor : collector.functions) {
        if (auto found = locate(cursor, main_file, tokens)) {
            found->first =
                leading_macro_start(tokens, parsed.cursors, parsed.directives, found->first);
            located.push_back(*found);
        }
    }
    const std::vector<LexicalDefinition> definitions = scan_definitions(tokens, parsed.directives);
    const std::vector<SkippedRange> skipped = skipped_ranges(unit.get(), main_file);
    BraceExtentNotes brace_notes;
    std::vector<std::size_t> braced_definitions; // closing braces of phantoms' real functions
    // The widest extent first, so a template's header beats a repeat of its pattern.
    std::stable_sort(located.begin(), located.end(),
                     [](const FoundFunction& a, const FoundFunction& b) {
                         return a.first != b.first ? a.first < b.first : a.last > b.last;
                     });
    for (const FoundFunction& candidate : located) {
        FoundFunction checked = candidate;
        const ExtentCheck extent = check_extent(tokens, {candidate.first, candidate.last},
                                                candidate.name, definitions, skipped);
        if (extent.verdict == ExtentVerdict::phantom) {
            brace_notes.add_phantom(qualified_name(candidate.cursor), tokens[candidate.first].line);
            if (extent.braces.last < tokens.size()) {
                braced_definitions.push_back(extent.braces.last);
            }
            continue; // the brace-matched definition is measured below, lexically
        }
        const bool braces = extent.verdict == ExtentVerdict::braces;
        if (braces) {
            checked.first = extent.braces.first;
            checked.last = extent.braces.last;
        }
        const FoundFunction* found = &checked;
        const CXCursor cursor = candidate.cursor;
        // Explicit instantiations and defaulted members have no body to measure; a function
        // made whole by one macro invocation has none in this file either, but is kept.
        const bool has_body = std::any_of(tokens.begin() + static_cast<long>(found->first),
                                          tokens.begin() + static_cast<long>(found->last) + 1,
                                          [](const SourceToken& t) { return is_punct(t, "{"); });
        if ((!has_body && !from_macro(cursor)) ||
            (found->name != k_npos && declares_type_at(tokens, found->first, found->name))) {
            continue; // no body here, or a type an unknown macro made look like a function
        }
        // An explicit instantiation reports its pattern's extent again: functions never nest,
        // so an overlap is always such a repeat.
        const bool duplicate = std::any_of(taken.begin(), taken.end(), [&](const auto& range) {
            return found->first <= range.second && range.first <= found->last;
        });
        if (duplicate) {
            continue;
        }
        taken.emplace_back(found->first, found->last);
        PendingFunction item;
        item.first = found->first;
        item.span.usr = take_string(clang_getCursorUSR(cursor));
        const ReadableName readable = readable_name(cursor, qualified_name(cursor), tokens,
                                                    found->first, found->last, found->name);
        item.span.qualified_name = readable.name;
        item.span.brace_extent = braces;
        if (braces) {
            brace_notes.add(item.span.qualified_name, tokens[found->first].line);
        }
        const std::vector<std::string> types = parameter_types(cursor);
        for (std::size_t i = 0; i < types.size(); ++i) {
            item.span.signature += (i == 0 ? "" : ", ") + strip_virtual_root(types[i]);
        }
        item.span.potential_operands = types.size() + (has_result(cursor) ? 1 : 0);
        if (readable.macro_made) {
            item.span.signature.clear();
            item.span.potential_operands = 0;
        }
        item.span.start_line = tokens[found->first].line;
        item.span.end_line = tokens[found->last].line;
        item.span.mode = ExtentMode::syntax_tree;
        item.range = {found->first, found->last, found->name};
        pending.push_back(std::move(item));
    }

    brace_notes.warn(file.path, result.warnings);

    // The lexical cross-check: definitions libclang did not report are measured lexically, and
    // so are those of the #if branches the preprocessor skipped (marked inactive).
    for (const LexicalDefinition& definition : definitions) {
        const bool known = std::any_of(taken.begin(), taken.end(), [&](const auto& range) {
            return range.second == definition.body_close ||
                   (definition.first <= range.second && range.first <= definition.body_close);
        });
        if (known) {
            continue;
        }
        const bool inactive = inside_skipped(skipped, tokens[definition.first].offset,
                                             tokens[definition.body_close].offset);
        PendingFunction item;
        item.lexical = true;
        item.first = definition.first;
        item.span.qualified_name = definition.qualified_name;
        item.span.signature = definition.signature;
        item.span.potential_operands = definition.potential_operands;
        item.span.start_line = tokens[definition.first].line;
        item.span.end_line = tokens[definition.body_close].line;
        item.span.mode = ExtentMode::lexical;
        item.span.inactive = inactive;
        item.span.brace_extent = std::find(braced_definitions.begin(), braced_definitions.end(),
                                           definition.body_close) != braced_definitions.end();
        item.range = {definition.first, definition.body_close, definition.name};
        if (!inactive) {
            ++result.lexically_recovered;
        }
        if (inactive || item.span.brace_extent) {
            pending.push_back(std::move(item)); // expected, or warned about above
            continue;
        }
        result.warnings.push_back(
            {file.path, item.span.start_line,
             "function \"" + definition.qualified_name +
                 "\" measured lexically: the parser did not report it (check the macros and "
                 "#if branches around it)"});
        pending.push_back(std::move(item));
    }

    result.functions = finish_functions(std::move(pending), file.path, tokens, &parsed.cursors,
                                        context.convention);
    const auto milliseconds = [](auto from, auto to) {
        return std::chrono::duration_cast<std::chrono::milliseconds>(to - from).count();
    };
    spdlog::debug("\"{}\" {} in {} ms, functions read in {} ms", file.path, how,
                  milliseconds(started, parsed_at),
                  milliseconds(parsed_at, std::chrono::steady_clock::now()));
    if (reuse) {
        // A suspended unit keeps its preamble (a file in the temporary folder) and frees its
        // syntax tree: on the bench library about 7 MiB stays per unit instead of 25-30 MiB,
        // and a reparse costs the same.
        clang_suspendTranslationUnit(unit.get());
        m_impl->keep_live(std::move(live_key), std::move(unit));
    }
    return result;
}

} // namespace tollgate::lexer
