// SPDX-License-Identifier: MIT
// Measure a whole revision into a baseline snapshot (used by `snapshot` and by
// `check --update-baseline`).
#pragma once

#include "gate/baseline/snapshot.hpp"
#include "gate/common/shard_spec.hpp"
#include "gate/common/source.hpp"

#include <cstddef>
#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

namespace tollgate {

// What to measure, and how.
struct SnapshotRequest {
    std::string commit;             // full id of the commit to measure
    std::string compile_commands;   // compile_commands.json path, or empty for the default search
    std::string cache_dir;          // precompiled-header cache; empty picks the default
    bool no_cache = false;          // parse without the precompiled-header cache
    unsigned jobs = 0;              // parser threads, 0 = all cores
    double stroud = 18.0;           // Stroud number for T
    std::optional<ShardSpec> shard; // measure only the files of this shard (shard_of_path)
    // Called (serialised) after each file parsed with the files done and the total; may be empty.
    std::function<void(std::size_t done, std::size_t total)> on_progress;
    std::uint64_t max_file_size = k_default_max_file_size; // bytes; larger files are not read
    std::vector<std::string> include_dirs;                 // --include-dir folders, as given
};

// The snapshot with what a summary line needs.
struct SnapshotResult {
    baseline::Snapshot snapshot;          // every function of every C/C++ file of the commit
    std::size_t files = 0;                // C/C++ files measured
    std::size_t warnings = 0;             // parse warnings (not stored in the snapshot)
    std::vector<OversizedFile> oversized; // files left unread for their size (not in it either)
};

// Measure every function of every C/C++ file of `request.commit` (read from the object
// database, in parallel) into a snapshot. Throws UsageError for an unknown commit.
SnapshotResult snapshot_revision(const SnapshotRequest& request);

} // namespace tollgate
