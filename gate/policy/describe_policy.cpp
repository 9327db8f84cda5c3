// SPDX-License-Identifier: MIT
// The canonical YAML dump of a policy and the readable difference between two policies.
#include "gate/policy/policy.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <map>
#include <yaml-cpp/yaml.h>

namespace tollgate::policy {

namespace {

void emit_limit(YAML::Emitter& out, const char* key, const std::optional<double>& value) {
    if (value) {
        out << YAML::Key << key << YAML::Value << plain_number(*value);
    }
}

void emit_limit(YAML::Emitter& out, const char* key, const LimitOverride& limit) {
    if (limit.setting == LimitSetting::set) {
        out << YAML::Key << key << YAML::Value << plain_number(limit.value);
    } else if (limit.setting == LimitSetting::remove) {
        out << YAML::Key << key << YAML::Value << "off";
    }
}

void emit_globs(YAML::Emitter& out, const char* key, const std::vector<std::string>& globs) {
    out << YAML::Key << key << YAML::Value << YAML::Flow << YAML::BeginSeq;
    for (const auto& glob : globs) {
        out << YAML::DoubleQuoted << glob;
    }
    out << YAML::EndSeq;
}

} // namespace

std::string plain_number(double value) {
    char text[64];
    if (std::floor(value) == value && std::fabs(value) < 1e15) {
        std::snprintf(text, sizeof text, "%.0f", value);
        return text;
    }
    for (int digits = 1; digits <= 17; ++digits) {
        std::snprintf(text, sizeof text, "%.*g", digits, value);
        if (std::strtod(text, nullptr) == value) {
            break;
        }
    }
    return text;
}

std::string describe_policy(const Policy& policy) {
    YAML::Emitter out;
    out.SetIndent(2);
    // Control characters are escaped by the emitter; escaping every non-ASCII character too
    // keeps invisible ones (a right-to-left override in a glob) visible, and stays valid YAML.
    out.SetOutputCharset(YAML::EscapeNonAscii);
    out << YAML::BeginMap;
    out << YAML::Key << "tollgate-policy" << YAML::Value << policy.schema_version;
    out << YAML::Key << "judge-with" << YAML::Value << judge_with_name(policy.judge_with);

    out << YAML::Key << "noise-floor" << YAML::Value;
    if (policy.noise_floor.empty()) {
        out << YAML::Flow;
    }
    out << YAML::BeginMap;
    for (const auto& floor : policy.noise_floor) {
        out << YAML::Key << std::string(core::measure_name(floor.measure)) << YAML::Value
            << plain_number(floor.below);
    }
    out << YAML::EndMap;

    out << YAML::Key << "rules" << YAML::Value;
    if (policy.rules.empty()) {
        out << YAML::Flow;
    }
    out << YAML::BeginSeq;
    for (const auto& rule : policy.rules) {
        out << YAML::BeginMap;
        out << YAML::Key << "id" << YAML::Value << rule.id;
        out << YAML::Key << "kind" << YAML::Value << rule_kind_name(rule.kind);
        out << YAML::Key << "measure" << YAML::Value
            << std::string(core::measure_name(rule.measure));
        emit_limit(out, "max-increase", rule.max_increase);
        emit_limit(out, "max-increase-percent", rule.max_increase_percent);
        emit_limit(out, "ceiling", rule.ceiling);
        emit_limit(out, "max-total-increase", rule.max_total_increase);
        out << YAML::Key << "level" << YAML::Value << level_name(rule.level);
        out << YAML::EndMap;
    }
    out << YAML::EndSeq;

    out << YAML::Key << "paths" << YAML::Value << YAML::BeginMap;
    emit_globs(out, "include", policy.paths.include);
    emit_globs(out, "exclude", policy.paths.exclude);
    out << YAML::Key << "overrides" << YAML::Value;
    if (policy.paths.overrides.empty()) {
        out << YAML::Flow;
    }
    out << YAML::BeginSeq;
    for (const auto& path_override : policy.paths.overrides) {
        out << YAML::BeginMap;
        out << YAML::Key << "match" << YAML::Value << YAML::DoubleQuoted << path_override.match;
        out << YAML::Key << "rules" << YAML::Value;
        if (path_override.rules.empty()) {
            out << YAML::Flow;
        }
        out << YAML::BeginMap;
        for (const auto& rule : path_override.rules) {
            out << YAML::Key << rule.rule_id << YAML::Value;
            const bool changes = rule.level || rule.max_increase.setting != LimitSetting::keep ||
                                 rule.max_increase_percent.setting != LimitSetting::keep ||
                                 rule.ceiling.setting != LimitSetting::keep;
            if (rule.state == RuleSwitch::off) {
                out << "off";
            } else if (!changes) {
                out << "on";
            } else {
                out << YAML::Flow << YAML::BeginMap;
                emit_limit(out, "max-increase", rule.max_increase);
                emit_limit(out, "max-increase-percent", rule.max_increase_percent);
                emit_limit(out, "ceiling", rule.ceiling);
                if (rule.level) {
                    out << YAML::Key << "level" << YAML::Value << level_name(*rule.level);
                }
                out << YAML::EndMap;
            }
        }
        out << YAML::EndMap;
        out << YAML::EndMap;
    }
    out << YAML::EndSeq;
    out << YAML::EndMap;

    out << YAML::Key << "waivers" << YAML::Value;
    if (policy.waivers.empty()) {
        out << YAML::Flow;
    }
    out << YAML::BeginSeq;
    for (const auto& waiver : policy.waivers) {
        out << YAML::BeginMap;
        out << YAML::Key << "file" << YAML::Value << YAML::DoubleQuoted << waiver.file;
        out << YAML::Key << "function" << YAML::Value << YAML::DoubleQuoted << waiver.function;
        out << YAML::Key << "rules" << YAML::Value << YAML::Flow << waiver.rules;
        out << YAML::Key << "reason" << YAML::Value << YAML::DoubleQuoted << waiver.reason;
        if (!waiver.expires.empty()) {
            out << YAML::Key << "expires" << YAML::Value << waiver.expires;
        }
        out << YAML::EndMap;
    }
    out << YAML::EndSeq;

    out << YAML::Key << "baseline" << YAML::Value << YAML::BeginMap;
    if (!policy.baseline.path.empty()) {
        out << YAML::Key << "path" << YAML::Value << YAML::DoubleQuoted << policy.baseline.path;
    }
    out << YAML::Key << "grandfather" << YAML::Value
        << (policy.baseline.grandfather == Grandfathering::on ? "true" : "false");
    out << YAML::EndMap;

    out << YAML::Key << "inactive-code" << YAML::Value << inactive_code_name(policy.inactive_code);
    out << YAML::Key << "unmeasured-lines" << YAML::Value;
    if (policy.unmeasured_lines.limit) {
        out << YAML::BeginMap;
        out << YAML::Key << "limit" << YAML::Value << plain_number(*policy.unmeasured_lines.limit);
        out << YAML::Key << "level" << YAML::Value << level_name(policy.unmeasured_lines.level);
        out << YAML::EndMap;
    } else {
        out << "off";
    }

    out << YAML::EndMap;
    return std::string(out.c_str()) + "\n";
}

namespace {

// One setting of a policy, for comparison: a group (a rule, an override, a waiver, or the top
// level) and a field within it.
struct Setting {
    std::string group; // e.g. `rules["effort-growth"]`; empty for top-level settings
    std::string field; // e.g. "max-increase-percent"
    std::string value; // as a reader would write it
};

std::string quote(const std::string& text) {
    return "\"" + text + "\"";
}

std::string join(const std::vector<std::string>& words) {
    std::string text = "[";
    for (std::size_t i = 0; i < words.size(); ++i) {
        text += (i > 0 ? ", " : "") + quote(words[i]);
    }
    return text + "]";
}

std::string describe_limit(const LimitOverride& limit) {
    return limit.setting == LimitSetting::remove ? "off" : plain_number(limit.value);
}

std::vector<Setting> flatten(const Policy& policy) {
    std::vector<Setting> settings;
    const auto add = [&settings](std::string group, std::string field, std::string value) {
        settings.push_back(Setting{std::move(group), std::move(field), std::move(value)});
    };
    add("", "tollgate-policy", std::to_string(policy.schema_version));
    add("", "judge-with", judge_with_name(policy.judge_with));
    for (const auto& floor : policy.noise_floor) {
        add("", "noise-floor." + std::string(core::measure_name(floor.measure)),
            plain_number(floor.below));
    }
    add("", "paths.include", join(policy.paths.include));
    add("", "paths.exclude", join(policy.paths.exclude));
    add("", "baseline.path", policy.baseline.path.empty() ? "none" : quote(policy.baseline.path));
    add("", "baseline.grandfather",
        policy.baseline.grandfather == Grandfathering::on ? "true" : "false");
    add("", "inactive-code", inactive_code_name(policy.inactive_code));
    add("", "unmeasured-lines",
        policy.unmeasured_lines.limit
            ? "{limit " + plain_number(*policy.unmeasured_lines.limit) + ", level " +
                  level_name(policy.unmeasured_lines.level) + "}"
            : std::string("off"));
    for (const auto& rule : policy.rules) {
        const std::string group = "rules[" + quote(rule.id) + "]";
        add(group, "kind", rule_kind_name(rule.kind));
        add(group, "measure", std::string(core::measure_name(rule.measure)));
        add(group, "level", level_name(rule.level));
        if (rule.max_increase) {
            add(group, "max-increase", plain_number(*rule.max_increase));
        }
        if (rule.max_increase_percent) {
            add(group, "max-increase-percent", plain_number(*rule.max_increase_percent));
        }
        if (rule.ceiling) {
            add(group, "ceiling", plain_number(*rule.ceiling));
        }
        if (rule.max_total_increase) {
            add(group, "max-total-increase", plain_number(*rule.max_total_increase));
        }
    }
    std::map<std::string, int> seen_matches;
    for (std::size_t i = 0; i < policy.paths.overrides.size(); ++i) {
        const auto& path_override = policy.paths.overrides[i];
        const int repeat = ++seen_matches[path_override.match];
        const std::string group = "paths.overrides[" + quote(path_override.match) +
                                  (repeat > 1 ? " #" + std::to_string(repeat) : "") + "]";
        add(group, "match", quote(path_override.match));
        for (const auto& rule : path_override.rules) {
            std::string value;
            if (rule.state == RuleSwitch::off) {
                value = "off";
            } else {
                const auto part = [&value](const std::string& text) {
                    value += (value.empty() ? "" : ", ") + text;
                };
                if (rule.max_increase.setting != LimitSetting::keep) {
                    part("max-increase " + describe_limit(rule.max_increase));
                }
                if (rule.max_increase_percent.setting != LimitSetting::keep) {
                    part("max-increase-percent " + describe_limit(rule.max_increase_percent));
                }
                if (rule.ceiling.setting != LimitSetting::keep) {
                    part("ceiling " + describe_limit(rule.ceiling));
                }
                if (rule.level) {
                    part(std::string("level ") + level_name(*rule.level));
                }
                value = value.empty() ? "on" : "{" + value + "}";
            }
            add(group, rule.rule_id, value);
        }
    }
    std::map<std::string, int> seen_waivers;
    for (const auto& waiver : policy.waivers) {
        const std::string name = quote(waiver.file) + " " + quote(waiver.function);
        const int repeat = ++seen_waivers[name];
        const std::string group =
            "waivers[" + name + (repeat > 1 ? " #" + std::to_string(repeat) : "") + "]";
        add(group, "rules", join(waiver.rules));
        add(group, "reason", quote(waiver.reason));
        add(group, "expires", waiver.expires.empty() ? "never" : waiver.expires);
    }
    return settings;
}

// Return the settings of `group` as "field value, field value".
std::string summarise(const std::vector<Setting>& settings, const std::string& group) {
    std::string text;
    for (const auto& setting : settings) {
        if (setting.group == group) {
            text += (text.empty() ? "" : ", ") + setting.field + " " + setting.value;
        }
    }
    return text;
}

} // namespace

std::vector<std::string> policy_difference(const Policy& base, const Policy& head) {
    const auto base_settings = flatten(base);
    const auto head_settings = flatten(head);
    const auto find = [](const std::vector<Setting>& settings, const std::string& group,
                         const std::string& field) -> const Setting* {
        for (const auto& setting : settings) {
            if (setting.group == group && setting.field == field) {
                return &setting;
            }
        }
        return nullptr;
    };
    const auto has_group = [](const std::vector<Setting>& settings, const std::string& group) {
        for (const auto& setting : settings) {
            if (setting.group == group) {
                return true;
            }
        }
        return false;
    };
    std::vector<std::string> lines;
    std::vector<std::string> reported_groups;
    const auto reported = [&reported_groups](const std::string& group) {
        return std::find(reported_groups.begin(), reported_groups.end(), group) !=
               reported_groups.end();
    };
    // Base order first, then what only head has, so the lines follow the files.
    for (const auto& setting : base_settings) {
        const std::string name =
            setting.group.empty() ? setting.field : setting.group + "." + setting.field;
        if (!setting.group.empty() && !has_group(head_settings, setting.group)) {
            if (!reported(setting.group)) {
                reported_groups.push_back(setting.group);
                lines.push_back(setting.group + ": only in base (" +
                                summarise(base_settings, setting.group) + ")");
            }
            continue;
        }
        const Setting* other = find(head_settings, setting.group, setting.field);
        if (other == nullptr) {
            lines.push_back(name + ": " + setting.value + " in base, not set in head");
        } else if (other->value != setting.value) {
            lines.push_back(name + ": " + setting.value + " in base, " + other->value + " in head");
        }
    }
    for (const auto& setting : head_settings) {
        const std::string name =
            setting.group.empty() ? setting.field : setting.group + "." + setting.field;
        if (!setting.group.empty() && !has_group(base_settings, setting.group)) {
            if (!reported(setting.group)) {
                reported_groups.push_back(setting.group);
                lines.push_back(setting.group + ": only in head (" +
                                summarise(head_settings, setting.group) + ")");
            }
            continue;
        }
        if (find(base_settings, setting.group, setting.field) == nullptr) {
            lines.push_back(name + ": not set in base, " + setting.value + " in head");
        }
    }
    return lines;
}

} // namespace tollgate::policy
