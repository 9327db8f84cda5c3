// SPDX-License-Identifier: MIT
// Strict reading of every numeric command-line value: whole numbers, real numbers and sizes, each
// with its range, refused with one sentence that says what was given and what is accepted.
#pragma once

#include <CLI/CLI.hpp>
#include <cstdint>
#include <string>

namespace tollgate {

// The most worker threads any --jobs accepts (common practice, no source: more threads than
// this only multiply memory; 0 still means every core).
inline constexpr std::uint64_t k_max_jobs = 1024;

// Return why `text` is not a whole number from `min` to `max` written in decimal digits, e.g.
// `"1.5" is not a whole number (give one from 0 to 1024)` or `"-1" is out of range (give a whole
// number from 0 to 1024)`; empty when it is one.
std::string whole_number_problem(const std::string& text, std::uint64_t min, std::uint64_t max);

// Return why `text` is not a finite decimal number from `min` to `max`, e.g. `"nan" is not a
// finite number (give one from 1 to 100)`; empty when it is one. Hexadecimal, "inf", "nan" and
// surrounding blanks are refused.
std::string real_number_problem(const std::string& text, double min, double max);

// Return why `text` is not a size (see parse_byte_size) of at most `max` bytes, e.g. `"8Q" is
// not a size (give bytes, or a number followed by K, M or G, e.g. "16M")`; empty when it is one.
std::string byte_size_problem(const std::string& text, std::uint64_t max);

// Return a CLI11 check refusing what whole_number_problem refuses (CLI11 puts the option's name
// and a colon in front of the sentence).
CLI::Validator whole_number(std::uint64_t min, std::uint64_t max);

// Return a CLI11 check refusing what real_number_problem refuses.
CLI::Validator real_number(double min, double max);

// Return a CLI11 transform refusing what byte_size_problem refuses and rewriting an accepted
// size as its number of bytes, for an option bound to an unsigned integer.
CLI::Validator byte_size(std::uint64_t max);

} // namespace tollgate
