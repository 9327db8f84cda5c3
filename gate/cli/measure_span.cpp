// SPDX-License-Identifier: MIT
// From a lexed function to its counts and measures.
#include "gate/cli/measure_span.hpp"

#include "gate/report/reading_order.hpp"
#include "tollgate/core/counts.hpp"

#include <map>

namespace tollgate {

report::MeasuredFunction measure_span(const lexer::FunctionSpan& span,
                                      const core::MeasureSettings& settings) {
    report::MeasuredFunction measured;
    measured.path = span.path;
    measured.start_line = span.start_line;
    measured.end_line = span.end_line;
    measured.name = span.qualified_name;
    measured.signature = span.signature;
    measured.lexical = span.mode == lexer::ExtentMode::lexical;
    measured.parser_stopped = span.mode == lexer::ExtentMode::parser_stopped;
    measured.inactive = span.inactive;
    measured.brace_extent = span.brace_extent;
    measured.counts = core::count_tokens(span.tokens);
    measured.measures = core::compute_measures(measured.counts, span.potential_operands, settings);
    return measured;
}

namespace {

// Return true for a warning the lexer writes itself rather than a parser diagnostic.
bool is_lexer_note(const std::string& message) {
    return message.find("measured lexically") != std::string::npos ||
           message.find("with brace matching of the source") != std::string::npos ||
           message.rfind("not a c or c++ file", 0) == 0;
}

// Return N of the lexer's "N more errors" line, else 1.
std::size_t errors_in(const std::string& message) {
    const auto space = message.find(' ');
    if (space == std::string::npos || space == 0 || space > 9 ||
        message.compare(space, std::string::npos, " more errors") != 0 ||
        message.find_first_not_of("0123456789") != space) {
        return 1;
    }
    return static_cast<std::size_t>(std::stoul(message.substr(0, space)));
}

} // namespace

std::vector<report::SourceWarning>
collect_warnings(const std::vector<lexer::FileFunctions>& files) {
    std::vector<delta::ChangeWarning> all;
    for (const auto& file : files) {
        for (const auto& w : file.warnings) {
            all.push_back({"", w.path, w.line, w.message});
        }
    }
    const report::DiagnosticsSummary summary = report::summarise_diagnostics(all);
    if (summary.missing_headers.empty()) {
        std::vector<report::SourceWarning> warnings;
        for (const auto& w : all) {
            warnings.push_back({w.path, w.line, w.message});
        }
        return warnings;
    }
    // A missing header's declarations make the rest of its includers unreadable: their other
    // parser errors are counted under the first header each file misses, not listed.
    std::map<std::string, std::string> first_missing;                // file -> header
    std::map<std::string, const delta::ChangeWarning*> first_report; // header -> first warning
    for (const auto& w : all) {
        const std::string header = report::missing_header_of(w.message);
        if (!header.empty()) {
            first_missing.emplace(w.path, header);
            first_report.emplace(header, &w);
        }
    }
    std::map<std::string, std::size_t> hidden; // header -> errors left out
    for (const auto* w : summary.rest) {
        const auto file = first_missing.find(w->path);
        if (file != first_missing.end() && !is_lexer_note(w->message)) {
            hidden[file->second] += errors_in(w->message);
        }
    }
    std::vector<report::SourceWarning> warnings;
    for (const auto& group : summary.missing_headers) {
        const delta::ChangeWarning& first = *first_report.at(group.header);
        std::string message = "header \"" + group.header + "\" not found";
        if (group.files.size() > 1) {
            message += " (also included by " +
                       report::count_text(group.files.size() - 1, "more file", "more files") + ")";
        }
        if (const std::size_t left_out = hidden[group.header]; left_out > 0) {
            message += ": " +
                       report::count_text(left_out, "later parse error", "later parse errors") +
                       " in " + (group.files.size() == 1 ? "this file" : "these files") +
                       " not listed, measured anyway";
        }
        warnings.push_back({first.path, first.line, message});
    }
    for (const auto* w : summary.rest) {
        if (first_missing.count(w->path) == 0 || is_lexer_note(w->message)) {
            warnings.push_back({w->path, w->line, w->message});
        }
    }
    warnings.push_back({"", 0, report::include_folder_hint()}); // said once, as a note
    return warnings;
}

} // namespace tollgate
