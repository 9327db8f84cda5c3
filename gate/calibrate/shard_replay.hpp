// SPDX-License-Identifier: MIT
// Sharded replays: the block of history one CI job replays, its partial result on disk, and the
// merge of all parts into the replay one unsharded run would have made.
#pragma once

#include "gate/calibrate/calibration_scope.hpp"
#include "gate/calibrate/lex_file_cache.hpp"
#include "gate/calibrate/replay.hpp"
#include "gate/common/shard_spec.hpp"
#include "gate/walker/history.hpp"

#include <map>
#include <string>
#include <vector>

namespace tollgate::calibrate {

// The schema of a partial replay ("schema" key).
inline constexpr const char* k_replay_part_schema = "tollgate.calibrate-part/2";

// Return the commits of `history` that shard `shard` replays: the K-th of N contiguous blocks
// of nearly equal size, oldest first (consecutive commits share blobs, so a block reparses
// little). The tip name is kept. The blocks of shards 1..N, in order, are the whole history.
walker::History shard_history(const walker::History& history, const ShardSpec& shard);

// What one shard of a calibrate run produced.
struct ReplayPart {
    ShardSpec shard;                             // which shard
    std::string tool_version;                    // TOLLGATE_VERSION of the writer
    std::map<std::string, std::string> settings; // every option that decides the result, by name
                                                 // (range, limits, convention, ...)
    walker::History history;                     // the whole history every shard selected
    CalibrationScope scope;         // the policy and vendored folders chosen for that whole history
                                    // (the folders' counts are left to the merge)
    Replay replay;                  // this shard's replay (its history is the shard's block)
    CacheCounts cache;              // lexed-file cache use of this shard
    std::vector<std::string> blobs; // content keys of the file contents it visited, sorted
    double seconds = 0;             // wall time of the shard's replay
    unsigned threads = 1;           // worker threads the shard used
};

// Return the JSON text of `part` (schema k_replay_part_schema; every text lossless, every
// number exact). Never throws.
std::string replay_part_to_json(const ReplayPart& part);

// Parse the text of a part read from `name` (named in messages). Throws UsageError naming
// `name` when it is not a partial calibrate result of this schema or is damaged.
ReplayPart parse_replay_part(const std::string& text, const std::string& name);

// Read and parse the part at `path`. Throws UsageError when it cannot be read or parsed.
ReplayPart read_replay_part(const std::string& path);

// The merge of every part of one sharded run.
struct MergedReplay {
    Replay replay;          // as one unsharded run replays it: the whole history, commits in order
    CalibrationScope scope; // the scope the parts were measured under (the first part's; every
                            // part's settings name it)
    CacheCounts cache;      // summed cache use; distinct_blobs counted over the union of the parts
    double seconds = 0;     // summed wall time of the shards' replays
    unsigned threads = 0;   // summed worker threads of the shards
};

// Merge `parts` (read from `names`, same order, named in messages) into one replay. Throws
// UsageError when a part was written by another tool version than this one, when the parts
// disagree on the shard count, a setting (the first one that differs is named) or the history,
// when a shard is given twice or is missing, or when a part is of an interrupted shard.
MergedReplay merge_replay_parts(std::vector<ReplayPart> parts,
                                const std::vector<std::string>& names);

} // namespace tollgate::calibrate
