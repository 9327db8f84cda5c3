// SPDX-License-Identifier: MIT
// Deltas, ordering and totals of the change report.
#include "gate/delta/function_delta.hpp"

#include <algorithm>
#include <map>
#include <tuple>

namespace tollgate::delta {

const char* label_name(DeltaLabel label) {
    switch (label) {
    case DeltaLabel::added:
        return "added";
    case DeltaLabel::changed:
        return "changed";
    case DeltaLabel::removed:
        return "removed";
    case DeltaLabel::moved:
        return "moved";
    case DeltaLabel::unchanged:
        return "unchanged";
    }
    return "changed";
}

core::Delta FunctionDelta::delta(core::MeasureId id) const {
    const double base_value = base ? core::measure_value(base->measures, id) : 0.0;
    const double head_value = head ? core::measure_value(head->measures, id) : 0.0;
    return core::compute_delta(base_value, head_value);
}

void sort_deltas(std::vector<FunctionDelta>& functions) {
    std::sort(functions.begin(), functions.end(),
              [](const FunctionDelta& a, const FunctionDelta& b) {
                  const double ga = a.delta(core::MeasureId::effort).absolute;
                  const double gb = b.delta(core::MeasureId::effort).absolute;
                  if (ga != gb) {
                      return ga > gb;
                  }
                  const auto& sa = a.shown_side();
                  const auto& sb = b.shown_side();
                  return std::tie(sa.path, sa.start_line, a.name, a.signature, a.identity) <
                         std::tie(sb.path, sb.start_line, b.name, b.signature, b.identity);
              });
}

namespace {

void add_to(Totals& totals, const FunctionDelta& f) {
    ++totals.functions;
    switch (f.label) {
    case DeltaLabel::added:
        ++totals.added;
        break;
    case DeltaLabel::removed:
        ++totals.removed;
        break;
    case DeltaLabel::changed:
        ++totals.changed;
        break;
    case DeltaLabel::moved:
        if (f.base->token_hash != f.head->token_hash) {
            ++totals.changed;
        }
        break;
    case DeltaLabel::unchanged:
        break;
    }
    if (f.base) {
        totals.base_volume += f.base->measures.volume;
        totals.base_effort += f.base->measures.effort;
        totals.base_difficulty_max =
            std::max(totals.base_difficulty_max, f.base->measures.difficulty);
    }
    if (f.head) {
        totals.head_volume += f.head->measures.volume;
        totals.head_effort += f.head->measures.effort;
        totals.head_difficulty_max =
            std::max(totals.head_difficulty_max, f.head->measures.difficulty);
    }
}

} // namespace

void compute_totals(ChangeReport& report) {
    report.totals = Totals{};
    std::map<std::string, Totals> per_file;
    for (const auto& f : report.functions) {
        add_to(report.totals, f);
        add_to(per_file[f.shown_side().path], f);
    }
    report.files.clear();
    for (auto& [path, totals] : per_file) {
        report.files.push_back({path, totals});
    }
}

} // namespace tollgate::delta
