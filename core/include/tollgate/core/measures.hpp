// SPDX-License-Identifier: MIT
// Halstead's software-science measures computed from counts; pure arithmetic.
#pragma once

#include "tollgate/core/counts.hpp"

#include <array>
#include <optional>
#include <string>
#include <string_view>

namespace tollgate::core {

// Settings of the arithmetic that are not part of the counting convention.
struct MeasureSettings {
    double stroud = 18.0; // Stroud number S, moments per second, used by T = E / S
};

// Every measure of one function. Degenerate counts give the documented finite values below.
struct Measures {
    std::uint64_t n1 = 0, n2 = 0, N1 = 0, N2 = 0; // base counts
    std::uint64_t length = 0;                     // N = N1 + N2
    std::uint64_t vocabulary = 0;                 // n = n1 + n2
    double estimated_length = 0;          // N^ = n1 log2 n1 + n2 log2 n2 (0 log2 0 taken as 0)
    double volume = 0;                    // V = N log2 n (0 when n <= 1)
    double difficulty = 0;                // D = (n1 / 2) (N2 / n2) (0 when n2 = 0)
    double level = 0;                     // L^ = 2 n2 / (n1 N2) = 1 / D (0 when D = 0)
    double effort = 0;                    // E = D V
    double time = 0;                      // T = E / S seconds
    double bugs_volume = 0;               // B = V / 3000
    double bugs_effort = 0;               // B = E^(2/3) / 3000
    std::uint64_t potential_operands = 0; // n2*: parameters plus one for a non-void result
    double potential_volume = 0;          // V* = (2 + n2*) log2 (2 + n2*)
    double volume_ratio = 0;              // V* / V (0 when V = 0)

    bool operator==(const Measures& other) const;
};

// Compute every measure from `counts`; `potential_operands` is n2* for V*.
Measures compute_measures(const Counts& counts, std::uint64_t potential_operands = 0,
                          const MeasureSettings& settings = {});

// The measures a policy or a report can name.
enum class MeasureId {
    n1,
    n2,
    N1,
    N2,
    length,
    vocabulary,
    estimated_length,
    volume,
    difficulty,
    level,
    effort,
    time,
    bugs_volume,
    bugs_effort,
    potential_volume,
    volume_ratio,
};

inline constexpr std::array<MeasureId, 16> k_all_measures = {
    MeasureId::n1,
    MeasureId::n2,
    MeasureId::N1,
    MeasureId::N2,
    MeasureId::length,
    MeasureId::vocabulary,
    MeasureId::estimated_length,
    MeasureId::volume,
    MeasureId::difficulty,
    MeasureId::level,
    MeasureId::effort,
    MeasureId::time,
    MeasureId::bugs_volume,
    MeasureId::bugs_effort,
    MeasureId::potential_volume,
    MeasureId::volume_ratio,
};

// Return the value of `id` in `m`.
double measure_value(const Measures& m, MeasureId id);

// Return the stable name of `id` as used in policies and JSON ("effort", "bugs-volume", ...).
std::string_view measure_name(MeasureId id);

// Return the measure named `name`, or nothing when no measure has that name.
std::optional<MeasureId> parse_measure_name(std::string_view name);

// The change of one measure between base and head.
struct Delta {
    double base = 0;               // value on the base side
    double head = 0;               // value on the head side
    double absolute = 0;           // head - base
    std::optional<double> percent; // 100 (head - base) / base; empty when base is 0

    bool operator==(const Delta& other) const {
        return base == other.base && head == other.head && absolute == other.absolute &&
               percent == other.percent;
    }
};

// Return the change from `base` to `head`; percent is empty when `base` is zero.
Delta compute_delta(double base, double head);

// Return the change of measure `id` from `base` to `head`.
Delta compute_delta(const Measures& base, const Measures& head, MeasureId id);

} // namespace tollgate::core
