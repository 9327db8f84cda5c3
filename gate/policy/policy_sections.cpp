// SPDX-License-Identifier: MIT
// The policy's sections about where rules apply: paths and their scopes, waivers, the baseline.
#include "gate/policy/calendar_date.hpp"
#include "gate/policy/policy_reader.hpp"

#include <algorithm>

namespace tollgate::policy::detail {

namespace {

const std::vector<std::string> k_path_keys = {"include", "exclude", "scopes"};
const std::vector<std::string> k_scope_keys = {"glob", "rules"};
const std::vector<std::string> k_waiver_keys = {"file", "function", "rules", "reason", "expires"};
const std::vector<std::string> k_baseline_keys = {"path", "tolerate-existing"};

} // namespace

void PolicyReader::read_paths(const YAML::Node& node, Policy& policy) {
    if (!expect_map(node, "paths")) {
        return;
    }
    for (const auto& entry : entries(node, k_path_keys, " in \"paths\"")) {
        if (entry.key == "include") {
            policy.paths.include = globs(entry.value, "include");
        } else if (entry.key == "exclude") {
            policy.paths.exclude = globs(entry.value, "exclude");
        } else if (expect_sequence(entry.value, "scopes")) {
            for (const auto& item : entry.value) {
                if (auto scope = read_scope(item)) {
                    policy.paths.scopes.push_back(std::move(*scope));
                }
            }
        }
    }
}

std::optional<Scope> PolicyReader::read_scope(const YAML::Node& node) {
    if (!node.IsMap()) {
        error(node.Mark(),
              "a scope must be a map with \"glob\" and \"rules\", not " + shape_of(node));
        return std::nullopt;
    }
    Scope result;
    bool has_glob = false;
    YAML::Node rules;
    for (const auto& entry : entries(node, k_scope_keys, " in a scope")) {
        if (entry.key == "glob") {
            if (const auto pattern = text(entry.value, "glob")) {
                result.glob = *pattern;
                has_glob = true;
            }
        } else if (expect_map(entry.value, "rules")) {
            rules = entry.value;
        }
    }
    // Rule ids are the team's own words, so the keys are checked against the rules read above.
    if (rules.IsDefined() && rules.IsMap()) {
        std::map<std::string, int> first_line;
        for (auto it = rules.begin(); it != rules.end(); ++it) {
            const auto id = rule_reference(it->first);
            if (!id) {
                continue;
            }
            if (const auto seen = first_line.find(*id); seen != first_line.end()) {
                error(it->first.Mark(), "duplicate key \"" + *id +
                                            "\" in a scope (first given at line " +
                                            std::to_string(seen->second) + ")");
                continue;
            }
            first_line[*id] = it->first.Mark().line + 1;
            if (auto scoped = read_scoped_rule(*id, it->second)) {
                result.rules.push_back(std::move(*scoped));
            }
        }
    }
    if (!has_glob) {
        if (node["glob"].IsDefined() || node["match"].IsDefined()) {
            return std::nullopt;
        }
        error(node.Mark(), "a scope has no \"glob\" (a glob such as \"tests/**\")");
        return std::nullopt;
    }
    if (!node["rules"].IsDefined()) {
        error(node.Mark(), "scope \"" + result.glob +
                               "\" has no \"rules\" (a map of rule ids to changes or \"skip\")");
        return std::nullopt;
    }
    return result;
}

std::optional<ScopedRule> PolicyReader::read_scoped_rule(const std::string& rule_id,
                                                         const YAML::Node& node) {
    const Rule& rule = *m_rules_by_id.at(rule_id);
    ScopedRule result;
    result.rule_id = rule_id;
    if (node.IsScalar()) {
        if (node.Scalar() == "off" || node.Scalar() == "on") {
            // The words of an earlier draft: say which word replaced each.
            error(node.Mark(), "\"" + rule_id + "\" must be \"skip\" or \"judge\", not \"" +
                                   node.Scalar() + "\" (write \"" +
                                   (node.Scalar() == "off" ? "skip" : "judge") + "\")");
            return std::nullopt;
        }
        if (const auto value = choice(node, rule_id, {"skip", "judge"})) {
            result.state = *value == "skip" ? RuleSwitch::skip : RuleSwitch::judge;
            return result;
        }
        return std::nullopt;
    }
    if (rule.kind == RuleKind::budget) {
        error(node.Mark(), "rule \"" + rule_id +
                               "\" is a budget on the whole change: a scope can only \"skip\" "
                               "or \"judge\" it for the matched paths");
        return std::nullopt;
    }
    if (!node.IsMap()) {
        error(node.Mark(), "\"" + rule_id +
                               "\" must be \"skip\", \"judge\" or a map of changes, not " +
                               shape_of(node));
        return std::nullopt;
    }
    std::vector<std::string> known = limit_keys(rule.kind);
    known.push_back("level");
    bool complete = true;
    for (const auto& entry : entries(node, known, " for rule \"" + rule_id + "\"")) {
        if (entry.key == "level") {
            if (const auto value = choice(entry.value, "level", {"blocking", "warning"})) {
                result.level = *value == "warning" ? Level::warning : Level::blocking;
            } else {
                complete = false;
            }
            continue;
        }
        ScopedLimit limit;
        if (entry.value.IsScalar() && entry.value.Scalar() == "none") {
            limit.setting = LimitSetting::remove;
        } else if (entry.value.IsScalar() && entry.value.Scalar() == "off") {
            error(entry.value.Mark(), "\"" + entry.key +
                                          "\" must be a number or \"none\", not \"off\" (write "
                                          "\"none\" to remove the limit on these paths)");
            complete = false;
            continue;
        } else if (const auto value = number(entry.value, entry.key)) {
            limit.setting = LimitSetting::set;
            limit.value = *value;
        } else {
            complete = false;
            continue;
        }
        if (entry.key == "max-increase") {
            result.max_increase = limit;
        } else if (entry.key == "max-increase-percent") {
            result.max_increase_percent = limit;
        } else {
            result.ceiling = limit;
        }
    }
    if (!complete) {
        return std::nullopt;
    }
    return result;
}

std::optional<Waiver> PolicyReader::read_waiver(const YAML::Node& node) {
    if (!node.IsMap()) {
        error(node.Mark(), "a waiver must be a map with \"file\", \"function\", \"rules\" and "
                           "\"reason\", not " +
                               shape_of(node));
        return std::nullopt;
    }
    Waiver waiver;
    bool complete = true;
    bool seen_file = false, seen_function = false, seen_rules = false, seen_reason = false;
    for (const auto& entry : entries(node, k_waiver_keys, " in a waiver")) {
        if (entry.key == "file" || entry.key == "function" || entry.key == "reason") {
            const auto value = text(entry.value, entry.key);
            if (!value) {
                complete = false;
                continue;
            }
            if (entry.key == "file") {
                waiver.file = *value;
                seen_file = true;
            } else if (entry.key == "function") {
                waiver.function = *value;
                seen_function = true;
            } else {
                waiver.reason = *value;
                seen_reason = true;
            }
        } else if (entry.key == "expires") {
            if (entry.value.IsScalar() && is_calendar_date(entry.value.Scalar())) {
                waiver.expires = entry.value.Scalar();
            } else {
                error(entry.value.Mark(), "invalid date " + shape_of(entry.value) +
                                              " for \"expires\" (expected YYYY-MM-DD, the last "
                                              "day the waiver applies)");
                complete = false;
            }
        } else {
            seen_rules = true;
            std::vector<YAML::Node> items;
            if (entry.value.IsSequence()) {
                for (const auto& item : entry.value) {
                    items.push_back(item);
                }
            } else {
                items.push_back(entry.value);
            }
            if (items.empty()) {
                error(entry.value.Mark(), "a waiver's \"rules\" must name at least one rule");
                complete = false;
            }
            for (const auto& item : items) {
                if (const auto id = rule_reference(item)) {
                    waiver.rules.push_back(*id);
                } else {
                    complete = false;
                }
            }
        }
    }
    const auto missing = [&](bool seen, const char* key, const char* hint) {
        if (!seen && !node[key].IsDefined()) {
            error(node.Mark(), std::string("a waiver has no \"") + key + "\" (" + hint + ")");
        }
        if (!seen) {
            complete = false;
        }
    };
    missing(seen_file, "file", "a glob on the path, e.g. \"src/legacy/**\"");
    missing(seen_function, "function", "a glob on the qualified name, e.g. \"Parser::*\"");
    missing(seen_rules, "rules", "the rule ids it exempts from, e.g. [effort-growth]");
    missing(seen_reason, "reason", "say why the function is exempt; a waiver needs a reason");
    if (!complete) {
        return std::nullopt;
    }
    return waiver;
}

void PolicyReader::read_baseline(const YAML::Node& node, Policy& policy) {
    if (!expect_map(node, "baseline")) {
        return;
    }
    for (const auto& entry : entries(node, k_baseline_keys, " in \"baseline\"")) {
        if (entry.key == "path") {
            if (const auto value = text(entry.value, "path")) {
                policy.baseline.path = *value;
            }
        } else if (const auto value = choice(entry.value, "tolerate-existing", {"true", "false"})) {
            policy.baseline.tolerate_existing = *value == "true" ? Tolerance::on : Tolerance::off;
        }
    }
}

} // namespace tollgate::policy::detail
