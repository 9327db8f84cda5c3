// SPDX-License-Identifier: MIT
// Load a policy from YAML and validate every key, collecting all problems with file:line:column.
#include "gate/common/input_file.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/policy/calendar_date.hpp"
#include "gate/policy/policy.hpp"
#include "gate/policy/policy_reader.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <map>
#include <sstream>
#include <tuple>
#include <yaml-cpp/yaml.h>

namespace tollgate::policy {

PolicyError::PolicyError(std::vector<std::string> messages)
    : UsageError([&messages] {
          std::string joined;
          for (const auto& message : messages) {
              joined += (joined.empty() ? "" : "\n") + message;
          }
          return joined;
      }()),
      m_messages(std::move(messages)) {}

const char* judge_with_name(JudgeWith judge_with) {
    return judge_with == JudgeWith::head ? "head" : "base";
}

const char* inactive_code_name(InactiveCode inactive_code) {
    switch (inactive_code) {
    case InactiveCode::warn:
        return "warn";
    case InactiveCode::skip:
        return "skip";
    case InactiveCode::judge:
        break;
    }
    return "judge";
}

namespace detail {

const std::vector<std::string> k_top_keys = {"tollgate-policy",
                                             "judge-with",
                                             "noise-floor",
                                             "rules",
                                             "paths",
                                             "waivers",
                                             "baseline",
                                             "inactive-code",
                                             "unmeasured-lines",
                                             "advisory",
                                             "change-exemptions"};
const std::vector<std::string> k_unmeasured_keys = {"limit", "level"};
const std::vector<std::string> k_rule_keys = {"id",           "kind",
                                              "measure",      "level",
                                              "max-increase", "max-increase-percent",
                                              "ceiling",      "max-total-increase"};

// The limit keys each kind of rule takes.
std::vector<std::string> limit_keys(RuleKind kind) {
    switch (kind) {
    case RuleKind::growth:
        return {"max-increase", "max-increase-percent"};
    case RuleKind::added_ceiling:
    case RuleKind::ceiling:
        return {"ceiling"};
    case RuleKind::budget:
        return {"max-total-increase"};
    case RuleKind::unmeasured_lines:
        return {"limit"};
    }
    return {};
}

std::string quoted_list(const std::vector<std::string>& words, const char* last_joint) {
    std::string text;
    for (std::size_t i = 0; i < words.size(); ++i) {
        if (i > 0) {
            text += i + 1 == words.size() ? last_joint : ", ";
        }
        text += "\"" + words[i] + "\"";
    }
    return text;
}

std::vector<std::string> measure_names() {
    std::vector<std::string> names;
    for (const auto id : core::k_all_measures) {
        names.emplace_back(core::measure_name(id));
    }
    return names;
}

std::string shape_of(const YAML::Node& node) {
    if (node.IsSequence()) {
        return "a list";
    }
    if (node.IsMap()) {
        return "a map";
    }
    if (node.IsNull()) {
        return "nothing";
    }
    return "\"" + node.Scalar() + "\"";
}

std::vector<Entry> PolicyReader::entries(const YAML::Node& map,
                                         const std::vector<std::string>& known,
                                         const std::string& context) {
    std::vector<Entry> found;
    std::map<std::string, int> first_line;
    for (auto it = map.begin(); it != map.end(); ++it) {
        const YAML::Node key_node = it->first;
        if (!key_node.IsScalar()) {
            error(key_node.Mark(), "a key must be a plain word, not " + shape_of(key_node));
            continue;
        }
        const std::string key = key_node.Scalar();
        if (const auto seen = first_line.find(key); seen != first_line.end()) {
            error(key_node.Mark(), "duplicate key \"" + key + "\"" + context +
                                       " (first given at line " + std::to_string(seen->second) +
                                       ")");
            continue;
        }
        first_line[key] = key_node.Mark().line + 1;
        if (std::find(known.begin(), known.end(), key) == known.end()) {
            const std::string suggestion = closest_match(key, known);
            error(key_node.Mark(),
                  "unknown key \"" + key + "\"" + context +
                      (suggestion.empty() ? " (expected " + quoted_list(known, " or ") + ")"
                                          : " (did you mean \"" + suggestion + "\"?)"));
            continue;
        }
        found.push_back(Entry{key, key_node, it->second});
    }
    return found;
}

bool PolicyReader::expect_map(const YAML::Node& node, const std::string& key) {
    if (node.IsMap()) {
        return true;
    }
    error(node.Mark(), "\"" + key + "\" must be a map of keys, not " + shape_of(node));
    return false;
}

bool PolicyReader::expect_sequence(const YAML::Node& node, const std::string& key) {
    if (node.IsSequence()) {
        return true;
    }
    error(node.Mark(), "\"" + key + "\" must be a list, not " + shape_of(node));
    return false;
}

std::optional<std::string> PolicyReader::text(const YAML::Node& node, const std::string& key) {
    if (!node.IsScalar() || node.Scalar().empty()) {
        error(node.Mark(), "\"" + key + "\" must be text, not " + shape_of(node));
        return std::nullopt;
    }
    return node.Scalar();
}

std::optional<double> PolicyReader::number(const YAML::Node& node, const std::string& key) {
    if (!node.IsScalar()) {
        error(node.Mark(), "\"" + key + "\" must be a number, not " + shape_of(node));
        return std::nullopt;
    }
    const std::string& spelled = node.Scalar();
    char* end = nullptr;
    const double value = spelled.empty() ? 0.0 : std::strtod(spelled.c_str(), &end);
    const bool whole = !spelled.empty() && end == spelled.c_str() + spelled.size();
    const bool plain_digits = spelled.find_first_not_of("0123456789.+-eE") == std::string::npos;
    if (!whole || !plain_digits || !std::isfinite(value) || value < 0) {
        const bool percent_sign = !spelled.empty() && spelled.back() == '%';
        error(node.Mark(), "\"" + key + "\" must be a number of zero or more, not \"" + spelled +
                               "\"" +
                               (percent_sign ? " (write " + spelled.substr(0, spelled.size() - 1) +
                                                   " for " + spelled + ")"
                                             : ""));
        return std::nullopt;
    }
    return value;
}

std::optional<std::string> PolicyReader::choice(const YAML::Node& node, const std::string& key,
                                                const std::vector<std::string>& allowed) {
    if (node.IsScalar() &&
        std::find(allowed.begin(), allowed.end(), node.Scalar()) != allowed.end()) {
        return node.Scalar();
    }
    const std::string suggestion = node.IsScalar() ? closest_match(node.Scalar(), allowed) : "";
    error(node.Mark(), "\"" + key + "\" must be " + quoted_list(allowed, " or ") + ", not " +
                           shape_of(node) +
                           (suggestion.empty() ? "" : " (did you mean \"" + suggestion + "\"?)"));
    return std::nullopt;
}

std::optional<core::MeasureId> PolicyReader::measure(const YAML::Node& node) {
    if (node.IsScalar()) {
        if (const auto id = core::parse_measure_name(node.Scalar())) {
            return id;
        }
        const auto names = measure_names();
        const std::string suggestion = closest_match(node.Scalar(), names);
        error(node.Mark(),
              "unknown measure \"" + node.Scalar() + "\"" +
                  (suggestion.empty() ? " (expected one of " + quoted_list(names, " or ") + ")"
                                      : " (did you mean \"" + suggestion + "\"?)"));
        return std::nullopt;
    }
    error(node.Mark(), "a measure must be a name such as \"effort\", not " + shape_of(node));
    return std::nullopt;
}

std::vector<std::string> PolicyReader::globs(const YAML::Node& node, const std::string& key) {
    std::vector<std::string> patterns;
    if (node.IsScalar()) {
        if (const auto pattern = text(node, key)) {
            patterns.push_back(*pattern);
        }
        return patterns;
    }
    if (!expect_sequence(node, key)) {
        return patterns;
    }
    for (const auto& item : node) {
        if (const auto pattern = text(item, key)) {
            patterns.push_back(*pattern);
        }
    }
    return patterns;
}

std::optional<std::string> PolicyReader::rule_reference(const YAML::Node& node) {
    if (!node.IsScalar() || node.Scalar().empty()) {
        error(node.Mark(), "a rule id must be text, not " + shape_of(node));
        return std::nullopt;
    }
    const std::string& id = node.Scalar();
    if (m_rules_by_id.count(id) != 0) {
        return id;
    }
    const std::vector<std::string>& ids = m_all_ids;
    if (std::find(ids.begin(), ids.end(), id) != ids.end()) {
        return std::nullopt; // a broken rule: its own problems are reported already
    }
    const std::string suggestion = closest_match(id, ids);
    error(node.Mark(), "unknown rule \"" + id + "\"" +
                           (suggestion.empty() ? (ids.empty() ? " (the policy has no rules)"
                                                              : " (expected one of " +
                                                                    quoted_list(ids, " or ") + ")")
                                               : " (did you mean \"" + suggestion + "\"?)"));
    return std::nullopt;
}

Policy PolicyReader::read(const YAML::Node& root) {
    Policy policy;
    if (!root.IsDefined() || root.IsNull()) {
        error(YAML::Mark::null_mark(),
              "the policy is empty (expected at least \"tollgate-policy: 1\")");
        return policy;
    }
    if (!root.IsMap()) {
        error(root.Mark(), "a policy must be a map of keys such as \"tollgate-policy: 1\", not " +
                               shape_of(root));
        return policy;
    }
    const auto top = entries(root, k_top_keys, "");
    const auto find = [&top](const char* key) -> const Entry* {
        for (const auto& entry : top) {
            if (entry.key == key) {
                return &entry;
            }
        }
        return nullptr;
    };
    if (const Entry* version = find("tollgate-policy")) {
        if (!version->value.IsScalar() ||
            version->value.Scalar() != std::to_string(k_policy_schema_version)) {
            error(version->value.Mark(), "unsupported policy schema version " +
                                             shape_of(version->value) +
                                             " (this tollgate reads version " +
                                             std::to_string(k_policy_schema_version) + ")");
        }
    } else {
        error(root.Mark(), "missing key \"tollgate-policy\" (start the file with "
                           "\"tollgate-policy: 1\", the schema version)");
    }
    if (const Entry* judge_with = find("judge-with")) {
        if (const auto value = choice(judge_with->value, "judge-with", {"base", "head"})) {
            policy.judge_with = *value == "head" ? JudgeWith::head : JudgeWith::base;
        }
    }
    if (const Entry* noise = find("noise-floor")) {
        read_noise_floor(noise->value, policy);
    }
    if (const Entry* rules = find("rules")) {
        read_rules(rules->value, policy);
    }
    if (const Entry* paths = find("paths")) {
        read_paths(paths->value, policy);
    }
    if (const Entry* waivers = find("waivers")) {
        if (expect_sequence(waivers->value, "waivers")) {
            for (const auto& item : waivers->value) {
                if (auto waiver = read_waiver(item)) {
                    policy.waivers.push_back(std::move(*waiver));
                }
            }
        }
    }
    if (const Entry* baseline = find("baseline")) {
        read_baseline(baseline->value, policy);
    }
    if (const Entry* inactive = find("inactive-code")) {
        if (const auto value =
                choice(inactive->value, "inactive-code", {"judge", "warn", "skip"})) {
            policy.inactive_code = *value == "warn"   ? InactiveCode::warn
                                   : *value == "skip" ? InactiveCode::skip
                                                      : InactiveCode::judge;
        }
    }
    if (const Entry* unmeasured = find("unmeasured-lines")) {
        read_unmeasured_lines(unmeasured->value, policy);
    }
    if (const Entry* advisory = find("advisory")) {
        if (const auto value = choice(advisory->value, "advisory", {"true", "false"})) {
            policy.enforcement = *value == "true" ? Enforcement::advisory : Enforcement::blocking;
        }
    }
    if (const Entry* exemptions = find("change-exemptions")) {
        if (const auto value =
                choice(exemptions->value, "change-exemptions", {"refuse", "accept"})) {
            policy.change_exemptions =
                *value == "accept" ? ChangeExemptions::accept : ChangeExemptions::refuse;
        }
    }
    return policy;
}

void PolicyReader::read_unmeasured_lines(const YAML::Node& node, Policy& policy) {
    if (node.IsScalar() && node.Scalar() == "none") {
        return; // the default: the reports list such lines, nothing more
    }
    if (!node.IsMap()) {
        error(node.Mark(), "\"unmeasured-lines\" must be \"none\" or a map with \"limit\" and "
                           "\"level\", not " +
                               shape_of(node));
        return;
    }
    bool has_limit = false;
    for (const auto& entry : entries(node, k_unmeasured_keys, " in \"unmeasured-lines\"")) {
        if (entry.key == "limit") {
            has_limit = true;
            policy.unmeasured_lines.limit = number(entry.value, "unmeasured-lines.limit");
        } else if (const auto level =
                       choice(entry.value, "unmeasured-lines.level", {"blocking", "warning"})) {
            policy.unmeasured_lines.level = *level == "blocking" ? Level::blocking : Level::warning;
        }
    }
    if (!has_limit) {
        error(node.Mark(),
              "\"unmeasured-lines\" has no \"limit\" (e.g. \"limit: 40\": more changed "
              "lines outside functions than that is a finding)");
    }
}

void PolicyReader::read_noise_floor(const YAML::Node& node, Policy& policy) {
    if (!expect_map(node, "noise-floor")) {
        return;
    }
    for (const auto& entry : entries(node, measure_names(), " in \"noise-floor\"")) {
        const auto value = number(entry.value, "noise-floor." + entry.key);
        if (value) {
            policy.noise_floor.push_back(NoiseFloor{*core::parse_measure_name(entry.key), *value});
        }
    }
}

void PolicyReader::read_rules(const YAML::Node& node, Policy& policy) {
    if (!expect_sequence(node, "rules")) {
        return;
    }
    std::map<std::string, int> first_line;
    for (const auto& item : node) {
        std::string id;
        auto rule = read_rule(item, id);
        if (id.empty()) {
            continue;
        }
        if (const auto seen = first_line.find(id); seen != first_line.end()) {
            error(item["id"].Mark(), "duplicate rule id \"" + id + "\" (first defined at line " +
                                         std::to_string(seen->second) + ")");
            continue;
        }
        first_line[id] = item["id"].Mark().line + 1;
        m_all_ids.push_back(id);
        if (rule) {
            m_rules.push_back(*rule);
        }
    }
    for (const auto& rule : m_rules) {
        m_rules_by_id[rule.id] = &rule;
    }
    policy.rules = m_rules;
}

bool is_rule_id(const std::string& id) {
    if (id.empty() || !std::isalnum(static_cast<unsigned char>(id[0]))) {
        return false;
    }
    return std::all_of(id.begin(), id.end(), [](char c) {
        return std::isalnum(static_cast<unsigned char>(c)) || c == '-' || c == '_' || c == '.';
    });
}

std::optional<Rule> PolicyReader::read_rule(const YAML::Node& node, std::string& id_given) {
    if (!node.IsMap()) {
        error(node.Mark(),
              "a rule must be a map with \"id\", \"kind\" and \"measure\", not " + shape_of(node));
        return std::nullopt;
    }
    Rule rule;
    bool complete = true;
    std::string name = "a rule";
    const auto all = entries(node, k_rule_keys, " in a rule");
    const auto find = [&all](const char* key) -> const Entry* {
        for (const auto& entry : all) {
            if (entry.key == key) {
                return &entry;
            }
        }
        return nullptr;
    };
    if (const Entry* id = find("id")) {
        if (const auto value = text(id->value, "id")) {
            if (is_rule_id(*value)) {
                rule.id = *value;
                id_given = *value;
                name = "rule \"" + *value + "\"";
            } else {
                error(id->value.Mark(), "rule id \"" + *value +
                                            "\" must start with a letter or digit and use only "
                                            "letters, digits, \"-\", \"_\" and \".\"");
                complete = false;
            }
        } else {
            complete = false;
        }
    } else {
        error(node.Mark(), "a rule has no \"id\" (give it a name the team will recognise, "
                           "e.g. \"effort-growth\")");
        complete = false;
    }
    std::optional<RuleKind> kind;
    if (const Entry* entry = find("kind")) {
        if (const auto value =
                choice(entry->value, "kind", {"growth", "added-ceiling", "ceiling", "budget"})) {
            kind = *value == "growth"          ? RuleKind::growth
                   : *value == "added-ceiling" ? RuleKind::added_ceiling
                   : *value == "ceiling"       ? RuleKind::ceiling
                                               : RuleKind::budget;
            rule.kind = *kind;
        }
    } else {
        error(node.Mark(), name + " has no \"kind\" (expected \"growth\", \"added-ceiling\", "
                                  "\"ceiling\" or \"budget\")");
    }
    complete = complete && kind.has_value();
    if (const Entry* entry = find("measure")) {
        if (const auto id = measure(entry->value)) {
            rule.measure = *id;
        } else {
            complete = false;
        }
    } else {
        error(node.Mark(), name + " has no \"measure\" (e.g. \"measure: effort\")");
        complete = false;
    }
    if (const Entry* entry = find("level")) {
        if (const auto value = choice(entry->value, "level", {"blocking", "warning"})) {
            rule.level = *value == "warning" ? Level::warning : Level::blocking;
        } else {
            complete = false;
        }
    }
    if (!kind) {
        return std::nullopt;
    }
    const auto allowed = limit_keys(*kind);
    for (const auto& entry : all) {
        const bool is_limit = entry.key.rfind("max-", 0) == 0 || entry.key == "ceiling";
        if (!is_limit) {
            continue;
        }
        if (std::find(allowed.begin(), allowed.end(), entry.key) == allowed.end()) {
            error(entry.key_node.Mark(), "\"" + entry.key + "\" does not apply to a " +
                                             rule_kind_name(*kind) + " rule (expected " +
                                             quoted_list(allowed, " or ") + ")");
            complete = false;
            continue;
        }
        const auto value = number(entry.value, entry.key);
        if (!value) {
            complete = false;
            continue;
        }
        if (entry.key == "max-increase") {
            rule.max_increase = value;
        } else if (entry.key == "max-increase-percent") {
            rule.max_increase_percent = value;
        } else if (entry.key == "ceiling") {
            rule.ceiling = value;
        } else {
            rule.max_total_increase = value;
        }
    }
    const bool has_limit =
        rule.max_increase || rule.max_increase_percent || rule.ceiling || rule.max_total_increase;
    if (complete && !has_limit) {
        error(node.Mark(), name + " has no limit (a " + rule_kind_name(*kind) + " rule needs " +
                               quoted_list(allowed, *kind == RuleKind::growth ? ", " : " or ") +
                               (*kind == RuleKind::growth ? " or both" : "") + ")");
        complete = false;
    }
    if (!complete) {
        return std::nullopt;
    }
    return rule;
}

} // namespace detail

using detail::PolicyReader;

Policy load_policy(const std::string& text, const std::string& origin) {
    PolicyReader reader(origin);
    Policy policy;
    // yaml-cpp passes stray bytes through but writes them back as U+FFFD, so a policy that is
    // not UTF-8 would not describe itself faithfully: reject it with the byte's position.
    if (const std::size_t bad = text::first_invalid_utf8(text); bad != std::string::npos) {
        YAML::Mark mark;
        mark.pos = static_cast<int>(bad);
        const std::size_t newline = bad == 0 ? std::string::npos : text.rfind('\n', bad - 1);
        mark.line = static_cast<int>(
            std::count(text.begin(), text.begin() + static_cast<std::ptrdiff_t>(bad), '\n'));
        mark.column = static_cast<int>(newline == std::string::npos ? bad : bad - newline - 1);
        char byte[8];
        std::snprintf(byte, sizeof byte, "0x%02X", static_cast<unsigned char>(text[bad]));
        reader.error(mark, std::string("the policy is not UTF-8 text (byte ") + byte +
                               "; save the file as UTF-8)");
        throw PolicyError(reader.errors());
    }
    try {
        policy = reader.read(YAML::Load(text));
    } catch (const YAML::ParserException& e) {
        reader.error(e.mark, "invalid YAML: " + e.msg);
    } catch (const YAML::Exception& e) {
        reader.error(e.mark, "cannot read the policy: " + e.msg);
    }
    if (!reader.errors().empty()) {
        throw PolicyError(reader.errors());
    }
    return policy;
}

Policy load_policy_file(const std::string& path) {
    return load_policy(read_named_file("policy file", path,
                                       "check the path, or run \"tollgate policy --default\" for "
                                       "a start"),
                       path);
}

} // namespace tollgate::policy
