// SPDX-License-Identifier: MIT
// Sizes in bytes as people write them ("16M") and as messages show them ("16 MiB").
#pragma once

#include <cstdint>
#include <optional>
#include <string>

namespace tollgate {

// Read `text` as a size: decimal digits, optionally followed by K, M or G (binary multiples:
// KiB, MiB, GiB; either case). Return nothing for any other text and for a size past 2^64 - 1.
std::optional<std::uint64_t> parse_byte_size(const std::string& text);

// Return `bytes` for a message: "512 B", "16 MiB", "1.5 GiB" (one decimal past the unit when it
// is not whole, binary multiples). Never fails.
std::string format_byte_size(std::uint64_t bytes);

} // namespace tollgate
