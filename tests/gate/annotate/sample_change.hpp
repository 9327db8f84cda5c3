// SPDX-License-Identifier: MIT
// Test support for the annotate tests: invented change reports, written as check writes them.
#pragma once

#include "gate/annotate/read_check_report.hpp"
#include "gate/report/change_report.hpp"

#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace tollgate::test {

// One touched function of an invented change.
struct SampleFunction {
    std::string name;       // qualified name
    std::string path;       // file, both sides
    unsigned line = 1;      // first line, both sides
    double base_effort = 0; // 0: the function is added
    double head_effort = 0; // effort on the head side
};

// Return a change of `functions` between two invented commits; with `blocking_first` the first
// function breaks the rule "effort-growth" and blocks the change.
inline annotate::CheckedChange
sample_change(const std::vector<SampleFunction>& functions, bool blocking_first,
              const std::string& head_commit = "9b1c0de2f4a6b8c0d2e4f6a8b0c2d4e6f8a0b2c4") {
    annotate::CheckedChange change;
    delta::ChangeReport& report = change.report;
    report.base_label = "main (3f2a91c)";
    report.head_label = "HEAD (" + head_commit.substr(0, 7) + ")";
    report.base_commit = "3f2a91c0e1d2c3b4a5f6e7d8c9b0a1f2e3d4c5b6";
    report.head_commit = head_commit;
    report.convention = "c-family/1";
    report.measured_files = 1;
    for (const auto& f : functions) {
        delta::FunctionDelta d;
        d.name = f.name;
        d.signature = "int";
        d.identity = "c:@F@" + f.name;
        delta::FunctionSide head;
        head.path = f.path;
        head.start_line = f.line;
        head.end_line = f.line + 9;
        head.token_hash = "h";
        head.measures.effort = f.head_effort;
        head.measures.volume = f.head_effort / 10;
        head.measures.difficulty = 10;
        d.head = head;
        if (f.base_effort > 0) {
            delta::FunctionSide base = head;
            base.token_hash = "b";
            base.measures.effort = f.base_effort;
            base.measures.volume = f.base_effort / 10;
            d.base = base;
            d.label = delta::DeltaLabel::changed;
        } else {
            d.label = delta::DeltaLabel::added;
        }
        report.functions.push_back(d);
    }
    delta::sort_deltas(report.functions);
    delta::compute_totals(report);
    change.verdict.policy_origin = "built-in default";
    if (blocking_first && !functions.empty()) {
        const auto& f = functions.front();
        policy::Finding finding;
        finding.rule_id = "effort-growth";
        finding.function = f.name;
        finding.signature = "int";
        finding.path = f.path;
        finding.start_line = f.line;
        finding.end_line = f.line + 9;
        finding.value = f.head_effort - f.base_effort;
        finding.limit = 50;
        finding.message = f.path + ":" + std::to_string(f.line) + ": " + f.name +
                          "(int): effort grew (rule \"effort-growth\", blocking)";
        change.verdict.findings.push_back(finding);
        change.verdict.outcome = policy::Outcome::blocked;
    }
    return change;
}

// Return `change` as the JSON "tollgate check --report json:PATH" writes.
inline std::string check_json(const annotate::CheckedChange& change) {
    std::ostringstream out;
    report::write_change_json(out, change.report, change.verdict);
    return out.str();
}

// Write `change` as check's JSON report to `path`.
inline void write_check_json(const annotate::CheckedChange& change, const std::string& path) {
    std::ofstream(path, std::ios::binary) << check_json(change);
}

} // namespace tollgate::test
