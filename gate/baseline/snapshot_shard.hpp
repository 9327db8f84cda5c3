// SPDX-License-Identifier: MIT
// Sharded snapshots: the files one CI job measures, its part on disk, and the merge of all parts
// into the snapshot one unsharded run writes.
#pragma once

#include "gate/baseline/snapshot.hpp"
#include "gate/common/shard_spec.hpp"

#include <cstddef>
#include <map>
#include <string>
#include <vector>

namespace tollgate::baseline {

// The schema of a snapshot part ("schema" key).
inline constexpr const char* k_snapshot_part_schema = "tollgate.snapshot-part/2";

// What one shard of a snapshot run measured.
struct SnapshotPart {
    ShardSpec shard;       // which shard (its files: shard_of_path(path, N) == K - 1)
    std::size_t files = 0; // files the shard measured
    Snapshot snapshot;     // the functions of those files, with the run's commit and convention
    std::map<std::string, std::string> settings; // every other option that decides the result,
                                                 // by name (max-file-size, include-dir, ...)
};

// Return the JSON text of `part`: the schema, the shard, the file count and the snapshot's own
// text (snapshot_to_json, digest included) as one string. Never throws.
std::string snapshot_part_to_json(const SnapshotPart& part);

// Parse the text of a part read from `name` (named in messages). Throws UsageError naming `name`
// when it is not a snapshot part, is damaged (parse_snapshot's checks apply to the snapshot in
// it) or holds a function of a file outside its shard.
SnapshotPart parse_snapshot_part(const std::string& text, const std::string& name);

// Read and parse the part at `path`. Throws UsageError when it cannot be read or parsed.
SnapshotPart load_snapshot_part(const std::string& path);

// Write `part` to `path` (a temporary file renamed into place). Throws UsageError when the file
// cannot be written.
void save_snapshot_part(const SnapshotPart& part, const std::string& path);

// Merge `parts` (read from `names`, same order, named in messages) into the snapshot an unsharded
// run writes, with creation time `created`. Throws UsageError when a part was written by another
// tool version than this one, when parts differ in commit, convention, Stroud number, a setting
// (the first one that differs is named) or shard count, or when a shard is given twice or is
// missing.
Snapshot merge_snapshot_parts(std::vector<SnapshotPart> parts,
                              const std::vector<std::string>& names, const std::string& created);

} // namespace tollgate::baseline
