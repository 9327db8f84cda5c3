// SPDX-License-Identifier: MIT
// Which share of a job one CI runner takes: "K/N", the K-th of N shards.
#pragma once

#include <cstddef>
#include <string>

namespace tollgate {

// The K-th of N shards, 1 <= K <= N.
struct ShardSpec {
    unsigned index = 1; // K, from 1
    unsigned count = 1; // N, at least 1

    bool operator==(const ShardSpec& other) const {
        return index == other.index && count == other.count;
    }
    // Return "K/N".
    std::string text() const { return std::to_string(index) + "/" + std::to_string(count); }
};

// Parse `text` ("K/N" in decimal, 1 <= K <= N <= 4096) given to option `option`. Throws
// UsageError naming the option and the text otherwise.
ShardSpec parse_shard_spec(const std::string& text, const std::string& option);

// Return the shard (0-based) that `path` belongs to among `count` shards: its 64-bit FNV-1a
// digest modulo `count`, so a file's shard depends on its path alone and stays put when other
// files come or go. `count` 0 is taken as 1.
unsigned shard_of_path(const std::string& path, unsigned count);

// Return the first index of shard `shard` when `total` items are cut into `shard.count`
// contiguous blocks of nearly equal size (block K starts at floor((K-1) total / N)); the block
// ends where shard K+1 begins (shard_begin with K = N+1 is `total`).
std::size_t shard_begin(std::size_t total, unsigned index, unsigned count);

} // namespace tollgate
