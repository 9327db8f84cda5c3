// SPDX-License-Identifier: MIT
// From libclang diagnostics to warnings: where they are decides whose words are shown.
#include "gate/lexer/parse_diagnostics.hpp"

#include "gate/lexer/clang_handles.hpp"
#include "gate/lexer/lexer.hpp"

#include <map>

namespace tollgate::lexer {

namespace {

// Parse errors reported per file; the rest are summed up in one more warning.
constexpr std::size_t k_max_error_warnings = 20;

// For each file the unit included, the main-file line of the #include that brought it in.
struct IncludeLines {
    CXFile main_file = nullptr;
    std::map<CXFile, unsigned> line_of_file;
};

void note_inclusion(CXFile included, CXSourceLocation* stack, unsigned depth, CXClientData data) {
    auto& lines = *static_cast<IncludeLines*>(data);
    // The stack runs from the innermost #include outward; the last one in the main file counts.
    for (unsigned i = depth; i-- > 0;) {
        CXFile file = nullptr;
        unsigned line = 0;
        clang_getExpansionLocation(stack[i], &file, &line, nullptr, nullptr);
        if (file != nullptr && file == lines.main_file) {
            lines.line_of_file.emplace(included, line);
            return;
        }
    }
}

bool in_revision(const std::string& file_name) {
    return file_name.rfind(k_virtual_root, 0) == 0;
}

// Rewrite clang's "'NAME' file not found" (and its "did you mean" form) in our words.
std::string missing_include_text(const std::string& message) {
    const std::string marker = "' file not found";
    const auto end = message.rfind(marker);
    if (message.empty() || message.front() != '\'' || end == std::string::npos || end == 0) {
        return message;
    }
    return "include \"" + message.substr(1, end - 1) +
           "\" not found (only the revision's files, the system include folders and those of a "
           "compile database given with --compile-commands are read)";
}

} // namespace

std::string strip_virtual_root(std::string text) {
    const std::string root = k_virtual_root;
    for (auto at = text.find(root); at != std::string::npos; at = text.find(root, at)) {
        text.erase(at, root.size());
    }
    return text;
}

std::vector<LexWarning> diagnostics_as_warnings(CXTranslationUnit unit, CXFile main_file,
                                                const std::string& path) {
    std::vector<LexWarning> warnings;
    std::size_t errors = 0;
    bool have_lines = false;
    IncludeLines includes;
    includes.main_file = main_file;
    const unsigned count = clang_getNumDiagnostics(unit);
    for (unsigned i = 0; i < count; ++i) {
        DiagnosticHandle diagnostic(clang_getDiagnostic(unit, i));
        if (clang_getDiagnosticSeverity(diagnostic.get()) < CXDiagnostic_Error) {
            continue;
        }
        if (++errors > k_max_error_warnings) {
            continue;
        }
        CXFile where = nullptr;
        unsigned line = 0;
        clang_getExpansionLocation(clang_getDiagnosticLocation(diagnostic.get()), &where, &line,
                                   nullptr, nullptr);
        if (where == nullptr || where == main_file) {
            // The change's own text (or a flag's): the report writers escape it.
            const std::string message =
                strip_virtual_root(take_string(clang_getDiagnosticSpelling(diagnostic.get())));
            warnings.push_back({path, where == nullptr ? 0 : line, missing_include_text(message)});
            continue;
        }
        if (!have_lines) {
            clang_getInclusions(unit, note_inclusion, &includes);
            have_lines = true;
        }
        const auto found = includes.line_of_file.find(where);
        const unsigned include_line = found == includes.line_of_file.end() ? 0 : found->second;
        const std::string file_name = take_string(clang_getFileName(where));
        if (in_revision(file_name)) {
            const std::string message =
                strip_virtual_root(take_string(clang_getDiagnosticSpelling(diagnostic.get())));
            warnings.push_back(
                {path, include_line,
                 "in \"" + strip_virtual_root(file_name) + "\": " + missing_include_text(message)});
        } else {
            warnings.push_back(
                {path, include_line,
                 "the parser met an error inside a header outside the revision, included from "
                 "here (its message is not shown: it may quote that header)"});
        }
    }
    if (errors > k_max_error_warnings) {
        warnings.push_back(
            {path, 0, std::to_string(errors - k_max_error_warnings) + " more errors"});
    }
    return warnings;
}

bool errors_before_main_code(CXTranslationUnit unit, CXFile main_file, const std::string& content) {
    // The first character of every line that starts (after blanks) with '#'.
    const auto directive_line = [&content](unsigned line) {
        std::size_t at = 0;
        for (unsigned l = 1; l < line && at != std::string::npos; ++l) {
            at = content.find('\n', at);
            at = at == std::string::npos ? at : at + 1;
        }
        if (at == std::string::npos) {
            return false;
        }
        at = content.find_first_not_of(" \t", at);
        return at != std::string::npos && content[at] == '#';
    };
    const unsigned count = clang_getNumDiagnostics(unit);
    for (unsigned i = 0; i < count; ++i) {
        const DiagnosticHandle diagnostic(clang_getDiagnostic(unit, i));
        if (clang_getDiagnosticSeverity(diagnostic.get()) < CXDiagnostic_Error) {
            continue;
        }
        CXFile file = nullptr;
        unsigned line = 0;
        clang_getExpansionLocation(clang_getDiagnosticLocation(diagnostic.get()), &file, &line,
                                   nullptr, nullptr);
        if (file == nullptr || !clang_File_isEqual(file, main_file) || directive_line(line)) {
            return true;
        }
    }
    return false;
}

} // namespace tollgate::lexer
