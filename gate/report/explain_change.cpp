// SPDX-License-Identifier: MIT
// One function's tokens before and after, side by side, and what changed per token.
#include "gate/report/explain_change.hpp"

#include "gate/common/text_safety.hpp"

#include <algorithm>
#include <cstdlib>
#include <fmt/format.h>
#include <nlohmann/json.hpp>
#include <tuple>

namespace tollgate::report {

namespace {

using text::terminal_text;

void add_side(std::vector<TokenChange>& changes,
              const std::map<std::string, core::TableEntry>& base,
              const std::map<std::string, core::TableEntry>& head, TokenRole role) {
    std::map<std::string, TokenChange> merged;
    for (const auto& [token, entry] : base) {
        merged[token] = TokenChange{token, role, entry.count, 0};
    }
    for (const auto& [token, entry] : head) {
        auto [it, inserted] = merged.emplace(token, TokenChange{token, role, 0, entry.count});
        if (!inserted) {
            it->second.head = entry.count;
        }
    }
    for (auto& [token, change] : merged) {
        changes.push_back(std::move(change));
    }
}

std::string signed_count(long long value) {
    return (value > 0 ? "+" : "") + std::to_string(value);
}

std::string token_word(const TokenChange& change) {
    return change.role == TokenRole::operand ? "`" + change.token + "`" : change.token;
}

const core::Counts& counts_of(const std::optional<MeasuredFunction>& side) {
    static const core::Counts k_none;
    return side ? side->counts : k_none;
}

const MeasuredFunction& shown(const FunctionComparison& c) {
    return c.head ? *c.head : *c.base;
}

void write_tokens(std::ostream& out, const std::vector<TokenChange>& changes, TokenRole role,
                  const FunctionComparison& c) {
    const core::Counts& base = counts_of(c.base);
    const core::Counts& head = counts_of(c.head);
    const bool operands = role == TokenRole::operand;
    out << fmt::format("{}: distinct {} -> {}, in all {} -> {}\n",
                       operands ? "operands, n2" : "operators, n1",
                       operands ? base.distinct_operands : base.distinct_operators,
                       operands ? head.distinct_operands : head.distinct_operators,
                       operands ? base.total_operands : base.total_operators,
                       operands ? head.total_operands : head.total_operators);
    std::vector<std::pair<std::string, const TokenChange*>> rows;
    std::size_t unchanged = 0;
    for (const auto& change : changes) {
        if (change.role != role) {
            continue;
        }
        if (change.difference() == 0) {
            ++unchanged;
            continue;
        }
        rows.emplace_back(terminal_text(change.token), &change);
    }
    std::size_t width = std::string("token").size();
    for (const auto& row : rows) {
        width = std::max(width, text::display_width(row.first));
    }
    if (!rows.empty()) {
        out << fmt::format("  {}{}  {:>6}  {:>6}  {}\n", "token",
                           std::string(width - std::string("token").size(), ' '), "base", "head",
                           "difference");
    }
    for (const auto& [text, change] : rows) {
        out << fmt::format("  {}{}  {:>6}  {:>6}  {}\n", text,
                           std::string(width - text::display_width(text), ' '), change->base,
                           change->head, signed_count(change->difference()));
    }
    out << fmt::format("  {} {} unchanged\n\n", unchanged,
                       unchanged == 1 ? "other token" : "other tokens");
}

std::string side_heading(const std::optional<MeasuredFunction>& side, const std::string& label,
                         const char* missing) {
    if (!side) {
        return label + ": " + missing;
    }
    return fmt::format("{}: {}:{}-{}{}", label, side->path, side->start_line, side->end_line,
                       side->parser_stopped ? " (measured lexically: the parser stopped)"
                       : side->lexical      ? " (lexical extent)"
                                            : "");
}

} // namespace

std::vector<TokenChange> compare_tokens(const core::Counts& base, const core::Counts& head) {
    std::vector<TokenChange> changes;
    add_side(changes, base.operators, head.operators, TokenRole::operator_token);
    add_side(changes, base.operands, head.operands, TokenRole::operand);
    std::stable_sort(changes.begin(), changes.end(),
                     [](const TokenChange& a, const TokenChange& b) {
                         const auto key = [](const TokenChange& x) {
                             const long long d = x.difference();
                             return std::make_tuple(d == 0 ? 1 : 0, -std::llabs(d), d < 0 ? 1 : 0,
                                                    x.role == TokenRole::operand ? 1 : 0);
                         };
                         return std::tuple_cat(key(a), std::tie(a.token)) <
                                std::tuple_cat(key(b), std::tie(b.token));
                     });
    return changes;
}

std::string token_difference_summary(const std::vector<TokenChange>& changes, std::size_t limit) {
    std::string text;
    std::size_t shown_count = 0, changed = 0;
    for (const auto& change : changes) {
        if (change.difference() == 0) {
            continue;
        }
        ++changed;
        if (shown_count < limit) {
            text += (text.empty() ? "" : ", ") + signed_count(change.difference()) + " " +
                    token_word(change);
            ++shown_count;
        }
    }
    if (changed == 0) {
        return "no token changed";
    }
    if (changed > shown_count) {
        text += fmt::format(", and {} more", changed - shown_count);
    }
    return text;
}

void write_explain_change_text(std::ostream& out, const FunctionComparison& c) {
    const MeasuredFunction& f = shown(c);
    out << terminal_text(fmt::format("{}({})  [{}]", f.name, f.signature, c.convention)) << "\n";
    out << terminal_text(
               side_heading(c.base, "base " + c.base_label, "no such function (added since)")) +
               (c.base && !c.base_match.empty() ? terminal_text(" (" + c.base_match + ")") : "")
        << "\n";
    out << terminal_text(side_heading(c.head, "head " + c.head_label, "no such function (removed)"))
        << "\n\n";
    const auto changes = compare_tokens(counts_of(c.base), counts_of(c.head));
    out << "what changed: " << terminal_text(token_difference_summary(changes, 8)) << "\n\n";
    write_tokens(out, changes, TokenRole::operator_token, c);
    write_tokens(out, changes, TokenRole::operand, c);

    struct Row {
        const char* name;
        core::MeasureId id;
        int decimals;
    };
    const Row rows[] = {
        {"n1", core::MeasureId::n1, 0},
        {"n2", core::MeasureId::n2, 0},
        {"N1", core::MeasureId::N1, 0},
        {"N2", core::MeasureId::N2, 0},
        {"length", core::MeasureId::length, 0},
        {"vocabulary", core::MeasureId::vocabulary, 0},
        {"volume", core::MeasureId::volume, 1},
        {"difficulty", core::MeasureId::difficulty, 2},
        {"effort", core::MeasureId::effort, 0},
        {"time (s)", core::MeasureId::time, 1},
        {"bugs", core::MeasureId::bugs_volume, 3},
    };
    out << fmt::format("  {:<12}{:>14}{:>14}{:>14}\n", "measures", "base", "head", "difference");
    for (const auto& row : rows) {
        const double base = c.base ? core::measure_value(c.base->measures, row.id) : 0.0;
        const double head = c.head ? core::measure_value(c.head->measures, row.id) : 0.0;
        const double difference = head - base;
        const std::string sign = difference > 0 ? "+" : "";
        out << fmt::format("  {:<12}{:>14}{:>14}{:>14}\n", row.name,
                           c.base ? format_number(base, row.decimals) : "-",
                           c.head ? format_number(head, row.decimals) : "-",
                           sign + format_number(difference, row.decimals));
    }
}

void write_explain_change_json(std::ostream& out, const FunctionComparison& c) {
    const auto side_json = [](const std::optional<MeasuredFunction>& side) -> nlohmann::json {
        if (!side) {
            return nullptr;
        }
        nlohmann::json measures = nlohmann::json::object();
        for (const auto id : core::k_all_measures) {
            measures[std::string(core::measure_name(id))] = core::measure_value(side->measures, id);
        }
        return {{"file", side->path},           {"line", side->start_line},
                {"end_line", side->end_line},   {"function", side->name},
                {"signature", side->signature}, {"measures", measures}};
    };
    const auto changes = compare_tokens(counts_of(c.base), counts_of(c.head));
    nlohmann::json tokens = nlohmann::json::array();
    for (const auto& change : changes) {
        tokens.push_back({{"token", change.token},
                          {"role", change.role == TokenRole::operand ? "operand" : "operator"},
                          {"base", change.base},
                          {"head", change.head},
                          {"difference", change.difference()}});
    }
    const nlohmann::json document = {
        {"schema", "tollgate.explain-change/1"},
        {"convention", c.convention},
        {"base_source", c.base_label},
        {"head_source", c.head_label},
        {"base_match", c.base_match},
        {"base", side_json(c.base)},
        {"head", side_json(c.head)},
        {"summary", token_difference_summary(changes, 8)},
        {"tokens", tokens},
    };
    out << text::dump_json(document, 2) << "\n";
}

} // namespace tollgate::report
