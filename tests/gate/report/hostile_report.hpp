// SPDX-License-Identifier: MIT
// Test support for the writers: a change report whose every text is hostile (invalid UTF-8,
// terminal escape sequences, newlines, Markdown and HTML), judged by a real policy.
#pragma once

#include "../policy/policy_test_support.hpp"
#include "gate/delta/function_delta.hpp"
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"

#include <string>

namespace tollgate::test {

// A change and its judgement.
struct HostileChange {
    delta::ChangeReport report;
    policy::Policy policy;
    policy::Verdict verdict;
};

// Paths of the hostile report, each trying another way out of its place.
inline const std::vector<std::string>& hostile_paths() {
    static const std::vector<std::string> paths = {
        "src/caf\xE9.c",                           // Latin-1: not UTF-8
        "src/a\nb|c `d`.cpp",                      // a newline, a pipe and backticks
        "src/<script>alert(1)</script>.c",         // raw HTML
        "src/[x](https://evil.example) www.e.x.c", // a link and autolinks
        "# heading \x1b[2J\x1b]0;title\x07.c",     // a heading, a screen clear, a window title
        "src/\xE2\x80\xAE"
        "c.exe.c", // a right-to-left override
    };
    return paths;
}

// Return the hostile change: one function per hostile path (names just as hostile), a Latin-1
// note, skipped file and parser warning, judged by a policy whose rules every function breaks.
inline HostileChange hostile_change() {
    const std::vector<std::string> names = {"caf\xE9::run",
                                            "evil`name|<b>x</b>",
                                            "operator|",
                                            "www.evil.example",
                                            "- list\x1b[31m",
                                            "x\xC2\x9B"
                                            "31m"};
    HostileChange h;
    std::vector<delta::FunctionDelta> functions;
    for (std::size_t i = 0; i < hostile_paths().size(); ++i) {
        auto f = i % 2 == 0
                     ? changed(names[i], hostile_paths()[i], 10 + unsigned(i), small_measures(),
                               large_measures())
                     : added(names[i], hostile_paths()[i], 10 + unsigned(i), large_measures());
        f.signature = "char \xFF*";
        functions.push_back(f);
    }
    h.report = report_of(functions);
    h.report.base_label = "main\x1b]0;pwned\x07";
    h.report.head_label = "feature/caf\xE9";
    h.report.convention = "c-family/1";
    h.report.notes = {"note with \x1b[31mred\x1b[0m and caf\xE9"};
    h.report.skipped = {{"docs/\x1b[31mlogo\n.png", "binary"}};
    h.report.warnings = {{"head", "src/w\ne.c", 3, "message caf\xE9 <img src=x onerror=y()>"}};
    h.report.measured_files = static_cast<unsigned>(functions.size());
    delta::sort_deltas(h.report.functions);
    delta::compute_totals(h.report);
    h.policy = policy::load_policy(R"(tollgate-policy: 1
rules:
  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 40}
  - {id: new-function-volume, kind: added-ceiling, measure: volume, ceiling: 200, level: warning}
  - {id: change-effort-budget, kind: budget, measure: effort, max-total-increase: 1000}
)",
                                   "hostile.yaml");
    policy::JudgeOptions options;
    options.today = "2026-05-01";
    options.policy_origin = ".tollgate.yaml at base \x1b[5mblink";
    h.verdict = policy::judge(h.policy, h.report, options);
    h.verdict.policy_change_summary = "this change edits .tollgate.yaml\n# not a heading";
    h.verdict.policy_changes = {"rules[\"\x1b[31m\"]: <i>added</i> in head"};
    return h;
}

} // namespace tollgate::test
