// SPDX-License-Identifier: MIT
// Change reports to JSON and back, field by field, so that a merged replay equals an unsharded one.
#include "gate/calibrate/shard_report_json.hpp"

#include "gate/common/text_safety.hpp"
#include "gate/lexer/file_functions_json.hpp"

#include <stdexcept>

namespace tollgate::calibrate {

namespace {

using nlohmann::json;
using text::store_bytes;

using lexer::stored_text;

json texts_to_json(const std::vector<std::string>& texts) {
    json list = json::array();
    for (const auto& t : texts) {
        list.push_back(store_bytes(t));
    }
    return list;
}

std::vector<std::string> texts_from_json(const json& list) {
    std::vector<std::string> out;
    for (const auto& t : list) {
        out.push_back(stored_text(t));
    }
    return out;
}

json measures_to_json(const core::Measures& m) {
    return {{"n1", m.n1},
            {"n2", m.n2},
            {"N1", m.N1},
            {"N2", m.N2},
            {"length", m.length},
            {"vocabulary", m.vocabulary},
            {"estimated_length", m.estimated_length},
            {"volume", m.volume},
            {"difficulty", m.difficulty},
            {"level", m.level},
            {"effort", m.effort},
            {"time", m.time},
            {"bugs_volume", m.bugs_volume},
            {"bugs_effort", m.bugs_effort},
            {"potential_operands", m.potential_operands},
            {"potential_volume", m.potential_volume},
            {"volume_ratio", m.volume_ratio}};
}

core::Measures measures_from_json(const json& j) {
    core::Measures m;
    j.at("n1").get_to(m.n1);
    j.at("n2").get_to(m.n2);
    j.at("N1").get_to(m.N1);
    j.at("N2").get_to(m.N2);
    j.at("length").get_to(m.length);
    j.at("vocabulary").get_to(m.vocabulary);
    j.at("estimated_length").get_to(m.estimated_length);
    j.at("volume").get_to(m.volume);
    j.at("difficulty").get_to(m.difficulty);
    j.at("level").get_to(m.level);
    j.at("effort").get_to(m.effort);
    j.at("time").get_to(m.time);
    j.at("bugs_volume").get_to(m.bugs_volume);
    j.at("bugs_effort").get_to(m.bugs_effort);
    j.at("potential_operands").get_to(m.potential_operands);
    j.at("potential_volume").get_to(m.potential_volume);
    j.at("volume_ratio").get_to(m.volume_ratio);
    return m;
}

json side_to_json(const std::optional<delta::FunctionSide>& side) {
    if (!side) {
        return nullptr;
    }
    return {{"path", store_bytes(side->path)},
            {"start_line", side->start_line},
            {"end_line", side->end_line},
            {"lexical", side->lexical},
            {"parser_stopped", side->parser_stopped},
            {"inactive", side->inactive},
            {"brace_extent", side->brace_extent},
            {"token_hash", store_bytes(side->token_hash)},
            {"measures", measures_to_json(side->measures)}};
}

std::optional<delta::FunctionSide> side_from_json(const json& j) {
    if (j.is_null()) {
        return std::nullopt;
    }
    delta::FunctionSide side;
    side.path = stored_text(j.at("path"));
    j.at("start_line").get_to(side.start_line);
    j.at("end_line").get_to(side.end_line);
    j.at("lexical").get_to(side.lexical);
    j.at("parser_stopped").get_to(side.parser_stopped);
    j.at("inactive").get_to(side.inactive);
    j.at("brace_extent").get_to(side.brace_extent);
    side.token_hash = stored_text(j.at("token_hash"));
    side.measures = measures_from_json(j.at("measures"));
    return side;
}

delta::DeltaLabel label_from(const std::string& name) {
    for (const auto label :
         {delta::DeltaLabel::added, delta::DeltaLabel::changed, delta::DeltaLabel::removed,
          delta::DeltaLabel::moved, delta::DeltaLabel::unchanged}) {
        if (name == delta::label_name(label)) {
            return label;
        }
    }
    throw std::runtime_error("unknown label");
}

json totals_to_json(const delta::Totals& t) {
    return {{"functions", t.functions},
            {"added", t.added},
            {"removed", t.removed},
            {"changed", t.changed},
            {"base_volume", t.base_volume},
            {"head_volume", t.head_volume},
            {"base_effort", t.base_effort},
            {"head_effort", t.head_effort},
            {"base_difficulty_max", t.base_difficulty_max},
            {"head_difficulty_max", t.head_difficulty_max}};
}

delta::Totals totals_from_json(const json& j) {
    delta::Totals t;
    j.at("functions").get_to(t.functions);
    j.at("added").get_to(t.added);
    j.at("removed").get_to(t.removed);
    j.at("changed").get_to(t.changed);
    j.at("base_volume").get_to(t.base_volume);
    j.at("head_volume").get_to(t.head_volume);
    j.at("base_effort").get_to(t.base_effort);
    j.at("head_effort").get_to(t.head_effort);
    j.at("base_difficulty_max").get_to(t.base_difficulty_max);
    j.at("head_difficulty_max").get_to(t.head_difficulty_max);
    return t;
}

json optional_text_to_json(const std::optional<std::string>& text) {
    return text ? json(store_bytes(*text)) : json(nullptr);
}

std::optional<std::string> optional_text_from_json(const json& j) {
    if (j.is_null()) {
        return std::nullopt;
    }
    return stored_text(j);
}

json line_ranges_to_json(const std::vector<std::pair<unsigned, unsigned>>& ranges) {
    json list = json::array();
    for (const auto& [first, last] : ranges) {
        list.push_back({first, last});
    }
    return list;
}

std::vector<std::pair<unsigned, unsigned>> line_ranges_from_json(const json& list) {
    std::vector<std::pair<unsigned, unsigned>> ranges;
    for (const auto& range : list) {
        ranges.emplace_back(range.at(0).get<unsigned>(), range.at(1).get<unsigned>());
    }
    return ranges;
}

} // namespace

json change_report_to_json(const delta::ChangeReport& r) {
    json functions = json::array();
    for (const auto& f : r.functions) {
        functions.push_back({{"name", store_bytes(f.name)},
                             {"signature", store_bytes(f.signature)},
                             {"identity", store_bytes(f.identity)},
                             {"label", delta::label_name(f.label)},
                             {"base", side_to_json(f.base)},
                             {"head", side_to_json(f.head)},
                             {"base_name", optional_text_to_json(f.base_name)},
                             {"base_signature", optional_text_to_json(f.base_signature)}});
    }
    json files = json::array();
    for (const auto& f : r.files) {
        files.push_back({{"path", store_bytes(f.path)}, {"totals", totals_to_json(f.totals)}});
    }
    json skipped = json::array();
    for (const auto& s : r.skipped) {
        skipped.push_back({{"path", store_bytes(s.path)}, {"reason", store_bytes(s.reason)}});
    }
    json warnings = json::array();
    for (const auto& w : r.warnings) {
        warnings.push_back({{"side", store_bytes(w.side)},
                            {"path", store_bytes(w.path)},
                            {"line", w.line},
                            {"message", store_bytes(w.message)}});
    }
    json unmeasured = json::array();
    for (const auto& u : r.unmeasured) {
        unmeasured.push_back({{"path", store_bytes(u.path)},
                              {"base", line_ranges_to_json(u.base)},
                              {"head", line_ranges_to_json(u.head)},
                              {"count", u.count}});
    }
    return {{"base_label", store_bytes(r.base_label)},
            {"head_label", store_bytes(r.head_label)},
            {"base_commit", store_bytes(r.base_commit)},
            {"head_commit", store_bytes(r.head_commit)},
            {"convention", store_bytes(r.convention)},
            {"notes", texts_to_json(r.notes)},
            {"functions", functions},
            {"files", files},
            {"totals", totals_to_json(r.totals)},
            {"skipped", skipped},
            {"warnings", warnings},
            {"measured_files", r.measured_files},
            {"compile_database", r.compile_database},
            {"files_without_compile_flags", r.files_without_compile_flags},
            {"unmeasured", unmeasured},
            {"unmeasured_lines", r.unmeasured_lines}};
}

delta::ChangeReport change_report_from_json(const json& j) {
    delta::ChangeReport r;
    r.base_label = stored_text(j.at("base_label"));
    r.head_label = stored_text(j.at("head_label"));
    r.base_commit = stored_text(j.at("base_commit"));
    r.head_commit = stored_text(j.at("head_commit"));
    r.convention = stored_text(j.at("convention"));
    r.notes = texts_from_json(j.at("notes"));
    for (const auto& f : j.at("functions")) {
        delta::FunctionDelta d;
        d.name = stored_text(f.at("name"));
        d.signature = stored_text(f.at("signature"));
        d.identity = stored_text(f.at("identity"));
        d.label = label_from(f.at("label").get<std::string>());
        d.base = side_from_json(f.at("base"));
        d.head = side_from_json(f.at("head"));
        d.base_name = optional_text_from_json(f.at("base_name"));
        d.base_signature = optional_text_from_json(f.at("base_signature"));
        if (!d.base && !d.head) {
            throw std::runtime_error("a function without sides");
        }
        r.functions.push_back(std::move(d));
    }
    for (const auto& f : j.at("files")) {
        r.files.push_back({stored_text(f.at("path")), totals_from_json(f.at("totals"))});
    }
    r.totals = totals_from_json(j.at("totals"));
    for (const auto& s : j.at("skipped")) {
        r.skipped.push_back({stored_text(s.at("path")), stored_text(s.at("reason"))});
    }
    for (const auto& w : j.at("warnings")) {
        delta::ChangeWarning warning;
        warning.side = stored_text(w.at("side"));
        warning.path = stored_text(w.at("path"));
        w.at("line").get_to(warning.line);
        warning.message = stored_text(w.at("message"));
        r.warnings.push_back(std::move(warning));
    }
    j.at("measured_files").get_to(r.measured_files);
    j.at("compile_database").get_to(r.compile_database);
    j.at("files_without_compile_flags").get_to(r.files_without_compile_flags);
    for (const auto& u : j.at("unmeasured")) {
        delta::UnmeasuredLines lines;
        lines.path = stored_text(u.at("path"));
        lines.base = line_ranges_from_json(u.at("base"));
        lines.head = line_ranges_from_json(u.at("head"));
        u.at("count").get_to(lines.count);
        r.unmeasured.push_back(std::move(lines));
    }
    j.at("unmeasured_lines").get_to(r.unmeasured_lines);
    return r;
}

} // namespace tollgate::calibrate
