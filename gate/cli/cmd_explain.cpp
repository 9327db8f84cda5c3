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
#include "gate/report/explain_change.hpp"
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
    std::string base;   // --base REV: compare with the function at this revision
    std::string change; // --change BASE..HEAD: compare the function at both revisions
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

// The base side of a comparison: the function of `path` at `revision` that `head` is, found by
// its qualified name and signature, else by its name when that is unique; none when the file or
// the function is not there.
std::optional<report::MeasuredFunction>
find_base(const ExplainOptions& options, const std::string& revision, const std::string& path,
          const lexer::FunctionSpan& head, std::string& how, std::string& label) {
    SourceOptions sources = options.sources;
    sources.revision = revision;
    sources.paths = {path};
    SourceRequest request = to_request(sources);
    request.allow_missing = true;
    const LoadedSources loaded = load_sources(request);
    label = loaded.label;
    if (loaded.selected.size() != 1) {
        return std::nullopt;
    }
    const auto files = lexer::lex_files(loaded.selected, loaded.context, 1);
    const lexer::FunctionSpan* found = nullptr;
    std::vector<const lexer::FunctionSpan*> named;
    for (const auto& span : files.front().functions) {
        if (span.qualified_name != head.qualified_name) {
            continue;
        }
        named.push_back(&span);
        if (span.signature == head.signature && found == nullptr) {
            found = &span;
        }
    }
    if (found != nullptr) {
        how = "same name and signature";
    } else if (named.size() == 1) {
        found = named.front();
        how = "same name, signature was (" + found->signature + ")";
    } else {
        return std::nullopt;
    }
    core::MeasureSettings settings;
    settings.stroud = options.stroud;
    return measure_span(*found, settings);
}

// Split --change BASE..HEAD into the base revision and `adjusted`'s head revision.
std::string split_change(const ExplainOptions& options, ExplainOptions& adjusted) {
    const std::string& change = options.change;
    const auto dots = change.find("..");
    if (dots == std::string::npos || dots == 0 || dots + 2 >= change.size() ||
        change.find("..", dots + 2) != std::string::npos || change[dots + 2] == '.') {
        throw UsageError("--change expects BASE..HEAD, got \"" + change +
                         "\" (for example \"main..HEAD\")");
    }
    if (!options.sources.revision.empty() || !options.base.empty()) {
        throw UsageError("--change names both revisions: leave out --rev and --base");
    }
    adjusted.sources.revision = change.substr(dots + 2);
    return change.substr(0, dots);
}

// Split PATH:FUNCTION (or PATH:LINE) into its path and the function wanted.
std::pair<std::string, std::string> split_target(const std::string& target) {
    const auto colon = target.rfind(':');
    if (colon == std::string::npos || colon == 0 || colon + 1 == target.size()) {
        throw UsageError("expected PATH:FUNCTION, got \"" + target +
                         "\" (for example \"src/filter.cpp:Kalman::update\")");
    }
    // A qualified name holds "::"; split at the first single colon after the path instead.
    std::size_t split = target.find(':');
    while (split != std::string::npos && split + 1 < target.size() && target[split + 1] == ':') {
        split = target.find(':', split + 2);
    }
    return {target.substr(0, split), target.substr(split + 1)};
}

// Write the two sides of `head` (measured as `measured`) compared, as text or JSON.
void write_comparison(const ExplainOptions& options, const ExplainOptions& adjusted,
                      const std::string& base_revision, const std::string& path,
                      const lexer::FunctionSpan& head, const report::MeasuredFunction& measured,
                      const LoadedSources& loaded) {
    report::FunctionComparison comparison;
    comparison.head = measured;
    comparison.head_label = loaded.label;
    comparison.convention = java::build_fingerprint(loaded.context.convention);
    comparison.base = find_base(adjusted, base_revision, path, head, comparison.base_match,
                                comparison.base_label);
    if (options.format == "json") {
        report::write_explain_change_json(std::cout, comparison);
    } else {
        report::write_explain_change_text(std::cout, comparison);
    }
}

int run_explain(const ExplainOptions& options) {
    apply_isolation_options(options.isolation);
    ExplainOptions adjusted = options;
    const std::string base_revision =
        options.change.empty() ? options.base : split_change(options, adjusted);
    const auto [path, wanted] = split_target(options.target);
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
    if (!base_revision.empty()) {
        write_comparison(options, adjusted, base_revision, path, span, measured, loaded);
        return 0;
    }
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
    auto* base = sub.add_option("--base", options->base,
                                "Compare with the same function at this revision: both sides' "
                                "operators and operands side by side, and the difference per "
                                "token (the head is --rev, else the working tree)");
    sub.add_option("--change", options->change,
                   "BASE..HEAD: compare the function at two revisions (what a check's finding "
                   "tells you to run)")
        ->excludes(base);
    sub.add_option("--format", options->format, "Output format")
        ->check(CLI::IsMember({"text", "json"}))
        ->capture_default_str();
    add_stroud_option(sub, options->stroud);
    add_max_file_size_option(sub, options->max_file_size);
    add_isolation_options(sub, options->isolation);
    sub.footer("Examples:\n"
               "  tollgate explain src/filter.cpp:Kalman::update\n"
               "  tollgate explain src/crc.c:crc16 --rev HEAD~1\n"
               "  tollgate explain src/ring.cpp:42           the function holding line 42\n"
               "  tollgate explain --change main..HEAD src/filter.cpp:Kalman::update\n"
               "                                             what grew, token by token");
    sub.callback([options, &selected] { selected = [options] { return run_explain(*options); }; });
}

} // namespace tollgate
