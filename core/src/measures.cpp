// SPDX-License-Identifier: MIT
// Halstead's measures from counts, with defined values for degenerate counts.
#include "tollgate/core/measures.hpp"

#include <cmath>

namespace tollgate::core {

namespace {

// x log2 x, taken as 0 for x = 0 (its limit), so N^ is defined for n1 = 0 or n2 = 0.
double x_log2_x(double x) {
    return x > 0 ? x * std::log2(x) : 0.0;
}

struct MeasureName {
    MeasureId id;
    std::string_view name;
};

constexpr MeasureName k_measure_names[] = {
    {MeasureId::n1, "n1"},
    {MeasureId::n2, "n2"},
    {MeasureId::N1, "N1"},
    {MeasureId::N2, "N2"},
    {MeasureId::length, "length"},
    {MeasureId::vocabulary, "vocabulary"},
    {MeasureId::estimated_length, "estimated-length"},
    {MeasureId::volume, "volume"},
    {MeasureId::difficulty, "difficulty"},
    {MeasureId::level, "level"},
    {MeasureId::effort, "effort"},
    {MeasureId::time, "time"},
    {MeasureId::bugs_volume, "bugs"},
    {MeasureId::bugs_effort, "bugs-effort"},
    {MeasureId::potential_volume, "potential-volume"},
    {MeasureId::volume_ratio, "volume-ratio"},
};

} // namespace

bool Measures::operator==(const Measures& o) const {
    return n1 == o.n1 && n2 == o.n2 && N1 == o.N1 && N2 == o.N2 && length == o.length &&
           vocabulary == o.vocabulary && estimated_length == o.estimated_length &&
           volume == o.volume && difficulty == o.difficulty && level == o.level &&
           effort == o.effort && time == o.time && bugs_volume == o.bugs_volume &&
           bugs_effort == o.bugs_effort && potential_operands == o.potential_operands &&
           potential_volume == o.potential_volume && volume_ratio == o.volume_ratio;
}

Measures compute_measures(const Counts& counts, std::uint64_t potential_operands,
                          const MeasureSettings& settings) {
    Measures m;
    m.n1 = counts.distinct_operators;
    m.n2 = counts.distinct_operands;
    m.N1 = counts.total_operators;
    m.N2 = counts.total_operands;
    m.length = m.N1 + m.N2;
    m.vocabulary = m.n1 + m.n2;
    const auto n1 = static_cast<double>(m.n1);
    const auto n2 = static_cast<double>(m.n2);
    const auto N2 = static_cast<double>(m.N2);
    m.estimated_length = x_log2_x(n1) + x_log2_x(n2);
    // log2(1) is 0, so a one-word vocabulary has no volume; an empty one is given 0 too.
    m.volume = m.vocabulary > 1
                   ? static_cast<double>(m.length) * std::log2(static_cast<double>(m.vocabulary))
                   : 0.0;
    // With no operands there is nothing to be difficult about: D = 0 rather than 0/0.
    m.difficulty = m.n2 > 0 ? (n1 / 2.0) * (N2 / n2) : 0.0;
    m.level = m.difficulty > 0 ? 1.0 / m.difficulty : 0.0;
    m.effort = m.difficulty * m.volume;
    const double stroud = settings.stroud > 0 ? settings.stroud : 18.0;
    m.time = m.effort / stroud;
    m.bugs_volume = m.volume / 3000.0;
    m.bugs_effort = std::cbrt(m.effort * m.effort) / 3000.0;
    m.potential_operands = potential_operands;
    const double p = 2.0 + static_cast<double>(potential_operands);
    m.potential_volume = p * std::log2(p);
    m.volume_ratio = m.volume > 0 ? m.potential_volume / m.volume : 0.0;
    return m;
}

double measure_value(const Measures& m, MeasureId id) {
    switch (id) {
    case MeasureId::n1:
        return static_cast<double>(m.n1);
    case MeasureId::n2:
        return static_cast<double>(m.n2);
    case MeasureId::N1:
        return static_cast<double>(m.N1);
    case MeasureId::N2:
        return static_cast<double>(m.N2);
    case MeasureId::length:
        return static_cast<double>(m.length);
    case MeasureId::vocabulary:
        return static_cast<double>(m.vocabulary);
    case MeasureId::estimated_length:
        return m.estimated_length;
    case MeasureId::volume:
        return m.volume;
    case MeasureId::difficulty:
        return m.difficulty;
    case MeasureId::level:
        return m.level;
    case MeasureId::effort:
        return m.effort;
    case MeasureId::time:
        return m.time;
    case MeasureId::bugs_volume:
        return m.bugs_volume;
    case MeasureId::bugs_effort:
        return m.bugs_effort;
    case MeasureId::potential_volume:
        return m.potential_volume;
    case MeasureId::volume_ratio:
        return m.volume_ratio;
    }
    return 0.0;
}

std::string_view measure_name(MeasureId id) {
    for (const auto& entry : k_measure_names) {
        if (entry.id == id) {
            return entry.name;
        }
    }
    return "unknown";
}

std::optional<MeasureId> parse_measure_name(std::string_view name) {
    for (const auto& entry : k_measure_names) {
        if (entry.name == name) {
            return entry.id;
        }
    }
    return std::nullopt;
}

Delta compute_delta(double base, double head) {
    Delta delta;
    delta.base = base;
    delta.head = head;
    delta.absolute = head - base;
    if (base != 0.0) {
        delta.percent = 100.0 * (head - base) / base;
    }
    return delta;
}

Delta compute_delta(const Measures& base, const Measures& head, MeasureId id) {
    return compute_delta(measure_value(base, id), measure_value(head, id));
}

} // namespace tollgate::core
