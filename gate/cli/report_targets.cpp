// SPDX-License-Identifier: MIT
// Report targets and writing reports to them.
#include "gate/cli/report_targets.hpp"

#include "gate/common/errors.hpp"
#include "gate/common/output_file.hpp"
#include "gate/report/sarif.hpp"

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <sstream>
#include <sys/ioctl.h>
#include <unistd.h>

namespace tollgate {

namespace {

const std::vector<std::pair<std::string, ReportFormat>>& format_names() {
    static const std::vector<std::pair<std::string, ReportFormat>> names = {
        {"text", ReportFormat::text},
        {"markdown", ReportFormat::markdown},
        {"json", ReportFormat::json},
        {"sarif", ReportFormat::sarif},
    };
    return names;
}

// Everything a renderer may need about one change.
struct Judged {
    const delta::ChangeReport& report;
    const policy::Verdict& verdict;
    const policy::Policy& policy;
};

void render(std::ostream& out, ReportFormat format, const Judged& judged,
            const report::RenderOptions& options) {
    switch (format) {
    case ReportFormat::text:
        report::write_change_text(out, judged.report, judged.verdict, options);
        break;
    case ReportFormat::markdown:
        report::write_change_markdown(out, judged.report, judged.verdict, options);
        break;
    case ReportFormat::json:
        report::write_change_json(out, judged.report, judged.verdict);
        break;
    case ReportFormat::sarif:
        report::write_sarif(out, judged.report, judged.verdict, judged.policy);
        break;
    }
}

} // namespace

std::vector<ReportTarget> parse_report_targets(const std::vector<std::string>& specs) {
    std::vector<ReportTarget> targets;
    for (const auto& spec : specs) {
        const auto colon = spec.find(':');
        const std::string name = spec.substr(0, colon);
        const std::string path =
            colon == std::string::npos ? std::string() : spec.substr(colon + 1);
        std::vector<std::string> known;
        const ReportFormat* format = nullptr;
        for (const auto& [candidate, value] : format_names()) {
            known.push_back(candidate);
            if (candidate == name) {
                format = &value;
            }
        }
        if (format == nullptr) {
            const std::string suggestion = closest_match(name, known);
            throw UsageError("unknown report format \"" + name + "\" in \"" + spec + "\"" +
                             (suggestion.empty() ? " (expected text, markdown, json or sarif)"
                                                 : " (did you mean \"" + suggestion + "\"?)"));
        }
        if (path.empty()) {
            throw UsageError("report \"" + spec + "\" has no path (write FORMAT:PATH, or " + name +
                             ":- for stdout)");
        }
        targets.push_back({*format, path});
    }
    return targets;
}

void check_report_targets(const std::vector<ReportTarget>& targets) {
    for (const auto& target : targets) {
        if (target.path != "-") {
            check_writable("report", target.path);
        }
    }
}

std::size_t terminal_width() {
    constexpr std::size_t k_fallback = 100;
    if (const char* columns = std::getenv("COLUMNS"); columns != nullptr && *columns != '\0') {
        const std::string text(columns);
        if (text.size() <= 5 && text.find_first_not_of("0123456789") == std::string::npos) {
            const auto value = std::stoul(text);
            if (value >= 20 && value <= 10000) {
                return value;
            }
        }
    }
    winsize size{};
    if (::isatty(STDOUT_FILENO) == 1 && ::ioctl(STDOUT_FILENO, TIOCGWINSZ, &size) == 0 &&
        size.ws_col >= 20) {
        return size.ws_col;
    }
    return k_fallback;
}

void write_reports(const delta::ChangeReport& report, const policy::Verdict& verdict,
                   const policy::Policy& policy, const std::vector<ReportTarget>& targets,
                   report::RenderOptions options, bool no_colour) {
    const Judged judged{report, verdict, policy};
    const char* no_color_env = std::getenv("NO_COLOR");
    const bool colour_stdout = !no_colour && (no_color_env == nullptr || *no_color_env == '\0') &&
                               ::isatty(STDOUT_FILENO) == 1;
    bool stdout_used = false;
    for (const auto& target : targets) {
        if (target.path == "-") {
            stdout_used = true;
            report::RenderOptions stdout_options = options;
            stdout_options.colour = colour_stdout && target.format == ReportFormat::text
                                        ? report::Colour::on
                                        : report::Colour::off;
            stdout_options.width = terminal_width();
            render(std::cout, target.format, judged, stdout_options);
        } else {
            std::ostringstream buffer;
            options.colour = report::Colour::off;
            options.width = 100;
            render(buffer, target.format, judged, options);
            write_output_file("report", target.path, buffer.str());
        }
    }
    if (!stdout_used) {
        options.colour = colour_stdout ? report::Colour::on : report::Colour::off;
        options.width = terminal_width();
        report::write_change_text(std::cout, report, verdict, options);
    }
    std::cout.flush();
}

} // namespace tollgate
