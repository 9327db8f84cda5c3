// SPDX-License-Identifier: MIT
// Comparing two snapshots: pairing functions, growth by effort, totals per top folder.
#include "gate/baseline/snapshot_trend.hpp"

#include "gate/common/text_safety.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <map>
#include <nlohmann/json.hpp>
#include <tuple>

namespace tollgate::baseline {

namespace {

using Json = nlohmann::ordered_json;

constexpr std::size_t k_unmatched = static_cast<std::size_t>(-1);

// Pair base and head functions of the same file, one to one, with the key `key_of` when the key
// is unique on both sides among the functions not yet paired. Empty keys never pair.
template <typename KeyOf>
void pair_by(const Snapshot& base, const Snapshot& head, std::vector<std::size_t>& head_of_base,
             std::vector<std::size_t>& base_of_head, KeyOf key_of) {
    using Key = std::pair<std::string, std::string>; // path, key
    std::map<Key, std::vector<std::size_t>> base_keys, head_keys;
    for (std::size_t i = 0; i < base.functions.size(); ++i) {
        if (head_of_base[i] == k_unmatched) {
            const std::string key = key_of(base.functions[i]);
            if (!key.empty()) {
                base_keys[{base.functions[i].path, key}].push_back(i);
            }
        }
    }
    for (std::size_t j = 0; j < head.functions.size(); ++j) {
        if (base_of_head[j] == k_unmatched) {
            const std::string key = key_of(head.functions[j]);
            if (!key.empty()) {
                head_keys[{head.functions[j].path, key}].push_back(j);
            }
        }
    }
    for (const auto& [key, base_indexes] : base_keys) {
        const auto it = head_keys.find(key);
        if (base_indexes.size() == 1 && it != head_keys.end() && it->second.size() == 1) {
            head_of_base[base_indexes.front()] = it->second.front();
            base_of_head[it->second.front()] = base_indexes.front();
        }
    }
}

std::string top_folder(const std::string& path) {
    const std::size_t slash = path.find('/');
    return slash == std::string::npos ? std::string(".") : path.substr(0, slash);
}

// Group the digits of a whole number by thousands: 18400 -> "18,400".
std::string group_thousands(const std::string& digits) {
    std::string grouped;
    const std::size_t start = !digits.empty() && digits[0] == '-' ? 1 : 0;
    for (std::size_t i = 0; i < digits.size(); ++i) {
        if (i > start && (digits.size() - i) % 3 == 0) {
            grouped += ',';
        }
        grouped += digits[i];
    }
    return grouped;
}

// `value` with `decimals` places and thousands grouped; `signed_form` adds "+" to positives.
std::string amount(double value, int decimals, bool signed_form = false) {
    const double rounded = std::round(value * std::pow(10.0, decimals)) / std::pow(10.0, decimals);
    std::string text = fmt::format("{:.{}f}", std::fabs(rounded), decimals);
    const std::size_t point = text.find('.');
    const std::string whole = group_thousands(text.substr(0, point));
    const std::string fraction = point == std::string::npos ? "" : text.substr(point);
    const bool negative = rounded < 0;
    const std::string sign = negative ? "-" : (signed_form && rounded > 0 ? "+" : "");
    return sign + whole + fraction;
}

std::string percent_text(const core::Delta& delta) {
    if (!delta.percent) {
        return "new";
    }
    return amount(*delta.percent, 1, true) + "%";
}

// Render rows as columns: the first `left` columns left-aligned, the rest right-aligned.
void write_table(std::ostream& out, const std::vector<std::vector<std::string>>& rows,
                 std::size_t left) {
    std::vector<std::size_t> widths;
    for (const auto& row : rows) {
        widths.resize(std::max(widths.size(), row.size()), 0);
        for (std::size_t c = 0; c < row.size(); ++c) {
            widths[c] = std::max(widths[c], row[c].size());
        }
    }
    for (const auto& row : rows) {
        std::string line;
        for (std::size_t c = 0; c < row.size(); ++c) {
            line += "  ";
            line += c < left ? fmt::format("{:<{}}", row[c], widths[c])
                             : fmt::format("{:>{}}", row[c], widths[c]);
        }
        while (!line.empty() && line.back() == ' ') {
            line.pop_back();
        }
        out << line << "\n";
    }
}

Json delta_json(const core::Delta& delta, bool with_percent) {
    Json object = {{"base", delta.base}, {"head", delta.head}, {"change", delta.absolute}};
    if (with_percent) {
        object["percent"] = delta.percent ? Json(*delta.percent) : Json(nullptr);
    }
    return object;
}

Json folder_json(const FolderTotals& f) {
    return {{"folder", f.folder},
            {"functions", {{"base", f.base_functions}, {"head", f.head_functions}}},
            {"volume", delta_json(f.volume, true)},
            {"effort", delta_json(f.effort, true)}};
}

} // namespace

SnapshotTrend compare_snapshots(const Snapshot& base, const Snapshot& head) {
    SnapshotTrend trend;
    trend.convention = head.convention;
    trend.base_commit = base.commit;
    trend.head_commit = head.commit;
    trend.base_created = base.created;
    trend.head_created = head.created;

    std::vector<std::size_t> head_of_base(base.functions.size(), k_unmatched);
    std::vector<std::size_t> base_of_head(head.functions.size(), k_unmatched);
    pair_by(base, head, head_of_base, base_of_head,
            [](const SnapshotFunction& f) { return f.usr; });
    pair_by(base, head, head_of_base, base_of_head,
            [](const SnapshotFunction& f) { return f.fallback_key; });
    pair_by(base, head, head_of_base, base_of_head,
            [](const SnapshotFunction& f) { return name_and_signature(f.fallback_key); });

    std::map<std::string, FolderTotals> folders;
    for (std::size_t i = 0; i < base.functions.size(); ++i) {
        const SnapshotFunction& f = base.functions[i];
        FolderTotals& totals = folders[top_folder(f.path)];
        totals.base_functions += 1;
        totals.volume.base += f.measures.volume;
        totals.effort.base += f.measures.effort;
        if (head_of_base[i] == k_unmatched) {
            ++trend.removed;
        }
    }
    for (std::size_t j = 0; j < head.functions.size(); ++j) {
        const SnapshotFunction& f = head.functions[j];
        FolderTotals& totals = folders[top_folder(f.path)];
        totals.head_functions += 1;
        totals.volume.head += f.measures.volume;
        totals.effort.head += f.measures.effort;
        if (base_of_head[j] == k_unmatched) {
            ++trend.added;
            continue;
        }
        ++trend.matched;
        const SnapshotFunction& before = base.functions[base_of_head[j]];
        const core::Delta effort = core::compute_delta(before.measures.effort, f.measures.effort);
        if (effort.absolute > 0) {
            ++trend.grew;
            trend.growth.push_back({f.path, f.start_line, f.qualified_name, f.signature, effort});
        } else if (effort.absolute < 0) {
            ++trend.shrank;
        } else {
            ++trend.unchanged;
        }
    }
    std::sort(trend.growth.begin(), trend.growth.end(),
              [](const FunctionGrowth& a, const FunctionGrowth& b) {
                  if (a.effort.absolute != b.effort.absolute) {
                      return a.effort.absolute > b.effort.absolute;
                  }
                  return std::tie(a.path, a.head_line, a.qualified_name, a.signature) <
                         std::tie(b.path, b.head_line, b.qualified_name, b.signature);
              });

    trend.total.folder = "total";
    for (auto& [name, totals] : folders) {
        totals.folder = name;
        totals.volume = core::compute_delta(totals.volume.base, totals.volume.head);
        totals.effort = core::compute_delta(totals.effort.base, totals.effort.head);
        trend.total.base_functions += totals.base_functions;
        trend.total.head_functions += totals.head_functions;
        trend.total.volume.base += totals.volume.base;
        trend.total.volume.head += totals.volume.head;
        trend.total.effort.base += totals.effort.base;
        trend.total.effort.head += totals.effort.head;
        trend.folders.push_back(totals);
    }
    trend.total.volume = core::compute_delta(trend.total.volume.base, trend.total.volume.head);
    trend.total.effort = core::compute_delta(trend.total.effort.base, trend.total.effort.head);
    return trend;
}

void write_trend_text(std::ostream& out, const SnapshotTrend& trend, std::size_t top) {
    // Snapshot files are read as they are: every text from them is made visible.
    using text::terminal_text;
    out << terminal_text(fmt::format("snapshot trend under convention \"{}\"", trend.convention))
        << "\n";
    out << terminal_text(fmt::format("  base {} ({}), {} functions", trend.base_commit.substr(0, 7),
                                     trend.base_created, trend.total.base_functions))
        << "\n";
    out << terminal_text(fmt::format("  head {} ({}), {} functions", trend.head_commit.substr(0, 7),
                                     trend.head_created, trend.total.head_functions))
        << "\n";
    out << fmt::format("  {} in both ({} grew, {} shrank, {} unchanged in effort), {} added, "
                       "{} removed\n",
                       trend.matched, trend.grew, trend.shrank, trend.unchanged, trend.added,
                       trend.removed);

    out << "\n";
    if (trend.growth.empty()) {
        out << "no function grew in effort\n";
    } else {
        const std::size_t shown = std::min(top, trend.growth.size());
        out << fmt::format("functions that grew most in effort ({} of {}):\n", shown,
                           trend.growth.size());
        std::vector<std::vector<std::string>> rows = {
            {"function", "location", "effort base", "effort head", "change", "%"}};
        for (std::size_t i = 0; i < shown; ++i) {
            const FunctionGrowth& g = trend.growth[i];
            rows.push_back({terminal_text(g.qualified_name + "(" + g.signature + ")"),
                            terminal_text(fmt::format("{}:{}", g.path, g.head_line)),
                            amount(g.effort.base, 0), amount(g.effort.head, 0),
                            amount(g.effort.absolute, 0, true), percent_text(g.effort)});
        }
        write_table(out, rows, 2);
    }

    out << "\ntotals per top folder:\n";
    std::vector<std::vector<std::string>> rows = {{"folder", "functions", "volume base",
                                                   "volume head", "change", "effort base",
                                                   "effort head", "change", "%"}};
    auto add_row = [&rows](const FolderTotals& f) {
        rows.push_back(
            {terminal_text(f.folder), fmt::format("{} -> {}", f.base_functions, f.head_functions),
             amount(f.volume.base, 1), amount(f.volume.head, 1), amount(f.volume.absolute, 1, true),
             amount(f.effort.base, 0), amount(f.effort.head, 0), amount(f.effort.absolute, 0, true),
             percent_text(f.effort)});
    };
    for (const auto& f : trend.folders) {
        add_row(f);
    }
    add_row(trend.total);
    write_table(out, rows, 1);
}

void write_trend_json(std::ostream& out, const SnapshotTrend& trend, std::size_t top) {
    Json growth = Json::array();
    for (std::size_t i = 0; i < std::min(top, trend.growth.size()); ++i) {
        const FunctionGrowth& g = trend.growth[i];
        growth.push_back({{"file", g.path},
                          {"line", g.head_line},
                          {"function", g.qualified_name},
                          {"signature", g.signature},
                          {"effort", delta_json(g.effort, true)}});
    }
    Json folders = Json::array();
    for (const auto& f : trend.folders) {
        folders.push_back(folder_json(f));
    }
    Json document = {
        {"schema", "tollgate.snapshot-trend/1"},
        {"convention", trend.convention},
        {"base", {{"commit", trend.base_commit}, {"created", trend.base_created}}},
        {"head", {{"commit", trend.head_commit}, {"created", trend.head_created}}},
        {"functions",
         {{"in_both", trend.matched},
          {"added", trend.added},
          {"removed", trend.removed},
          {"grew", trend.grew},
          {"shrank", trend.shrank},
          {"unchanged", trend.unchanged}}},
        {"grew_most", std::move(growth)},
        {"folders", std::move(folders)},
        {"total", folder_json(trend.total)},
    };
    out << text::dump_json(document, 2) << "\n";
}

} // namespace tollgate::baseline
