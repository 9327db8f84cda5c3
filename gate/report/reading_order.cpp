// SPDX-License-Identifier: MIT
// Findings grouped per function in reading order; compiler diagnostics summed up.
#include "gate/report/reading_order.hpp"

#include "gate/common/text_safety.hpp"
#include "gate/report/change_report.hpp"

#include <algorithm>
#include <fmt/format.h>
#include <map>
#include <set>
#include <tuple>

namespace tollgate::report {

namespace {

using Key = std::tuple<std::string, std::string, unsigned>; // function, path, first line

Key key_of(const delta::FunctionDelta& f) {
    const auto& side = f.shown_side();
    return {f.name, side.path, side.start_line};
}

Key key_of(const policy::Finding& finding) {
    return {finding.function, finding.path, finding.start_line};
}

} // namespace

ReadingOrder order_for_reading(const delta::ChangeReport& report, const policy::Verdict& verdict) {
    // Groups in first-seen order of the verdict; then placed by the report's order.
    std::map<Key, std::size_t> index;
    std::vector<FunctionFindings> groups;
    for (const auto& finding : verdict.findings) {
        const Key key = key_of(finding);
        auto [it, inserted] = index.emplace(key, groups.size());
        if (inserted) {
            FunctionFindings group;
            group.function = finding.function;
            group.signature = finding.signature;
            group.path = finding.path;
            group.start_line = finding.start_line;
            groups.push_back(std::move(group));
        }
        FunctionFindings& group = groups[it->second];
        group.findings.push_back(&finding);
        if (finding.blocks()) {
            group.standing = Standing::blocks;
        }
    }
    ReadingOrder order;
    std::vector<bool> placed(groups.size(), false);
    const auto place = [&](std::size_t g) {
        placed[g] = true;
        auto& list = groups[g].standing == Standing::blocks ? order.blocking : order.warning;
        list.push_back(groups[g]);
    };
    for (const auto& f : report.functions) {
        const auto it = index.find(key_of(f));
        if (it == index.end()) {
            order.others.push_back(&f);
            continue;
        }
        if (!placed[it->second]) {
            groups[it->second].delta = &f;
            place(it->second);
        }
    }
    // Findings on no function of the report (a report cut short, a whole-change budget).
    for (std::size_t g = 0; g < groups.size(); ++g) {
        if (!placed[g] && !groups[g].function.empty()) {
            place(g);
        }
    }
    for (std::size_t g = 0; g < groups.size(); ++g) {
        if (!placed[g]) {
            place(g);
        }
    }
    return order;
}

Standing standing_of(const FunctionFindings* group) {
    return group == nullptr ? Standing::clear : group->standing;
}

std::string finding_detail(const policy::Finding& finding) {
    const std::string prefix =
        finding.function.empty() && finding.path.empty()
            ? std::string("the change: ")
            : fmt::format("{}:{}: {}({}): ", finding.path, finding.start_line, finding.function,
                          finding.signature);
    if (finding.message.size() > prefix.size() &&
        finding.message.compare(0, prefix.size(), prefix) == 0) {
        return finding.message.substr(prefix.size());
    }
    return finding.message;
}

std::string explain_command(const std::string& path, const std::string& function) {
    return "tollgate explain " + text::shell_word(path + ":" + function);
}

std::string missing_header_of(const std::string& message) {
    // The lexer's own words: `include "NAME" not found (...)`.
    static const std::string k_include = "include \"";
    static const std::string k_missing = "\" not found";
    if (const auto start = message.find(k_include); start != std::string::npos) {
        const auto from = start + k_include.size();
        const auto end = message.find(k_missing, from);
        if (end != std::string::npos && end > from) {
            return message.substr(from, end - from);
        }
    }
    static const std::string k_not_found = "' file not found";
    const auto end = message.find(k_not_found);
    if (end == std::string::npos || end == 0) {
        return {};
    }
    const auto start = message.rfind('\'', end - 1);
    if (start == std::string::npos || start + 1 >= end) {
        return {};
    }
    return message.substr(start + 1, end - start - 1);
}

DiagnosticsSummary summarise_diagnostics(const std::vector<delta::ChangeWarning>& warnings) {
    DiagnosticsSummary summary;
    std::set<std::string> files;
    std::map<std::string, std::size_t> by_header;
    for (const auto& w : warnings) {
        files.insert(w.path);
        // The lexer writes "N more errors" once per file past its own limit.
        std::size_t more = 0;
        const auto space = w.message.find(' ');
        if (space != std::string::npos && w.message.compare(space, 12, " more errors") == 0 &&
            w.message.size() == space + 12 && space > 0 && space < 10 &&
            std::all_of(w.message.begin(), w.message.begin() + static_cast<std::ptrdiff_t>(space),
                        [](unsigned char c) { return c >= '0' && c <= '9'; })) {
            more = static_cast<std::size_t>(std::stoul(w.message.substr(0, space)));
        }
        summary.warnings += more > 0 ? more : 1;
        const std::string header = missing_header_of(w.message);
        if (header.empty()) {
            summary.rest.push_back(&w);
            continue;
        }
        auto [it, inserted] = by_header.emplace(header, summary.missing_headers.size());
        if (inserted) {
            summary.missing_headers.push_back({header, 0, {}});
        }
        MissingHeader& group = summary.missing_headers[it->second];
        ++group.warnings;
        group.files.push_back(w.path);
    }
    summary.files = files.size();
    for (auto& group : summary.missing_headers) {
        std::sort(group.files.begin(), group.files.end());
        group.files.erase(std::unique(group.files.begin(), group.files.end()), group.files.end());
    }
    std::stable_sort(summary.missing_headers.begin(), summary.missing_headers.end(),
                     [](const MissingHeader& a, const MissingHeader& b) {
                         return std::tie(b.warnings, a.header) < std::tie(a.warnings, b.header);
                     });
    return summary;
}

std::string count_text(std::size_t count, const char* one, const char* many) {
    return group_thousands(static_cast<double>(count)) + " " + (count == 1 ? one : many);
}

std::string diagnostics_count_text(const DiagnosticsSummary& summary) {
    return count_text(summary.warnings, "parse warning", "parse warnings") + " in " +
           count_text(summary.files, "file", "files");
}

std::string include_folder_hint() {
    return "headers that are not in the repository were not found: give the build's "
           "compile_commands.json (--compile-commands), or name their folders with "
           "--include-dir DIR for the files it does not cover";
}

std::string compile_database_hint(const delta::ChangeReport& report,
                                  const DiagnosticsSummary& summary) {
    if (summary.warnings == 0 || report.files_without_compile_flags == 0) {
        return summary.missing_headers.empty() ? std::string() : include_folder_hint();
    }
    const std::string files = count_text(report.files_without_compile_flags, "file", "files");
    const std::string what = report.compile_database
                                 ? files + " had no entry in the compile database"
                                 : files + " were parsed without a compile database";
    return fmt::format("{}: to parse with the build's flags, give one with --compile-commands "
                       "PATH (CMake writes it with -DCMAKE_EXPORT_COMPILE_COMMANDS=ON){}",
                       report.files_without_compile_flags == 1 && !report.compile_database
                           ? files + " was parsed without a compile database"
                           : what,
                       summary.missing_headers.empty()
                           ? ""
                           : "; or name the folders of headers not in the repository with "
                             "--include-dir DIR");
}

} // namespace tollgate::report
