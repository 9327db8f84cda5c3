// SPDX-License-Identifier: MIT
// "K/N" shard specifications and the two ways work is cut: by path, and in contiguous blocks.
#include "gate/common/shard_spec.hpp"

#include "gate/common/errors.hpp"
#include "gate/common/fnv_digest.hpp"

#include <cstdint>

namespace tollgate {

namespace {

constexpr unsigned k_max_shards = 4096;

// Parse a positive decimal number of at most 4 digits; 0 when it is not one.
unsigned small_number(const std::string& text) {
    if (text.empty() || text.size() > 4) {
        return 0;
    }
    unsigned value = 0;
    for (const char c : text) {
        if (c < '0' || c > '9') {
            return 0;
        }
        value = value * 10 + static_cast<unsigned>(c - '0');
    }
    return value;
}

} // namespace

ShardSpec parse_shard_spec(const std::string& text, const std::string& option) {
    const auto slash = text.find('/');
    const unsigned index = slash == std::string::npos ? 0 : small_number(text.substr(0, slash));
    const unsigned count = slash == std::string::npos ? 0 : small_number(text.substr(slash + 1));
    if (index == 0 || count == 0 || index > count || count > k_max_shards) {
        throw UsageError(option + " \"" + text +
                         "\" is not K/N with 1 <= K <= N <= 4096 (e.g. \"2/4\" for the second "
                         "of four shards)");
    }
    return {index, count};
}

unsigned shard_of_path(const std::string& path, unsigned count) {
    return count == 0 ? 0 : static_cast<unsigned>(fnv_digest(path) % count);
}

std::size_t shard_begin(std::size_t total, unsigned index, unsigned count) {
    if (count == 0) {
        return 0;
    }
    const auto k = static_cast<unsigned long long>(index == 0 ? 0 : index - 1);
    return static_cast<std::size_t>(k * total / count);
}

} // namespace tollgate
