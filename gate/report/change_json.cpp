// SPDX-License-Identifier: MIT
// The change report as JSON, schema "tollgate.check/1".
#include "gate/common/text_safety.hpp"
#include "gate/report/change_report.hpp"
#include "gate/report/marks.hpp"
#include "gate/report/reading_order.hpp"

#include <nlohmann/json.hpp>

namespace tollgate::report {

namespace {

using nlohmann::json;

json side_json(const std::optional<delta::FunctionSide>& side) {
    if (!side) {
        return nullptr;
    }
    json measures = json::object();
    for (const auto id : core::k_all_measures) {
        measures[std::string(core::measure_name(id))] = core::measure_value(side->measures, id);
    }
    return {{"file", side->path},
            {"line", side->start_line},
            {"end_line", side->end_line},
            {"extent", side->parser_stopped ? "parser-stopped"
                       : side->lexical      ? "lexical"
                                            : "syntax-tree"},
            {"marks", mark_words(marks_of(*side))},
            {"token_hash", side->token_hash},
            {"measures", measures}};
}

json delta_json(const delta::FunctionDelta& f) {
    json deltas = json::object();
    for (const auto id : core::k_all_measures) {
        const auto d = f.delta(id);
        deltas[std::string(core::measure_name(id))] = {
            {"absolute", d.absolute}, {"percent", d.percent ? json(*d.percent) : json(nullptr)}};
    }
    return deltas;
}

json totals_json(const delta::Totals& t) {
    return {{"functions", t.functions},
            {"added", t.added},
            {"changed", t.changed},
            {"removed", t.removed},
            {"volume", {{"base", t.base_volume}, {"head", t.head_volume}}},
            {"effort", {{"base", t.base_effort}, {"head", t.head_effort}}},
            {"difficulty_max", {{"base", t.base_difficulty_max}, {"head", t.head_difficulty_max}}}};
}

json verdict_json(const policy::Verdict& verdict) {
    json findings = json::array();
    for (const auto& f : verdict.findings) {
        findings.push_back({{"rule", f.rule_id},
                            {"kind", policy::rule_kind_name(f.kind)},
                            {"level", policy::level_name(f.level)},
                            {"measure", f.kind == policy::RuleKind::unmeasured_lines
                                            ? json(nullptr)
                                            : json(std::string(core::measure_name(f.measure)))},
                            {"function", f.function},
                            {"signature", f.signature},
                            {"file", f.path},
                            {"line", f.start_line},
                            {"end_line", f.end_line},
                            {"value", f.value},
                            {"limit", f.limit},
                            {"excess", f.excess},
                            {"percent", f.percent},
                            {"grandfathered", f.grandfathered},
                            {"message", f.message}});
    }
    return {{"outcome", policy::outcome_name(verdict.outcome)},
            {"policy", verdict.policy_origin},
            {"policy_change", verdict.policy_change_summary},
            {"policy_differences", verdict.policy_changes},
            {"findings", findings},
            {"notes", verdict.notes}};
}

// The warnings summed up: every one stays in "warnings"; here they are counted and grouped by
// the header they could not find.
json diagnostics_json(const delta::ChangeReport& report) {
    const auto summary = summarise_diagnostics(report.warnings);
    json groups = json::array();
    for (const auto& group : summary.missing_headers) {
        groups.push_back(
            {{"header", group.header}, {"warnings", group.warnings}, {"files", group.files}});
    }
    const std::string hint = compile_database_hint(report, summary);
    return {{"warnings", summary.warnings},
            {"files", summary.files},
            {"missing_headers", groups},
            {"other_warnings", summary.rest.size()},
            {"compile_database", report.compile_database},
            {"files_without_compile_flags", report.files_without_compile_flags},
            {"hint", hint.empty() ? json(nullptr) : json(hint)}};
}

} // namespace

void write_change_json(std::ostream& out, const delta::ChangeReport& report,
                       const policy::Verdict& verdict) {
    json functions = json::array();
    for (const auto& f : report.functions) {
        functions.push_back(
            {{"label", delta::label_name(f.label)},
             {"function", f.name},
             {"signature", f.signature},
             {"identity", f.identity},
             {"base_function", f.base_name ? json(*f.base_name) : json(nullptr)},
             {"base_signature", f.base_signature ? json(*f.base_signature) : json(nullptr)},
             {"base", side_json(f.base)},
             {"head", side_json(f.head)},
             {"delta", delta_json(f)}});
    }
    json files = json::array();
    for (const auto& file : report.files) {
        files.push_back({{"file", file.path}, {"totals", totals_json(file.totals)}});
    }
    json skipped = json::array();
    for (const auto& s : report.skipped) {
        skipped.push_back({{"file", s.path}, {"reason", s.reason}});
    }
    json unmeasured = json::array();
    for (const auto& lines : report.unmeasured) {
        unmeasured.push_back({{"file", lines.path},
                              {"count", lines.count},
                              {"base_lines", lines.base},
                              {"head_lines", lines.head}});
    }
    json warnings = json::array();
    for (const auto& w : report.warnings) {
        warnings.push_back(
            {{"side", w.side}, {"file", w.path}, {"line", w.line}, {"message", w.message}});
    }
    const json document = {
        {"schema", "tollgate.check/1"},
        {"verdict", verdict_json(verdict)},
        {"convention", report.convention},
        {"base", {{"label", report.base_label}, {"commit", report.base_commit}}},
        {"head",
         {{"label", report.head_label},
          {"commit", report.head_commit.empty() ? json(nullptr) : json(report.head_commit)}}},
        {"notes", report.notes},
        {"measured_files", report.measured_files},
        {"totals", totals_json(report.totals)},
        {"files", files},
        {"functions", functions},
        {"unmeasured_lines", report.unmeasured_lines},
        {"unmeasured", unmeasured},
        {"skipped", skipped},
        {"warnings", warnings},
        {"diagnostics", diagnostics_json(report)},
    };
    out << text::dump_json(document, 2) << "\n";
}

} // namespace tollgate::report
