// SPDX-License-Identifier: MIT
// The reader of "tollgate.check/1": the inverse of gate/report/change_json.cpp.
#include "gate/annotate/read_check_report.hpp"

#include "gate/common/errors.hpp"

#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

namespace tollgate::annotate {

namespace {

using nlohmann::json;

// A field that is missing or of the wrong type; carries the JSON path for the message.
struct FieldError {
    std::string path;
    std::string expected;
};

// Walks a document, remembering where it is for messages.
class Reader {
public:
    Reader(const json& node, std::string path) : m_node(node), m_path(std::move(path)) {}

    Reader at(const std::string& key) const {
        if (!m_node.is_object() || !m_node.contains(key)) {
            throw FieldError{m_path + "." + key, "a value"};
        }
        return Reader(m_node.at(key), m_path + "." + key);
    }
    Reader at(std::size_t index) const {
        return Reader(m_node.at(index), m_path + "[" + std::to_string(index) + "]");
    }
    bool is_null() const { return m_node.is_null(); }
    std::size_t size() const {
        if (!m_node.is_array()) {
            throw FieldError{m_path, "an array"};
        }
        return m_node.size();
    }
    std::string text() const {
        if (!m_node.is_string()) {
            throw FieldError{m_path, "a string"};
        }
        return m_node.get<std::string>();
    }
    std::string text_or_empty() const { return m_node.is_null() ? std::string() : text(); }
    double number() const {
        if (!m_node.is_number()) {
            throw FieldError{m_path, "a number"};
        }
        return m_node.get<double>();
    }
    unsigned count() const {
        if (!m_node.is_number_unsigned() || m_node.get<std::uint64_t>() > 0xffffffffULL) {
            throw FieldError{m_path, "a count"};
        }
        return m_node.get<unsigned>();
    }
    bool flag() const {
        if (!m_node.is_boolean()) {
            throw FieldError{m_path, "true or false"};
        }
        return m_node.get<bool>();
    }
    std::vector<std::string> texts() const {
        std::vector<std::string> out;
        for (std::size_t i = 0; i < size(); ++i) {
            out.push_back(at(i).text());
        }
        return out;
    }
    const json& node() const { return m_node; }
    const std::string& path() const { return m_path; }

private:
    const json& m_node;
    std::string m_path;
};

void set_measure(core::Measures& m, core::MeasureId id, double value) {
    const auto whole = static_cast<std::uint64_t>(value < 0 ? 0 : value);
    switch (id) {
    case core::MeasureId::n1:
        m.n1 = whole;
        break;
    case core::MeasureId::n2:
        m.n2 = whole;
        break;
    case core::MeasureId::N1:
        m.N1 = whole;
        break;
    case core::MeasureId::N2:
        m.N2 = whole;
        break;
    case core::MeasureId::length:
        m.length = whole;
        break;
    case core::MeasureId::vocabulary:
        m.vocabulary = whole;
        break;
    case core::MeasureId::estimated_length:
        m.estimated_length = value;
        break;
    case core::MeasureId::volume:
        m.volume = value;
        break;
    case core::MeasureId::difficulty:
        m.difficulty = value;
        break;
    case core::MeasureId::level:
        m.level = value;
        break;
    case core::MeasureId::effort:
        m.effort = value;
        break;
    case core::MeasureId::time:
        m.time = value;
        break;
    case core::MeasureId::bugs_volume:
        m.bugs_volume = value;
        break;
    case core::MeasureId::bugs_effort:
        m.bugs_effort = value;
        break;
    case core::MeasureId::potential_volume:
        m.potential_volume = value;
        break;
    case core::MeasureId::volume_ratio:
        m.volume_ratio = value;
        break;
    }
}

template <typename Enum>
Enum parse_name(const Reader& field, const std::vector<std::pair<const char*, Enum>>& names) {
    const std::string name = field.text();
    for (const auto& [candidate, value] : names) {
        if (name == candidate) {
            return value;
        }
    }
    std::string expected;
    for (const auto& [candidate, value] : names) {
        expected += std::string(expected.empty() ? "" : ", ") + "\"" + candidate + "\"";
    }
    throw FieldError{field.path(), "one of " + expected};
}

std::optional<delta::FunctionSide> read_side(const Reader& r) {
    if (r.is_null()) {
        return std::nullopt;
    }
    delta::FunctionSide side;
    side.path = r.at("file").text();
    side.start_line = r.at("line").count();
    side.end_line = r.at("end_line").count();
    side.lexical = r.at("extent").text() == "lexical";
    side.token_hash = r.at("token_hash").text();
    const Reader measures = r.at("measures");
    for (const auto id : core::k_all_measures) {
        set_measure(side.measures, id, measures.at(std::string(core::measure_name(id))).number());
    }
    return side;
}

delta::Totals read_totals(const Reader& r) {
    delta::Totals t;
    t.functions = r.at("functions").count();
    t.added = r.at("added").count();
    t.changed = r.at("changed").count();
    t.removed = r.at("removed").count();
    t.base_volume = r.at("volume").at("base").number();
    t.head_volume = r.at("volume").at("head").number();
    t.base_effort = r.at("effort").at("base").number();
    t.head_effort = r.at("effort").at("head").number();
    t.base_difficulty_max = r.at("difficulty_max").at("base").number();
    t.head_difficulty_max = r.at("difficulty_max").at("head").number();
    return t;
}

policy::ExemptionSource read_source(const Reader& r) {
    return parse_name<policy::ExemptionSource>(r, {{"trailer", policy::ExemptionSource::trailer},
                                                   {"comment", policy::ExemptionSource::comment}});
}

policy::ExemptionState read_state(const Reader& r) {
    return parse_name<policy::ExemptionState>(r, {{"accepted", policy::ExemptionState::accepted},
                                                  {"refused", policy::ExemptionState::refused}});
}

// Fields added to the schema later: advisory runs and exemptions.
void read_rollout_fields(const Reader& r, policy::Finding& f) {
    if (r.node().contains("would_block")) {
        f.advisory = r.at("would_block").flag();
    }
    if (r.node().contains("exemption") && !r.node()["exemption"].is_null()) {
        const Reader e = r.at("exemption");
        f.exemption = read_state(e.at("state"));
        f.exemption_source = read_source(e.at("source"));
        f.exemption_reason = e.at("reason").text_or_empty();
        f.exemption_where = e.at("where").text_or_empty();
    }
}

// The exemptions a change claimed (added to the schema later: none when absent).
std::vector<policy::ClaimedExemption> read_exemptions(const Reader& verdict) {
    std::vector<policy::ClaimedExemption> claims;
    if (!verdict.node().contains("exemptions")) {
        return claims;
    }
    const Reader exemptions = verdict.at("exemptions");
    for (std::size_t i = 0; i < exemptions.size(); ++i) {
        const Reader e = exemptions.at(i);
        policy::ClaimedExemption claim;
        claim.source = read_source(e.at("source"));
        claim.where = e.at("where").text();
        claim.function = e.at("function").text();
        claim.path = e.at("file").text();
        claim.start_line = e.at("line").count();
        claim.rules = e.at("rules").texts();
        claim.reason = e.at("reason").text();
        claim.state = read_state(e.at("state"));
        claim.findings = e.at("findings").count();
        claims.push_back(std::move(claim));
    }
    return claims;
}

policy::Finding read_finding(const Reader& r) {
    using policy::Level;
    using policy::RuleKind;
    policy::Finding f;
    f.rule_id = r.at("rule").text();
    f.kind = parse_name<RuleKind>(r.at("kind"), {{"growth", RuleKind::growth},
                                                 {"added-ceiling", RuleKind::added_ceiling},
                                                 {"ceiling", RuleKind::ceiling},
                                                 {"budget", RuleKind::budget}});
    f.level = parse_name<Level>(r.at("level"),
                                {{"blocking", Level::blocking}, {"warning", Level::warning}});
    const Reader measure = r.at("measure");
    const auto id = core::parse_measure_name(measure.text());
    if (!id) {
        throw FieldError{measure.path(), "a measure name"};
    }
    f.measure = *id;
    f.function = r.at("function").text();
    f.signature = r.at("signature").text();
    f.path = r.at("file").text();
    f.start_line = r.at("line").count();
    f.end_line = r.at("end_line").count();
    f.value = r.at("value").number();
    f.limit = r.at("limit").number();
    f.excess = r.at("excess").number();
    f.percent = r.at("percent").flag();
    f.tolerated = r.at("tolerated").flag();
    read_rollout_fields(r, f);
    f.message = r.at("message").text();
    return f;
}

// The verdict part of a check report.
policy::Verdict read_verdict(const Reader& verdict) {
    policy::Verdict verdict_read;
    verdict_read.outcome = parse_name<policy::Outcome>(
        verdict.at("outcome"), {{"pass", policy::Outcome::pass},
                                {"blocked", policy::Outcome::blocked},
                                {"would-block", policy::Outcome::would_block}});
    if (verdict.node().contains("enforcement") && verdict.at("enforcement").text() == "advisory") {
        verdict_read.enforcement = policy::Enforcement::advisory;
    }
    verdict_read.policy_origin = verdict.at("policy").text();
    verdict_read.policy_change_summary = verdict.at("policy_change").text();
    verdict_read.policy_changes = verdict.at("policy_differences").texts();
    const Reader findings = verdict.at("findings");
    for (std::size_t i = 0; i < findings.size(); ++i) {
        verdict_read.findings.push_back(read_finding(findings.at(i)));
        if (verdict_read.enforcement == policy::Enforcement::advisory) {
            verdict_read.findings.back().advisory = true;
        }
    }
    verdict_read.notes = verdict.at("notes").texts();
    verdict_read.exemptions = read_exemptions(verdict);
    return verdict_read;
}

CheckedChange read_document(const Reader& doc) {
    using delta::DeltaLabel;
    CheckedChange change;
    change.verdict = read_verdict(doc.at("verdict"));

    delta::ChangeReport& report = change.report;
    report.convention = doc.at("convention").text();
    report.base_label = doc.at("base").at("label").text();
    report.base_commit = doc.at("base").at("commit").text();
    report.head_label = doc.at("head").at("label").text();
    report.head_commit = doc.at("head").at("commit").text_or_empty();
    report.notes = doc.at("notes").texts();
    report.measured_files = doc.at("measured_files").count();
    // Added to the schema later: reports written before it have no "diagnostics".
    if (doc.node().contains("diagnostics")) {
        const Reader diagnostics = doc.at("diagnostics");
        report.compile_database = diagnostics.at("compile_database").flag();
        report.files_without_compile_flags = diagnostics.at("files_without_compile_flags").count();
    }
    report.totals = read_totals(doc.at("totals"));
    const Reader files = doc.at("files");
    for (std::size_t i = 0; i < files.size(); ++i) {
        report.files.push_back(
            {files.at(i).at("file").text(), read_totals(files.at(i).at("totals"))});
    }
    const Reader functions = doc.at("functions");
    for (std::size_t i = 0; i < functions.size(); ++i) {
        const Reader f = functions.at(i);
        delta::FunctionDelta d;
        d.label = parse_name<DeltaLabel>(f.at("label"), {{"added", DeltaLabel::added},
                                                         {"changed", DeltaLabel::changed},
                                                         {"removed", DeltaLabel::removed},
                                                         {"moved", DeltaLabel::moved},
                                                         {"unchanged", DeltaLabel::unchanged}});
        d.name = f.at("function").text();
        d.signature = f.at("signature").text();
        d.identity = f.at("identity").text();
        d.base = read_side(f.at("base"));
        d.head = read_side(f.at("head"));
        if (!d.base && !d.head) {
            throw FieldError{f.path() + ".head", "an object (a function has at least one side)"};
        }
        report.functions.push_back(std::move(d));
    }
    const Reader skipped = doc.at("skipped");
    for (std::size_t i = 0; i < skipped.size(); ++i) {
        report.skipped.push_back(
            {skipped.at(i).at("file").text(), skipped.at(i).at("reason").text()});
    }
    const Reader warnings = doc.at("warnings");
    for (std::size_t i = 0; i < warnings.size(); ++i) {
        const Reader w = warnings.at(i);
        report.warnings.push_back({w.at("side").text(), w.at("file").text(), w.at("line").count(),
                                   w.at("message").text()});
    }
    return change;
}

} // namespace

CheckedChange parse_check_report(const std::string& text, const std::string& name) {
    const json document = json::parse(text, nullptr, false);
    if (document.is_discarded()) {
        throw UsageError("report \"" + name +
                         "\" is not JSON (give the file that \"tollgate "
                         "check --report json:PATH\" wrote)");
    }
    const Reader root(document, "$");
    try {
        const std::string schema = root.at("schema").text();
        if (schema != "tollgate.check/1") {
            throw UsageError("report \"" + name + "\" has schema \"" + schema +
                             "\", expected \"tollgate.check/1\"");
        }
        return read_document(root);
    } catch (const FieldError& e) {
        throw UsageError("report \"" + name + "\": " + e.path + " should be " + e.expected);
    } catch (const json::exception& e) {
        throw UsageError("report \"" + name + "\" is not a tollgate check report: " + e.what());
    }
}

CheckedChange read_check_report(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) {
        throw UsageError("cannot read report \"" + path +
                         "\" (run \"tollgate check --report "
                         "json:" +
                         path + "\" first)");
    }
    std::ostringstream text;
    text << in.rdbuf();
    return parse_check_report(text.str(), path);
}

} // namespace tollgate::annotate
