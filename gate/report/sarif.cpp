// SPDX-License-Identifier: MIT
// The SARIF 2.1.0 writer: rules from the policy, results from the verdict's findings.
#include "gate/report/sarif.hpp"

#include "gate/common/text_safety.hpp"
#include "gate/policy/judge.hpp"
#include "gate/report/marks.hpp"

#include <nlohmann/json.hpp>

namespace tollgate::report {

namespace {

using nlohmann::json;

const char* const k_sarif_schema =
    "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json";

std::string describe_rule(const policy::Rule& rule) {
    using policy::format_amount;
    using policy::Sign;
    const std::string measure(core::measure_name(rule.measure));
    switch (rule.kind) {
    case policy::RuleKind::growth: {
        std::string limits;
        if (rule.max_increase) {
            limits = "by at most " + format_amount(*rule.max_increase, Sign::always);
        }
        if (rule.max_increase_percent) {
            limits += (limits.empty() ? "by at most " : " and at most ") +
                      format_amount(*rule.max_increase_percent, Sign::always) + "%";
        }
        return "A changed or moved function's " + measure + " may grow " + limits + ".";
    }
    case policy::RuleKind::added_ceiling:
        return "A new function's " + measure + " may be at most " +
               format_amount(rule.ceiling.value_or(0), Sign::as_is) + ".";
    case policy::RuleKind::ceiling:
        return "A touched function's " + measure + " may be at most " +
               format_amount(rule.ceiling.value_or(0), Sign::as_is) + " in head.";
    case policy::RuleKind::budget:
        return "The " + measure + " increases of all touched functions may sum to at most " +
               format_amount(rule.max_total_increase.value_or(0), Sign::always) + ".";
    case policy::RuleKind::unmeasured_lines:
        return "The change's changed C/C++ lines outside every measured function may number at "
               "most " +
               format_amount(rule.ceiling.value_or(0), Sign::as_is) + ".";
    }
    return "";
}

std::string short_rule(const policy::Rule& rule) {
    const std::string measure(core::measure_name(rule.measure));
    switch (rule.kind) {
    case policy::RuleKind::growth:
        return measure + " growth of a changed function";
    case policy::RuleKind::added_ceiling:
        return measure + " ceiling for a new function";
    case policy::RuleKind::ceiling:
        return measure + " ceiling for a touched function";
    case policy::RuleKind::budget:
        return measure + " budget for the whole change";
    case policy::RuleKind::unmeasured_lines:
        return "changed lines outside every measured function";
    }
    return measure;
}

// The measure a rule of `kind` judges, or null for the count of unmeasured lines.
json measure_json(policy::RuleKind kind, core::MeasureId measure) {
    return kind == policy::RuleKind::unmeasured_lines
               ? json(nullptr)
               : json(std::string(core::measure_name(measure)));
}

const char* sarif_level(policy::Level level) {
    return level == policy::Level::blocking ? "error" : "warning";
}

json physical_location(const std::string& path, unsigned start_line, unsigned end_line) {
    json location = {
        {"physicalLocation",
         {{"artifactLocation", {{"uri", path_to_uri(path)}, {"uriBaseId", "SRCROOT"}}}}}};
    if (start_line > 0) {
        json region = {{"startLine", start_line}};
        if (end_line >= start_line) {
            region["endLine"] = end_line;
        }
        location["physicalLocation"]["region"] = region;
    }
    return location;
}

// The touched function a finding is about, or null (a budget or a line-count finding).
const delta::FunctionDelta* finding_function(const delta::ChangeReport& report,
                                             const policy::Finding& finding) {
    for (const auto& f : report.functions) {
        if (!finding.path.empty() && f.name == finding.function &&
            f.shown_side().path == finding.path &&
            f.shown_side().start_line == finding.start_line) {
            return &f;
        }
    }
    return nullptr;
}

// Add the function's marks and base identity, when it has any, to a result's properties.
void add_function_properties(json& properties, const delta::FunctionDelta& f) {
    const auto marks = mark_words(marks_of(f.shown_side()));
    if (!marks.empty()) {
        properties["marks"] = marks;
    }
    if (f.base_name) {
        properties["baseFunction"] = *f.base_name;
    }
    if (f.base_signature) {
        properties["baseSignature"] = *f.base_signature;
    }
}

// The in-scope function whose `measure` grew most, to anchor a budget finding; or none.
const delta::FunctionDelta* largest_growth(const delta::ChangeReport& report,
                                           const policy::Policy& policy, core::MeasureId measure) {
    const delta::FunctionDelta* best = nullptr;
    double best_growth = 0;
    for (const auto& f : report.functions) {
        if (!f.head || !policy::in_scope(policy.paths, f.head->path)) {
            continue;
        }
        const double growth = f.delta(measure).absolute;
        if (best == nullptr || growth > best_growth) {
            best = &f;
            best_growth = growth;
        }
    }
    return best;
}

// Return true when the function `finding` is about was measured lexically because the parser
// stopped on its file.
bool finding_parser_stopped(const delta::ChangeReport& report, const policy::Finding& finding) {
    for (const auto& f : report.functions) {
        const auto& side = f.shown_side();
        if (f.name == finding.function && side.path == finding.path &&
            side.start_line == finding.start_line) {
            return f.parser_stopped();
        }
    }
    return false;
}

// The report's warnings (parse errors, files the parser stopped on) as tool notifications.
json notifications(const delta::ChangeReport& report) {
    json list = json::array();
    for (const auto& w : report.warnings) {
        json notification = {{"level", "warning"},
                             {"message", {{"text", w.message}}},
                             {"properties", {{"side", w.side}}}};
        if (!w.path.empty()) {
            notification["locations"] = json::array({physical_location(w.path, w.line, 0)});
        }
        list.push_back(std::move(notification));
    }
    return list;
}

} // namespace

std::string path_to_uri(const std::string& path) {
    return text::percent_encode(path, "/");
}

void write_sarif(std::ostream& out, const delta::ChangeReport& report,
                 const policy::Verdict& verdict, const policy::Policy& policy) {
    std::vector<policy::Rule> all_rules = policy.rules;
    if (policy.unmeasured_lines.limit || !report.unmeasured.empty()) {
        policy::Rule limit; // the policy's "unmeasured-lines" key, described like a rule
        limit.id = "unmeasured-lines";
        limit.kind = policy::RuleKind::unmeasured_lines;
        limit.level = policy.unmeasured_lines.level;
        limit.ceiling = policy.unmeasured_lines.limit;
        all_rules.push_back(limit);
    }
    json rules = json::array();
    for (const auto& rule : all_rules) {
        rules.push_back({
            {"id", rule.id},
            {"name", rule.id},
            {"shortDescription", {{"text", short_rule(rule)}}},
            {"fullDescription", {{"text", describe_rule(rule)}}},
            {"defaultConfiguration", {{"level", sarif_level(rule.level)}}},
            {"properties",
             {{"kind", policy::rule_kind_name(rule.kind)},
              {"measure", measure_json(rule.kind, rule.measure)}}},
        });
    }

    json results = json::array();
    for (const auto& finding : verdict.findings) {
        json result = {
            {"ruleId", finding.rule_id},
            {"level", sarif_level(finding.level)},
            {"message", {{"text", finding.message}}},
            {"properties",
             {{"measure", measure_json(finding.kind, finding.measure)},
              {"value", finding.value},
              {"limit", finding.limit},
              {"excess", finding.excess},
              {"unit", finding.percent ? "percent" : "measure"}}},
        };
        for (std::size_t i = 0; i < all_rules.size(); ++i) {
            if (all_rules[i].id == finding.rule_id && all_rules[i].kind == finding.kind) {
                result["ruleIndex"] = i;
            }
        }
        if (finding.grandfathered) {
            result["baselineState"] = "unchanged";
        }
        if (finding_parser_stopped(report, finding)) {
            result["message"]["text"] =
                finding.message + " (measured lexically: the parser stopped on this file)";
            result["properties"]["extent"] = "parser-stopped";
        }
        if (const auto* f = finding_function(report, finding)) {
            add_function_properties(result["properties"], *f);
        }
        if (!finding.path.empty()) {
            result["locations"] = json::array(
                {physical_location(finding.path, finding.start_line, finding.end_line)});
            result["partialFingerprints"] = {
                {"tollgateFunction/v1", finding.rule_id + ":" + finding.path + ":" +
                                            finding.function + "(" + finding.signature + ")"}};
        } else if (const auto* anchor = largest_growth(report, policy, finding.measure)) {
            result["locations"] = json::array({physical_location(
                anchor->head->path, anchor->head->start_line, anchor->head->end_line)});
        }
        results.push_back(std::move(result));
    }

    // Files left out (binary, too large, ...) are no results; a property bag lists them.
    json skipped = json::array();
    for (const auto& s : report.skipped) {
        skipped.push_back({{"file", s.path}, {"reason", s.reason}});
    }
    // The safety net: every file's changed lines outside functions, as notes on the file.
    for (const auto& lines : report.unmeasured) {
        // A region only in head numbering: base lines may belong to another path or numbering.
        const std::pair<unsigned, unsigned> first =
            lines.head.empty() ? std::make_pair(0u, 0u) : lines.head.front();
        json result = {
            {"ruleId", "unmeasured-lines"},
            {"level", "note"},
            {"message", {{"text", lines.path + ": " + unmeasured_text(lines)}}},
            {"properties",
             {{"count", lines.count}, {"side", lines.head.empty() ? "base" : "head"}}},
        };
        for (std::size_t i = 0; i < all_rules.size(); ++i) {
            if (all_rules[i].kind == policy::RuleKind::unmeasured_lines) {
                result["ruleIndex"] = i;
            }
        }
        result["locations"] =
            json::array({physical_location(lines.path, first.first, first.second)});
        results.push_back(std::move(result));
    }

    json run = {
        {"tool",
         {{"driver", {{"name", "tollgate"}, {"version", TOLLGATE_VERSION}, {"rules", rules}}}}},
        {"originalUriBaseIds",
         {{"SRCROOT", {{"description", {{"text", "The root of the repository."}}}}}}},
        {"results", results},
        {"invocations", json::array({{{"executionSuccessful", true},
                                      {"toolExecutionNotifications", notifications(report)}}})},
        {"properties",
         {{"outcome", policy::outcome_name(verdict.outcome)},
          {"policyOrigin", verdict.policy_origin},
          {"baseCommit", report.base_commit},
          {"headCommit", report.head_commit},
          {"convention", report.convention},
          {"notes", verdict.notes},
          {"skipped", skipped}}},
    };
    const json log = {
        {"$schema", k_sarif_schema}, {"version", "2.1.0"}, {"runs", json::array({run})}};
    out << text::dump_json(log, 2) << "\n";
}

} // namespace tollgate::report
