// SPDX-License-Identifier: MIT
// The Java front end's fuzz harness, shared by the libFuzzer target and the unit test that
// replays kept inputs: measure any bytes as a .java file (syntax tree and lexical cross-check) and
// measure them on the lexical path alone, and check the promises both paths make.
#pragma once

#include "gate/java/java_front_end.hpp"
#include "gate/java/java_lexical.hpp"
#include "gate/java/java_scan.hpp"
#include "tollgate/core/counts.hpp"
#include "tollgate/core/measures.hpp"

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>

namespace tollgate::fuzz {

// Return an empty string when `functions` keep the front end's promises, else what broke.
inline std::string check_java_functions(const lexer::FileFunctions& file, std::size_t lines) {
    unsigned previous_start = 0;
    for (const auto& f : file.functions) {
        if (f.start_line == 0 || f.start_line > f.end_line || f.end_line > lines) {
            return "a function's lines are out of order or outside the file";
        }
        if (f.start_line < previous_start) {
            return "functions are not ordered by start line";
        }
        previous_start = f.start_line;
        const core::Measures m =
            core::compute_measures(core::count_tokens(f.tokens), f.potential_operands);
        if (!std::isfinite(m.volume) || !std::isfinite(m.effort) || !std::isfinite(m.difficulty)) {
            return "a measure is not finite";
        }
        if (f.fallback_key.empty() || f.token_hash.empty()) {
            return "a function has no fallback key or token hash";
        }
    }
    return {};
}

// Measure `bytes` both ways and return what broke, or an empty string. The first byte picks the
// convention switches.
inline std::string check_java_input(const std::uint8_t* data, std::size_t size) {
    core::Convention convention;
    if (size > 0) {
        convention.body_only = (data[0] & 1) != 0;
        convention.function_name_as_operand = (data[0] & 2) != 0;
        convention.merge_unary_binary = (data[0] & 4) != 0;
    }
    const std::string content(reinterpret_cast<const char*>(data), size);
    std::size_t lines = 1;
    for (char c : content) {
        lines += c == '\n' ? 1 : 0;
    }
    const lexer::FileFunctions file = java::lex_java_file({"Fuzz.java", content}, convention);
    if (std::string broken = check_java_functions(file, lines); !broken.empty()) {
        return "front end: " + broken;
    }
    lexer::FileFunctions lexical;
    java::finish_functions(java::measure_lexically(java::scan_java(content), convention),
                           "Fuzz.java", lexical);
    if (std::string broken = check_java_functions(lexical, lines); !broken.empty()) {
        return "lexical path: " + broken;
    }
    return {};
}

} // namespace tollgate::fuzz
