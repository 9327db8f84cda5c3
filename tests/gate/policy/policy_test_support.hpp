// SPDX-License-Identifier: MIT
// Test support for the policy engine: touched functions built by hand from Halstead counts.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "tollgate/core/counts.hpp"
#include "tollgate/core/measures.hpp"

#include <optional>
#include <string>

namespace tollgate::test {

// Return the measures of counts n1, n2, N1, N2 (computed by the metrics core).
inline core::Measures measures_of(std::uint64_t n1, std::uint64_t n2, std::uint64_t N1,
                                  std::uint64_t N2) {
    return core::compute_measures(core::counts_from_totals(n1, n2, N1, N2));
}

// Counts chosen so that Halstead's formulas give round numbers (Halstead 1977: V = N log2 n,
// D = (n1/2)(N2/n2), E = D V), with n1 = n2 = 8 so that log2 n = 4:
//   small:  N1 = 20, N2 = 12 -> N = 32, V = 128, D = 6,  E = 768
//   large:  N1 = 40, N2 = 24 -> N = 64, V = 256, D = 12, E = 3072
//   medium: N1 = 24, N2 = 14 -> N = 38, V = 152, D = 7,  E = 1064
inline core::Measures small_measures() {
    return measures_of(8, 8, 20, 12);
}
inline core::Measures large_measures() {
    return measures_of(8, 8, 40, 24);
}
inline core::Measures medium_measures() {
    return measures_of(8, 8, 24, 14);
}

// Return one side of a function at `path`, lines `start`-`end`, with `measures`.
inline delta::FunctionSide side_at(const std::string& path, unsigned start, unsigned end,
                                   const core::Measures& measures) {
    delta::FunctionSide side;
    side.path = path;
    side.start_line = start;
    side.end_line = end;
    side.measures = measures;
    return side;
}

// Return a touched function named `name(signature)` with `label` and the given sides.
inline delta::FunctionDelta touched(const std::string& name, const std::string& signature,
                                    delta::DeltaLabel label,
                                    std::optional<delta::FunctionSide> base,
                                    std::optional<delta::FunctionSide> head) {
    delta::FunctionDelta f;
    f.name = name;
    f.signature = signature;
    f.identity = "c:@" + name + "(" + signature + ")";
    f.label = label;
    f.base = std::move(base);
    f.head = std::move(head);
    return f;
}

// Return a changed function at `path`:`line` going from `base` to `head` measures.
inline delta::FunctionDelta changed(const std::string& name, const std::string& path, unsigned line,
                                    const core::Measures& base, const core::Measures& head) {
    return touched(name, "", delta::DeltaLabel::changed, side_at(path, line, line + 9, base),
                   side_at(path, line, line + 19, head));
}

// Return an added function at `path`:`line` with `head` measures.
inline delta::FunctionDelta added(const std::string& name, const std::string& path, unsigned line,
                                  const core::Measures& head) {
    return touched(name, "", delta::DeltaLabel::added, std::nullopt,
                   side_at(path, line, line + 9, head));
}

// Return a removed function at `path`:`line` with `base` measures.
inline delta::FunctionDelta removed(const std::string& name, const std::string& path, unsigned line,
                                    const core::Measures& base) {
    return touched(name, "", delta::DeltaLabel::removed, side_at(path, line, line + 9, base),
                   std::nullopt);
}

// Return a report holding `functions`.
inline delta::ChangeReport report_of(std::vector<delta::FunctionDelta> functions) {
    delta::ChangeReport report;
    report.base_commit = "1111111111111111111111111111111111111111";
    report.head_commit = "2222222222222222222222222222222222222222";
    report.functions = std::move(functions);
    return report;
}

} // namespace tollgate::test
