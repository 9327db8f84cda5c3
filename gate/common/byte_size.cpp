// SPDX-License-Identifier: MIT
// Reading and showing sizes in bytes.
#include "gate/common/byte_size.hpp"

#include <fmt/format.h>
#include <limits>

namespace tollgate {

std::optional<std::uint64_t> parse_byte_size(const std::string& text) {
    std::size_t digits = 0;
    while (digits < text.size() && text[digits] >= '0' && text[digits] <= '9') {
        ++digits;
    }
    if (digits == 0 || text.size() > digits + 1) {
        return std::nullopt;
    }
    std::uint64_t unit = 1;
    if (text.size() == digits + 1) {
        switch (text.back()) {
        case 'K':
        case 'k':
            unit = std::uint64_t{1} << 10;
            break;
        case 'M':
        case 'm':
            unit = std::uint64_t{1} << 20;
            break;
        case 'G':
        case 'g':
            unit = std::uint64_t{1} << 30;
            break;
        default:
            return std::nullopt;
        }
    }
    constexpr std::uint64_t k_max = std::numeric_limits<std::uint64_t>::max();
    std::uint64_t value = 0;
    for (std::size_t i = 0; i < digits; ++i) {
        const auto digit = static_cast<std::uint64_t>(text[i] - '0');
        if (value > (k_max - digit) / 10) {
            return std::nullopt;
        }
        value = value * 10 + digit;
    }
    if (value > k_max / unit) {
        return std::nullopt;
    }
    return value * unit;
}

std::string format_byte_size(std::uint64_t bytes) {
    static const char* const k_units[] = {"B", "KiB", "MiB", "GiB", "TiB", "PiB", "EiB"};
    std::size_t unit = 0;
    std::uint64_t scale = 1;
    while (unit + 1 < sizeof k_units / sizeof k_units[0] && bytes / scale >= 1024) {
        scale <<= 10;
        ++unit;
    }
    if (bytes % scale == 0) {
        return fmt::format("{} {}", bytes / scale, k_units[unit]);
    }
    // One decimal, rounded down, so that a file just over a limit never shows as the limit.
    // In long double: the remainder times ten can pass 64 bits for exbibytes.
    const auto tenth = static_cast<unsigned>(static_cast<long double>(bytes % scale) * 10.0L /
                                             static_cast<long double>(scale));
    return fmt::format("{}.{} {}", bytes / scale, tenth, k_units[unit]);
}

} // namespace tollgate
