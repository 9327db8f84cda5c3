// SPDX-License-Identifier: MIT
// `tollgate explain`: the operator and operand tables behind one function's measures.
#include "gate/cli/commands.hpp"
#include "gate/cli/measure_span.hpp"
#include "gate/cli/options.hpp"
#include "gate/cli/sources.hpp"
#include "gate/common/byte_size.hpp"
#include "gate/common/errors.hpp"
#include "gate/java/java_front_end.hpp"
#include "gate/lexer/lex_files.hpp"
#include "tollgate/core/convention.hpp"

#include <algorithm>
#include <fmt/format.h>
#include <iostream>
#include <memory>
#include <optional>

namespace tollgate {

namespace {

struct ExplainOptions {
    std::string target;                                    // PATH:FUNCTION or PATH:LINE
    SourceOptions sources;                                 // --rev and parsing options
    std::string format = "text";                           // text or json
    double stroud = 18.0;                                  // Stroud number
    IsolationOptions isolation;                            // --parse-timeout, --parse-memory
    std::uint64_t max_file_size = k_default_max_file_size; // --max-file-size
};

// Return true when `name` is `wanted` or ends with "::" + `wanted` (C++) or "." + `wanted`
// (Java).
bool name_matches(const std::string& name, const std::string& wanted) {
    if (name == wanted) {
        return true;
    }
    for (const std::string& suffix : {"::" + wanted, "." + wanted}) {
        if (name.size() > suffix.size() &&
            name.compare(name.size() - suffix.size(), suffix.size(), suffix) == 0) {
            return true;
        }
    }
    return false;
}

bool all_digits(const std::string& text) {
    return !text.empty() &&
           std::all_of(text.begin(), text.end(), [](unsigned char c) { return std::isdigit(c); });
}

// Return the number of lines of `content`; a last line without a newline counts.
std::uint64_t line_count(const std::string& content) {
    const auto newlines =
        static_cast<std::uint64_t>(std::count(content.begin(), content.end(), '\n'));
    return newlines + (content.empty() || content.back() == '\n' ? 0 : 1);
}

// Return the line `digits` names, or nothing when it is past any line a file can have.
std::optional<std::uint64_t> parse_line(const std::string& digits) {
    std::uint64_t line = 0;
    for (const char c : digits) {
        const auto digit = static_cast<std::uint64_t>(c - '0');
        if (line > (UINT64_MAX - digit) / 10) {
            return std::nullopt;
        }
        line = line * 10 + digit;
    }
    return line;
}

// Return the text of the hint that lists a file's functions: the command with the --rev the user
// gave (`revision`, empty for the working tree).
std::string measure_hint(const std::string& path, const std::string& revision) {
    return "tollgate measure " + (revision.empty() ? "" : "--rev " + revision + " ") + path;
}

// Return the functions of `spans` holding line `wanted` (digits) of `path`, a file of `lines`
// lines; `revision` as for measure_hint. Throws UsageError for line 0 and a line past the end of
// the file.
std::vector<const lexer::FunctionSpan*>
functions_at_line(const std::vector<lexer::FunctionSpan>& spans, const std::string& path,
                  const std::string& wanted, std::uint64_t lines, const std::string& revision) {
    const std::optional<std::uint64_t> line = parse_line(wanted);
    if (line && *line == 0) {
        throw UsageError("there is no line 0 in \"" + path + "\" (lines count from 1)");
    }
    if (!line || *line > lines) {
        throw UsageError(fmt::format("line {} is past the end of \"{}\" (it has {} line{})", wanted,
                                     path, lines, lines == 1 ? "" : "s"));
    }
    std::vector<const lexer::FunctionSpan*> matches;
    for (const auto& span : spans) {
        if (span.start_line <= *line && *line <= span.end_line) {
            matches.push_back(&span);
        }
    }
    if (matches.empty()) {
        throw UsageError(fmt::format("no function holds line {} of \"{}\" (run \"{}\" to list its "
                                     "functions)",
                                     *line, path, measure_hint(path, revision)));
    }
    return matches;
}

// Pick the function `wanted` (a name or a line number) names among `spans` of `path`, a file of
// `lines` lines; `revision` is the --rev the user gave (empty for the working tree), repeated in
// the hint.
const lexer::FunctionSpan& pick_function(const std::vector<lexer::FunctionSpan>& spans,
                                         const std::string& path, const std::string& wanted,
                                         std::uint64_t lines, const std::string& revision) {
    std::vector<const lexer::FunctionSpan*> matches;
    if (all_digits(wanted)) {
        matches = functions_at_line(spans, path, wanted, lines, revision);
    } else {
        // A name made by a test macro holds parentheses itself: "TEST(Suite, Name)".
        for (const auto& span : spans) {
            if (name_matches(span.qualified_name, wanted)) {
                matches.push_back(&span);
            }
        }
    }
    if (matches.empty() && !all_digits(wanted)) {
        std::string name = wanted;
        const auto paren = name.find('(');
        std::string signature;
        if (paren != std::string::npos && name.back() == ')') {
            signature = name.substr(paren + 1, name.size() - paren - 2);
            name = name.substr(0, paren);
        }
        for (const auto& span : spans) {
            if (name_matches(span.qualified_name, name) &&
                (paren == std::string::npos || span.signature == signature)) {
                matches.push_back(&span);
            }
        }
    }
    if (matches.size() == 1) {
        return *matches.front();
    }
    if (matches.empty()) {
        std::vector<std::string> names;
        for (const auto& span : spans) {
            names.push_back(span.qualified_name);
            const auto colon = span.qualified_name.rfind("::");
            if (colon != std::string::npos) {
                names.push_back(span.qualified_name.substr(colon + 2));
            } else if (const auto dot = span.qualified_name.rfind('.'); dot != std::string::npos) {
                names.push_back(span.qualified_name.substr(dot + 1)); // a Java name
            }
        }
        const std::string suggestion = closest_match(wanted, names);
        throw UsageError(fmt::format("no function \"{}\" in \"{}\"{}", wanted, path,
                                     suggestion.empty()
                                         ? " (run \"" + measure_hint(path, revision) +
                                               "\" to list its functions)"
                                         : " (did you mean \"" + suggestion + "\"?)"));
    }
    std::string candidates;
    for (const auto* span : matches) {
        candidates += fmt::format("{}{}:{} {}({})", candidates.empty() ? "" : ", ", path,
                                  span->start_line, span->qualified_name, span->signature);
    }
    // One line: an error message is printed as one line (see run_cli).
    throw UsageError(fmt::format("\"{}\" matches {} functions in \"{}\": {} (name one as "
                                 "PATH:LINE or PATH:NAME(SIGNATURE))",
                                 wanted, matches.size(), path, candidates));
}

int run_explain(const ExplainOptions& options) {
    apply_isolation_options(options.isolation);
    const auto colon = options.target.rfind(':');
    if (colon == std::string::npos || colon == 0 || colon + 1 == options.target.size()) {
        throw UsageError("expected PATH:FUNCTION, got \"" + options.target +
                         "\" (for example \"src/filter.cpp:Kalman::update\")");
    }
    // A qualified name holds "::"; split at the first single colon after the path instead.
    std::size_t split = options.target.find(':');
    while (split != std::string::npos && split + 1 < options.target.size() &&
           options.target[split + 1] == ':') {
        split = options.target.find(':', split + 2);
    }
    const std::string path = options.target.substr(0, split);
    const std::string wanted = options.target.substr(split + 1);

    ExplainOptions adjusted = options;
    adjusted.sources.paths = {path};
    SourceRequest request = to_request(adjusted.sources);
    request.max_file_size = options.max_file_size;
    const LoadedSources loaded = load_sources(request);
    if (loaded.selected.empty() && loaded.oversized.size() == 1) {
        throw UsageError(fmt::format(
            "\"{}\" was not read: {} is over the {} limit (raise it with --max-file-size)", path,
            format_byte_size(loaded.oversized.front().size),
            format_byte_size(options.max_file_size)));
    }
    if (loaded.selected.size() != 1) {
        throw UsageError("\"" + path + "\" names " + std::to_string(loaded.selected.size()) +
                         " files (explain takes one file)");
    }
    const auto files = lexer::lex_files(loaded.selected, loaded.context, 1);
    const auto& span =
        pick_function(files.front().functions, path, wanted,
                      line_count(loaded.selected.front().content), options.sources.revision);
    core::MeasureSettings settings;
    settings.stroud = options.stroud;
    const auto measured = measure_span(span, settings);
    const std::string convention = java::build_fingerprint(loaded.context.convention);
    if (options.format == "json") {
        report::write_explain_json(std::cout, measured, loaded.label, convention);
    } else {
        report::write_explain_text(std::cout, measured, loaded.label, convention, options.stroud);
    }
    return 0;
}

} // namespace

void attach_explain(CLI::App& sub, const GlobalOptions& /*global*/,
                    std::function<int()>& selected) {
    auto options = std::make_shared<ExplainOptions>();
    sub.description("Show one function's operators and operands (each distinct token, how often "
                    "it occurs, and which form an ambiguous punctuator was counted as) and every "
                    "measure computed from them.");
    sub.add_option("target", options->target,
                   "PATH:FUNCTION (a name, a qualified name, NAME(SIGNATURE)) or PATH:LINE")
        ->required();
    add_source_options(sub, options->sources, "");
    sub.add_option("--format", options->format, "Output format")
        ->check(CLI::IsMember({"text", "json"}))
        ->capture_default_str();
    add_stroud_option(sub, options->stroud);
    add_max_file_size_option(sub, options->max_file_size);
    add_isolation_options(sub, options->isolation);
    sub.footer("Examples:\n"
               "  tollgate explain src/filter.cpp:Kalman::update\n"
               "  tollgate explain src/crc.c:crc16 --rev HEAD~1\n"
               "  tollgate explain src/ring.cpp:42           the function holding line 42");
    sub.callback([options, &selected] { selected = [options] { return run_explain(*options); }; });
}

} // namespace tollgate
