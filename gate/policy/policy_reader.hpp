// SPDX-License-Identifier: MIT
// The reader behind load_policy, shared by the files that read the policy's sections.
#pragma once

#include "gate/policy/policy.hpp"

#include <map>
#include <optional>
#include <string>
#include <tuple>
#include <vector>
#include <yaml-cpp/yaml.h>

namespace tollgate::policy::detail {

// Return how a node looks in a message: "a list", "a map", "nothing" or its quoted text.
std::string shape_of(const YAML::Node& node);

// Return the limit keys each kind of rule takes.
std::vector<std::string> limit_keys(RuleKind kind);

// One key of a YAML map with its value.
struct Entry {
    std::string key;     // the key's text
    YAML::Node key_node; // for its position
    YAML::Node value;    // the value
};

// Reads one document into a Policy, collecting every problem instead of stopping at the first.
class PolicyReader {
public:
    explicit PolicyReader(const std::string& origin) : m_origin(origin) {}

    Policy read(const YAML::Node& root);
    void error(const YAML::Mark& mark, const std::string& message) {
        std::string where = m_origin;
        const bool placed = mark.line >= 0 && mark.column >= 0;
        if (placed) {
            // yaml-cpp counts from 0; editors and compilers count from 1.
            where += ":" + std::to_string(mark.line + 1) + ":" + std::to_string(mark.column + 1);
        }
        m_problems.push_back(
            Problem{placed ? mark.line : -1, placed ? mark.column : -1, where + ": " + message});
    }
    // Return every problem in file order (unplaced ones first).
    std::vector<std::string> errors() const {
        std::vector<Problem> sorted = m_problems;
        std::stable_sort(sorted.begin(), sorted.end(), [](const Problem& a, const Problem& b) {
            return std::tie(a.line, a.column) < std::tie(b.line, b.column);
        });
        std::vector<std::string> texts;
        for (const auto& problem : sorted) {
            texts.push_back(problem.text);
        }
        return texts;
    }

private:
    std::vector<Entry> entries(const YAML::Node& map, const std::vector<std::string>& known,
                               const std::string& context);
    bool expect_map(const YAML::Node& node, const std::string& key);
    bool expect_sequence(const YAML::Node& node, const std::string& key);
    std::optional<std::string> text(const YAML::Node& node, const std::string& key);
    std::optional<double> number(const YAML::Node& node, const std::string& key);
    std::optional<std::string> choice(const YAML::Node& node, const std::string& key,
                                      const std::vector<std::string>& allowed);
    std::optional<core::MeasureId> measure(const YAML::Node& node);
    std::vector<std::string> globs(const YAML::Node& node, const std::string& key);
    std::optional<std::string> rule_reference(const YAML::Node& node);

    void read_noise_floor(const YAML::Node& node, Policy& policy);
    void read_rules(const YAML::Node& node, Policy& policy);
    std::optional<Rule> read_rule(const YAML::Node& node, std::string& id);
    void read_paths(const YAML::Node& node, Policy& policy);
    std::optional<Scope> read_scope(const YAML::Node& node);
    std::optional<ScopedRule> read_scoped_rule(const std::string& rule_id, const YAML::Node& node);
    std::optional<Waiver> read_waiver(const YAML::Node& node);
    void read_baseline(const YAML::Node& node, Policy& policy);
    void read_unmeasured_lines(const YAML::Node& node, Policy& policy);

    std::string m_origin;
    std::map<std::string, const Rule*> m_rules_by_id; // valid rules, filled once rules are read
    std::vector<std::string> m_all_ids;               // every rule id given, broken rules included
    std::vector<Rule> m_rules;
    // Problems with their position, sorted into file order when reported.
    struct Problem {
        int line;
        int column;
        std::string text;
    };
    std::vector<Problem> m_problems;
};

} // namespace tollgate::policy::detail
