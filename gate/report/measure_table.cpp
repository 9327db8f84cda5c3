// SPDX-License-Identifier: MIT
// Text and JSON renderers for per-function measures.
#include "gate/report/measure_table.hpp"

#include "gate/common/text_safety.hpp"
#include "gate/report/marks.hpp"

#include <algorithm>
#include <fmt/format.h>
#include <nlohmann/json.hpp>

namespace tollgate::report {

namespace {

using core::MeasureId;

struct Column {
    const char* title; // header text
    MeasureId id;      // the measure shown
    int decimals;      // places after the point
    bool summed;       // whether the total line sums it
};

const std::vector<Column>& columns_for(Columns columns) {
    static const std::vector<Column> essential = {
        {"n1", MeasureId::n1, 0, false},   {"n2", MeasureId::n2, 0, false},
        {"N1", MeasureId::N1, 0, true},    {"N2", MeasureId::N2, 0, true},
        {"V", MeasureId::volume, 1, true}, {"D", MeasureId::difficulty, 2, false},
        {"E", MeasureId::effort, 0, true},
    };
    static const std::vector<Column> all = {
        {"n1", MeasureId::n1, 0, false},
        {"n2", MeasureId::n2, 0, false},
        {"N1", MeasureId::N1, 0, true},
        {"N2", MeasureId::N2, 0, true},
        {"N", MeasureId::length, 0, true},
        {"n", MeasureId::vocabulary, 0, false},
        {"N^", MeasureId::estimated_length, 1, false},
        {"V", MeasureId::volume, 1, true},
        {"D", MeasureId::difficulty, 2, false},
        {"L^", MeasureId::level, 3, false},
        {"E", MeasureId::effort, 0, true},
        {"T(s)", MeasureId::time, 1, true},
        {"B(V)", MeasureId::bugs_volume, 3, true},
        {"B(E)", MeasureId::bugs_effort, 3, true},
        {"V*", MeasureId::potential_volume, 1, false},
        {"V*/V", MeasureId::volume_ratio, 3, false},
    };
    return columns == Columns::all ? all : essential;
}

using text::terminal_text;

std::string location(const MeasuredFunction& f) {
    return fmt::format("{}:{}", terminal_text(f.path), f.start_line);
}

// The marks after a function's name that say how it was found (none for the parser's ordinary
// result): " [parser stopped]", " [inactive]", " [lexical]", " [brace extent]".
std::string display_name(const MeasuredFunction& f) {
    return terminal_text(f.name + (f.parser_stopped ? " [parser stopped]" : "") +
                         mark_suffix({f.lexical, f.inactive, f.brace_extent}));
}

const char* extent_of(const MeasuredFunction& f) {
    return f.parser_stopped ? "parser-stopped" : f.lexical ? "lexical" : "syntax-tree";
}

nlohmann::json measures_json(const core::Measures& m) {
    nlohmann::json object = nlohmann::json::object();
    for (const auto id : core::k_all_measures) {
        const double value = core::measure_value(m, id);
        object[std::string(core::measure_name(id))] = value;
    }
    return object;
}

nlohmann::json function_json(const MeasuredFunction& f) {
    return {
        {"file", f.path},
        {"line", f.start_line},
        {"end_line", f.end_line},
        {"function", f.name},
        {"signature", f.signature},
        {"extent", extent_of(f)},
        {"marks", mark_words({f.lexical, f.inactive, f.brace_extent})},
        {"measures", measures_json(f.measures)},
    };
}

nlohmann::json warnings_json(const std::vector<SourceWarning>& warnings) {
    nlohmann::json list = nlohmann::json::array();
    for (const auto& w : warnings) {
        list.push_back({{"file", w.path}, {"line", w.line}, {"message", w.message}});
    }
    return list;
}

} // namespace

std::string format_number(double value, int decimals) {
    const std::string plain = fmt::format("{:.{}f}", value, decimals);
    const std::size_t digits_start = plain.find_first_of("0123456789");
    if (digits_start == std::string::npos) {
        return plain; // inf, nan
    }
    const std::size_t digits_end = std::min(plain.find('.'), plain.size());
    std::string grouped = plain.substr(0, digits_start);
    for (std::size_t i = digits_start; i < digits_end; ++i) {
        if (i > digits_start && (digits_end - i) % 3 == 0) {
            grouped += ',';
        }
        grouped += plain[i];
    }
    return grouped + plain.substr(digits_end);
}

void write_measure_text(std::ostream& out, const std::vector<MeasuredFunction>& functions,
                        const std::vector<SourceWarning>& warnings, Columns columns,
                        const std::string& source_label, std::size_t width, Fit fit) {
    if (functions.empty()) {
        out << "no function definitions found in " << terminal_text(source_label) << "\n";
    } else {
        const auto& cols = columns_for(columns);
        // Measure columns go from the end of the list first; effort stays.
        std::vector<TableColumn> layout = {{"location", false, Shorten::location, 0},
                                           {"function", false, Shorten::name, 0}};
        for (std::size_t c = 0; c < cols.size(); ++c) {
            const int rank =
                cols[c].id == MeasureId::effort ? 0 : static_cast<int>(cols.size() - c);
            layout.push_back({cols[c].title, true, Shorten::none, rank});
        }
        std::vector<std::vector<std::string>> rows;
        std::vector<double> totals(cols.size(), 0.0);
        for (const auto& f : functions) {
            std::vector<std::string> row = {location(f), display_name(f)};
            for (std::size_t c = 0; c < cols.size(); ++c) {
                const double value = core::measure_value(f.measures, cols[c].id);
                totals[c] += value;
                row.push_back(format_number(value, cols[c].decimals));
            }
            rows.push_back(std::move(row));
        }
        std::vector<std::string> total_row = {
            fmt::format("total ({} functions)",
                        format_number(static_cast<double>(functions.size()), 0)),
            ""};
        for (std::size_t c = 0; c < cols.size(); ++c) {
            total_row.push_back(cols[c].summed ? format_number(totals[c], cols[c].decimals) : "");
        }
        rows.push_back(std::move(total_row));
        for (const auto& line : layout_table(layout, rows, width, fit)) {
            out << line << "\n";
        }
    }
    for (const auto& w : warnings) {
        if (w.path.empty()) {
            out << terminal_text("note: " + w.message) << "\n";
        } else if (w.line > 0) {
            out << terminal_text(fmt::format("warning: {}:{}: {}", w.path, w.line, w.message))
                << "\n";
        } else {
            out << terminal_text(fmt::format("warning: {}: {}", w.path, w.message)) << "\n";
        }
    }
}

void write_measure_json(std::ostream& out, const std::vector<MeasuredFunction>& functions,
                        const std::vector<SourceWarning>& warnings, const std::string& source_label,
                        const std::string& convention) {
    nlohmann::json list = nlohmann::json::array();
    double volume = 0, effort = 0;
    std::uint64_t n1_total = 0, n2_total = 0;
    for (const auto& f : functions) {
        list.push_back(function_json(f));
        n1_total += f.measures.N1;
        n2_total += f.measures.N2;
        volume += f.measures.volume;
        effort += f.measures.effort;
    }
    nlohmann::json document = {
        {"schema", "tollgate.measure/1"},
        {"convention", convention},
        {"source", source_label},
        {"functions", list},
        {"total",
         {{"functions", functions.size()},
          {"N1", n1_total},
          {"N2", n2_total},
          {"volume", volume},
          {"effort", effort}}},
        {"warnings", warnings_json(warnings)},
    };
    out << text::dump_json(document, 2) << "\n";
}

void write_explain_text(std::ostream& out, const MeasuredFunction& f,
                        const std::string& source_label, const std::string& convention,
                        double stroud) {
    std::string how;
    if (f.parser_stopped) {
        how = ", measured lexically: the parser stopped on this file";
    }
    for (const auto& word :
         mark_words({f.lexical && !f.parser_stopped, f.inactive, f.brace_extent})) {
        how += word == "inactive"       ? ", inactive #if branch (lexical extent)"
               : word == "brace-extent" ? ", extent from brace matching"
                                        : ", lexical extent";
    }
    out << terminal_text(fmt::format("{}:{}-{}  {}({})  [{}, {}{}]", f.path, f.start_line,
                                     f.end_line, f.name, f.signature, source_label, convention,
                                     how))
        << "\n\n";
    auto write_table = [&](const char* title, const std::map<std::string, core::TableEntry>& table,
                           std::uint64_t distinct, std::uint64_t total) {
        // Tokens are the function's own text (string literals and all): made visible.
        std::vector<std::pair<std::string, core::TableEntry>> rows;
        for (const auto& [key, entry] : table) {
            rows.emplace_back(terminal_text(key), entry);
        }
        // Most frequent first; ties by token so the order is deterministic.
        std::stable_sort(rows.begin(), rows.end(), [](const auto& a, const auto& b) {
            return a.second.count > b.second.count;
        });
        std::size_t width = std::string("token").size();
        for (const auto& row : rows) {
            width = std::max(width, row.first.size());
        }
        out << fmt::format("{} ({} distinct, {} in all)\n", title, distinct, total);
        out << fmt::format("  {:<{}}  {:>5}  {}\n", "token", width, "count", "counted as");
        for (const auto& [key, entry] : rows) {
            std::string form = entry.form;
            if (entry.guessed > 0) {
                form += fmt::format(" ({} of {} decided by the previous token)", entry.guessed,
                                    entry.count);
            }
            std::string line = fmt::format("  {:<{}}  {:>5}  {}", key, width, entry.count, form);
            while (!line.empty() && line.back() == ' ') {
                line.pop_back();
            }
            out << line << "\n";
        }
        out << "\n";
    };
    write_table("operators, n1", f.counts.operators, f.counts.distinct_operators,
                f.counts.total_operators);
    write_table("operands, n2", f.counts.operands, f.counts.distinct_operands,
                f.counts.total_operands);
    const auto& m = f.measures;
    out << "measures\n";
    out << fmt::format("  n1 {}  n2 {}  N1 {}  N2 {}\n", m.n1, m.n2, m.N1, m.N2);
    const auto row = [&out](const char* name, const std::string& formula,
                            const std::string& value) {
        out << fmt::format("  {:<14}{:<30} = {}\n", name, formula, value);
    };
    row("length", "N  = N1 + N2", std::to_string(m.length));
    row("vocabulary", "n  = n1 + n2", std::to_string(m.vocabulary));
    row("est. length", "N^ = n1 log2 n1 + n2 log2 n2", fmt::format("{:.2f}", m.estimated_length));
    row("volume", "V  = N log2 n", fmt::format("{:.2f}", m.volume));
    row("difficulty", "D  = (n1/2) (N2/n2)", fmt::format("{:.2f}", m.difficulty));
    row("level", "L^ = 1/D", fmt::format("{:.4f}", m.level));
    row("effort", "E  = D V", fmt::format("{:.1f}", m.effort));
    row("time", fmt::format("T  = E / S, S = {:g}", stroud), fmt::format("{:.1f} s", m.time));
    row("bugs", "B  = V / 3000", fmt::format("{:.4f}", m.bugs_volume));
    row("bugs (effort)", "B  = E^(2/3) / 3000", fmt::format("{:.4f}", m.bugs_effort));
    row("potential vol", "V* = (2+n2*) log2 (2+n2*)",
        fmt::format("{:.2f}  (n2* = {})", m.potential_volume, m.potential_operands));
    row("volume ratio", "V*/V", fmt::format("{:.4f}", m.volume_ratio));
}

void write_explain_json(std::ostream& out, const MeasuredFunction& f,
                        const std::string& source_label, const std::string& convention) {
    auto table_json = [](const std::map<std::string, core::TableEntry>& table) {
        nlohmann::json list = nlohmann::json::array();
        for (const auto& [key, entry] : table) {
            list.push_back({{"token", key},
                            {"count", entry.count},
                            {"form", entry.form},
                            {"decided_by_previous_token", entry.guessed}});
        }
        return list;
    };
    nlohmann::json document = function_json(f);
    document["schema"] = "tollgate.explain/1";
    document["convention"] = convention;
    document["source"] = source_label;
    document["operators"] = table_json(f.counts.operators);
    document["operands"] = table_json(f.counts.operands);
    out << text::dump_json(document, 2) << "\n";
}

} // namespace tollgate::report
