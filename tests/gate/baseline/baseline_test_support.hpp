// SPDX-License-Identifier: MIT
// Helpers shared by the baseline tests: hand-made snapshots, Halstead arithmetic, child processes.
#pragma once

#include "gate/baseline/snapshot.hpp"

#include <cmath>
#include <cstdint>
#include <string>

namespace tollgate::test {

// Return a function of `path` with the four counts and measures computed by the metrics core.
inline baseline::SnapshotFunction snapshot_function(const std::string& path, unsigned line,
                                                    const std::string& usr, const std::string& name,
                                                    const std::string& signature, int ordinal,
                                                    std::uint64_t n1, std::uint64_t n2,
                                                    std::uint64_t N1, std::uint64_t N2) {
    baseline::SnapshotFunction f;
    f.path = path;
    f.start_line = line;
    f.end_line = line + 2;
    f.usr = usr;
    f.qualified_name = name;
    f.signature = signature;
    f.fallback_key = name + "(" + signature + ")#" + std::to_string(ordinal);
    f.token_hash = "00000000000000" + std::to_string(10 + ordinal);
    f.measures = core::compute_measures(core::counts_from_totals(n1, n2, N1, N2), 1);
    return f;
}

// Return Halstead's effort E = (n1 / 2)(N2 / n2) (N1 + N2) log2(n1 + n2), computed here
// independently of the metrics core (Halstead, "Elements of Software Science", 1977, ch. 2-4).
inline double halstead_effort(double n1, double n2, double N1, double N2) {
    return (n1 / 2.0) * (N2 / n2) * (N1 + N2) * std::log2(n1 + n2);
}

// Return Halstead's volume V = (N1 + N2) log2(n1 + n2) (same source).
inline double halstead_volume(double n1, double n2, double N1, double N2) {
    return (N1 + N2) * std::log2(n1 + n2);
}

} // namespace tollgate::test
