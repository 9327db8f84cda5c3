// SPDX-License-Identifier: MIT
// What every change renderer shares: numbers written one way, rules per function, file links.
#include "gate/common/text_safety.hpp"
#include "gate/report/change_report.hpp"
#include "gate/report/marks.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <vector>

namespace tollgate::report {

using delta::FunctionDelta;

std::string rules_broken_by(const policy::Verdict& verdict, const FunctionDelta& f) {
    return RulesIndex(verdict).of(f);
}

RulesIndex::RulesIndex(const policy::Verdict& verdict) {
    for (const auto& finding : verdict.findings) {
        auto& [blocking, warning] =
            m_rules[Key{finding.function, finding.path, finding.start_line}];
        std::string& list = finding.blocks() ? blocking : warning;
        list += (list.empty() ? "" : ", ") + finding.rule_id;
    }
}

std::string RulesIndex::of(const FunctionDelta& f) const {
    const auto& side = f.shown_side();
    const auto it = m_rules.find(Key{f.name, side.path, side.start_line});
    if (it == m_rules.end()) {
        return {};
    }
    const auto& [blocking, warning] = it->second;
    if (blocking.empty() || warning.empty()) {
        return blocking + warning;
    }
    return blocking + ", " + warning;
}

std::string function_marks(const FunctionDelta& f) {
    std::vector<std::string> marks;
    if (f.parser_stopped()) {
        marks.emplace_back("parser stopped");
    }
    for (std::string word : mark_words(marks_of(f.shown_side()))) {
        std::replace(word.begin(), word.end(), '-', ' ');
        marks.push_back(std::move(word));
    }
    for (std::string word : base_only_marks(f)) {
        std::replace(word.begin(), word.end(), '-', ' ');
        marks.push_back("base: " + word);
    }
    std::string joined;
    for (const auto& mark : marks) {
        joined += (joined.empty() ? "" : ", ") + mark;
    }
    return joined;
}

std::string group_thousands(double value) {
    const double rounded = std::round(value);
    const bool negative = rounded < 0;
    std::string digits = fmt::format("{:.0f}", std::fabs(rounded));
    std::string grouped;
    for (std::size_t i = 0; i < digits.size(); ++i) {
        if (i > 0 && (digits.size() - i) % 3 == 0) {
            grouped += ',';
        }
        grouped += digits[i];
    }
    return (negative && grouped != "0" ? "-" : "") + grouped;
}

std::string format_percent(const std::optional<double>& percent) {
    if (!percent) {
        return "new";
    }
    const double rounded = std::round(*percent);
    if (rounded == 0.0) {
        return *percent > 0 ? "+0%" : (*percent < 0 ? "-0%" : "0%");
    }
    return fmt::format("{}{:.0f}%", rounded > 0 ? "+" : "", rounded);
}

namespace {

// Return `link_template` with each placeholder of `fields` replaced by its value and the text
// between them passed through text::url_text.
std::string fill_template(const std::string& link_template,
                          const std::vector<std::pair<std::string, std::string>>& fields) {
    std::string link, literal;
    for (std::size_t i = 0; i < link_template.size();) {
        const auto field = std::find_if(fields.begin(), fields.end(), [&](const auto& entry) {
            return link_template.compare(i, entry.first.size(), entry.first) == 0;
        });
        if (field == fields.end()) {
            literal += link_template[i++];
            continue;
        }
        link += text::url_text(literal) + field->second;
        literal.clear();
        i += field->first.size();
    }
    return link + text::url_text(literal);
}

} // namespace

std::string make_link(const std::string& link_template, const std::string& commit,
                      const std::string& path, unsigned line) {
    if (link_template.empty()) {
        return {};
    }
    // Data goes in percent-encoded (lossless, byte by byte); the template is the pipeline's own
    // and only loses what cannot stand in a URL.
    return fill_template(link_template, {{"{commit}", text::percent_encode(commit)},
                                         {"{path}", text::percent_encode(path, "/")},
                                         {"{line}", std::to_string(line)}});
}

} // namespace tollgate::report
