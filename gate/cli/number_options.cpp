// SPDX-License-Identifier: MIT
// Strict numeric command-line values.
#include "gate/cli/number_options.hpp"

#include "gate/common/byte_size.hpp"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdlib>
#include <fmt/format.h>
#include <regex>

namespace tollgate {

namespace {

std::string quoted(const std::string& text) {
    return "\"" + text + "\"";
}

// Show a bound as a person writes it: 1, 0.5, 100.
std::string bound_text(double value) {
    return fmt::format("{}", value);
}

std::string lowercase(std::string text) {
    std::transform(text.begin(), text.end(), text.begin(),
                   [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
    return text;
}

} // namespace

std::string whole_number_problem(const std::string& text, std::uint64_t min, std::uint64_t max) {
    const std::string range = fmt::format("from {} to {}", min, max);
    const bool negative = text.size() > 1 && text[0] == '-';
    const std::string digits = negative ? text.substr(1) : text;
    if (digits.empty() || digits.find_first_not_of("0123456789") != std::string::npos) {
        return quoted(text) + " is not a whole number (give one " + range + ")";
    }
    std::uint64_t value = 0;
    bool overflow = false;
    for (const char c : digits) {
        const auto digit = static_cast<std::uint64_t>(c - '0');
        if (value > (UINT64_MAX - digit) / 10) {
            overflow = true;
            break;
        }
        value = value * 10 + digit;
    }
    if (negative || overflow || value < min || value > max) {
        return quoted(text) + " is out of range (give a whole number " + range + ")";
    }
    return {};
}

std::string real_number_problem(const std::string& text, double min, double max) {
    const std::string range = "from " + bound_text(min) + " to " + bound_text(max);
    static const std::regex k_not_finite(R"([+-]?(nan(\(.*\))?|inf|infinity))");
    if (std::regex_match(lowercase(text), k_not_finite)) {
        return quoted(text) + " is not a finite number (give one " + range + ")";
    }
    static const std::regex k_decimal(R"([+-]?([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?)");
    if (!std::regex_match(text, k_decimal)) {
        return quoted(text) + " is not a number (give one " + range + ")";
    }
    errno = 0;
    const double value = std::strtod(text.c_str(), nullptr);
    // A value past the range of double (1e400) is out of any range; one below its precision
    // (1e-400) reads as 0 and is judged as that.
    if ((errno == ERANGE && std::fabs(value) > 1.0) || !std::isfinite(value) || value < min ||
        value > max) {
        return quoted(text) + " is out of range (give a number " + range + ")";
    }
    return {};
}

std::string byte_size_problem(const std::string& text, std::uint64_t max) {
    const auto size = parse_byte_size(text);
    if (!size) {
        const bool digits_then_suffix = !text.empty() && text[0] >= '0' && text[0] <= '9' &&
                                        text.find_first_not_of("0123456789") >= text.size() - 1;
        if (digits_then_suffix && text.find_first_not_of("0123456789KkMmGg") == std::string::npos) {
            return quoted(text) + " is out of range (give a size up to " + format_byte_size(max) +
                   ")";
        }
        return quoted(text) +
               " is not a size (give bytes, or a number followed by K, M or G, e.g. \"16M\")";
    }
    if (*size > max) {
        return quoted(text) + " is out of range (give a size up to " + format_byte_size(max) + ")";
    }
    return {};
}

CLI::Validator whole_number(std::uint64_t min, std::uint64_t max) {
    return CLI::Validator(
        [min, max](std::string& text) { return whole_number_problem(text, min, max); },
        fmt::format("{} to {}", min, max));
}

CLI::Validator real_number(double min, double max) {
    return CLI::Validator(
        [min, max](std::string& text) { return real_number_problem(text, min, max); },
        bound_text(min) + " to " + bound_text(max));
}

CLI::Validator byte_size(std::uint64_t max) {
    return CLI::Validator(
        [max](std::string& text) {
            std::string problem = byte_size_problem(text, max);
            if (problem.empty()) {
                text = std::to_string(*parse_byte_size(text));
            }
            return problem;
        },
        "");
}

} // namespace tollgate
