// SPDX-License-Identifier: MIT
// Diagnostics summarised per missing header.
#include "gate/lexer/missing_headers.hpp"

#include <algorithm>
#include <cstdlib>
#include <map>
#include <optional>

namespace tollgate::lexer {

namespace {

// Return the header name of a libclang "'NAME' file not found" message (possibly after
// `in "HEADER": `), or nothing.
std::optional<std::string> missing_name(const std::string& message) {
    static const std::string k_tail = "' file not found";
    if (message.size() <= k_tail.size() ||
        message.compare(message.size() - k_tail.size(), k_tail.size(), k_tail) != 0) {
        return std::nullopt;
    }
    const std::size_t end = message.size() - k_tail.size();
    const std::size_t open = message.rfind('\'', end - 1);
    if (open == std::string::npos) {
        return std::nullopt;
    }
    return message.substr(open + 1, end - open - 1);
}

// Return true for a warning the lexer writes itself rather than a parser diagnostic.
bool is_lexer_note(const std::string& message) {
    return message.find("measured lexically") != std::string::npos ||
           message.find("with brace matching of the source") != std::string::npos ||
           message.rfind("not a c or c++ file", 0) == 0;
}

// Return N of the lexer's "N more errors" summary line, or nothing.
std::optional<std::size_t> more_errors(const std::string& message) {
    static const std::string k_tail = " more errors";
    if (message.size() <= k_tail.size() ||
        message.compare(message.size() - k_tail.size(), k_tail.size(), k_tail) != 0) {
        return std::nullopt;
    }
    const std::string number = message.substr(0, message.size() - k_tail.size());
    if (number.empty() || number.find_first_not_of("0123456789") != std::string::npos) {
        return std::nullopt;
    }
    return static_cast<std::size_t>(std::strtoull(number.c_str(), nullptr, 10));
}

struct MissingHeader {
    std::size_t position = 0;       // index of its first "file not found" in the input
    LexWarning first;               // where it was first reported
    std::vector<std::string> files; // files that include it, in first-seen order
    std::size_t hidden = 0;         // parser errors of those files left out
};

} // namespace

WarningSummary summarise_missing_headers(const std::vector<LexWarning>& warnings) {
    WarningSummary summary;
    std::map<std::string, MissingHeader> headers;
    std::map<std::string, std::string> first_missing_of_file; // file -> header name
    for (std::size_t i = 0; i < warnings.size(); ++i) {
        const auto name = missing_name(warnings[i].message);
        if (!name) {
            continue;
        }
        auto [it, fresh] = headers.try_emplace(*name);
        if (fresh) {
            it->second.position = i;
            it->second.first = warnings[i];
        }
        auto& files = it->second.files;
        if (std::find(files.begin(), files.end(), warnings[i].path) == files.end()) {
            files.push_back(warnings[i].path);
        }
        first_missing_of_file.emplace(warnings[i].path, *name);
    }
    if (headers.empty()) {
        summary.warnings = warnings;
        return summary;
    }
    summary.headers_missing = true;
    for (const LexWarning& warning : warnings) {
        const auto file = first_missing_of_file.find(warning.path);
        if (file == first_missing_of_file.end() || is_lexer_note(warning.message) ||
            missing_name(warning.message)) {
            continue;
        }
        headers[file->second].hidden += more_errors(warning.message).value_or(1);
    }
    std::map<std::size_t, LexWarning> summaries; // by position of the first report
    for (const auto& [name, header] : headers) {
        const std::size_t others = header.files.size() - 1;
        std::string message = "header \"" + name + "\" not found";
        if (others > 0) {
            message += " (also included by " + std::to_string(others) + " more file" +
                       (others == 1 ? "" : "s") + ")";
        }
        if (header.hidden > 0) {
            message += ": " + std::to_string(header.hidden) + " later parse error" +
                       (header.hidden == 1 ? "" : "s") + " in " +
                       (header.files.size() == 1 ? "this file" : "these files") +
                       " not listed, measured anyway";
        }
        summaries[header.position] = {header.first.path, header.first.line, message};
    }
    for (std::size_t i = 0; i < warnings.size(); ++i) {
        if (const auto found = summaries.find(i); found != summaries.end()) {
            summary.warnings.push_back(found->second);
            continue;
        }
        const LexWarning& warning = warnings[i];
        const bool folded =
            first_missing_of_file.count(warning.path) != 0 && !is_lexer_note(warning.message);
        if (!folded) {
            summary.warnings.push_back(warning);
        }
    }
    return summary;
}

std::string include_folder_hint() {
    return "headers that are not in the repository were not found: give the build's "
           "compile_commands.json (--compile-commands), or name their folders with "
           "--include-dir DIR for the files it does not cover";
}

} // namespace tollgate::lexer
