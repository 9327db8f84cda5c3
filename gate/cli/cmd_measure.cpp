// SPDX-License-Identifier: MIT
// `tollgate measure`: per-function measures of files or a whole tree.
#include "gate/cli/commands.hpp"
#include "gate/cli/measure_span.hpp"
#include "gate/cli/options.hpp"
#include "gate/cli/report_targets.hpp"
#include "gate/cli/sources.hpp"
#include "gate/common/errors.hpp"
#include "gate/java/java_front_end.hpp"
#include "gate/lexer/lex_files.hpp"
#include "tollgate/core/convention.hpp"

#include <iostream>
#include <memory>

namespace tollgate {

namespace {

struct MeasureOptions {
    SourceOptions sources;       // --rev, paths, compile database, cache
    std::string format = "text"; // text or json
    bool all_measures = false;   // every measure, not the essential columns
    bool wide = false;           // -w, --wide: every column, whole names
    unsigned jobs = 0;           // parser threads, 0 = all cores
    IsolationOptions isolation;  // --parse-timeout, --parse-memory
    double stroud = 18.0;        // Stroud number for T
    std::uint64_t max_file_size = k_default_max_file_size; // --max-file-size
};

int run_measure(const MeasureOptions& options) {
    apply_isolation_options(options.isolation);
    SourceRequest request = to_request(options.sources);
    request.max_file_size = options.max_file_size;
    const LoadedSources loaded = load_sources(request);
    const auto files = lexer::lex_files(loaded.selected, loaded.context, options.jobs);
    core::MeasureSettings settings;
    settings.stroud = options.stroud;
    std::vector<report::MeasuredFunction> functions;
    for (const auto& file : files) {
        for (const auto& span : file.functions) {
            functions.push_back(measure_span(span, settings));
        }
    }
    auto warnings = collect_warnings(files);
    for (const auto& file : loaded.oversized) {
        warnings.push_back(
            {file.path, 0, "not measured, " + oversized_reason(file.size, request.max_file_size)});
    }
    if (options.format == "json") {
        report::write_measure_json(std::cout, functions, warnings, loaded.label,
                                   java::build_fingerprint(loaded.context.convention));
    } else {
        report::write_measure_text(
            std::cout, functions, warnings,
            options.all_measures ? report::Columns::all : report::Columns::essential, loaded.label,
            terminal_width(), options.wide ? report::Fit::wide : report::Fit::to_width);
    }
    return 0;
}

} // namespace

void attach_measure(CLI::App& sub, const GlobalOptions& /*global*/,
                    std::function<int()>& selected) {
    auto options = std::make_shared<MeasureOptions>();
    sub.description("Measure every function definition of C/C++ files: n1 n2 N1 N2, volume V, "
                    "difficulty D and effort E per function, with a total line.");
    add_source_options(sub, options->sources,
                       "Files or folders to measure (default: every "
                       "C/C++ file of the source)");
    sub.add_option("--format", options->format, "Output format")
        ->check(CLI::IsMember({"text", "json"}))
        ->capture_default_str();
    sub.add_flag("-w,--wide", options->wide,
                 "Show every column and whole names (default: fit the terminal's width, or 100 "
                 "columns when not a terminal)");
    sub.add_flag("-a,--all-measures", options->all_measures,
                 "Show every measure (N n N^ V D L^ E T B V* V*/V), not only the essential ones");
    add_jobs_option(sub, options->jobs);
    add_isolation_options(sub, options->isolation);
    add_stroud_option(sub, options->stroud);
    add_max_file_size_option(sub, options->max_file_size);
    sub.footer("Examples:\n"
               "  tollgate measure src/filter.cpp            the working tree's file\n"
               "  tollgate measure --rev HEAD~3 src/         every file under src/ three commits "
               "ago\n"
               "  tollgate measure --format json > m.json    the whole tree as JSON");
    sub.callback([options, &selected] { selected = [options] { return run_measure(*options); }; });
}

} // namespace tollgate
