// SPDX-License-Identifier: MIT
// Baseline snapshots: every function of a revision with its identity, counts and measures.
#pragma once

#include "gate/lexer/function_span.hpp"
#include "tollgate/core/measures.hpp"

#include <cstdint>
#include <string>
#include <vector>

namespace tollgate::baseline {

// The snapshot schema this build writes and reads (the "schema" key is "tollgate.snapshot/1").
inline constexpr int k_snapshot_schema_version = 1;

// The schema name before the "/" of the "schema" key.
inline constexpr const char* k_snapshot_schema_name = "tollgate.snapshot";

// Where `tollgate snapshot` writes when neither --out nor the policy's baseline.path says where,
// relative to the repository root.
inline constexpr const char* k_default_snapshot_path = "baselines/snapshot.json";

// One function of a snapshot.
struct SnapshotFunction {
    std::string path;           // repository-relative path of the file holding the definition
    unsigned start_line = 0;    // first line of the definition (1-based)
    unsigned end_line = 0;      // line of the closing brace
    std::string usr;            // libclang's USR; empty for lexically found functions and lambdas
    std::string fallback_key;   // qualified name + "(" signature ")" + "#" ordinal in the file
    std::string qualified_name; // e.g. "skyline::RingBuffer::push"
    std::string signature;      // parameter types as written
    lexer::ExtentMode mode = lexer::ExtentMode::syntax_tree; // how the extent was found
    std::string token_hash;    // FunctionSpan::token_hash: digest of the counted tokens
    bool inactive = false;     // FunctionSpan::inactive: in a branch the preprocessor skipped
    bool brace_extent = false; // FunctionSpan::brace_extent: extent taken from brace matching
    core::Measures measures;   // n1 n2 N1 N2, n2* and every measure

    bool operator==(const SnapshotFunction& other) const {
        return path == other.path && start_line == other.start_line && end_line == other.end_line &&
               usr == other.usr && fallback_key == other.fallback_key &&
               qualified_name == other.qualified_name && signature == other.signature &&
               mode == other.mode && token_hash == other.token_hash && measures == other.measures &&
               inactive == other.inactive && brace_extent == other.brace_extent;
    }
};

// The measures of every function of one revision, as written to a snapshot file.
struct Snapshot {
    int schema_version = k_snapshot_schema_version; // from the "schema" key
    std::string tool_version;                       // TOLLGATE_VERSION of the writer
    std::string convention;                         // counting-convention fingerprint
    double stroud = 18.0;                           // Stroud number the time measure used
    std::string commit;                             // 40-hex id of the measured commit
    std::string created;                            // UTC time, "YYYY-MM-DDTHH:MM:SSZ"
    std::vector<SnapshotFunction> functions;        // sorted by path, start line, fallback key

    bool operator==(const Snapshot& other) const {
        return schema_version == other.schema_version && tool_version == other.tool_version &&
               convention == other.convention && stroud == other.stroud && commit == other.commit &&
               created == other.created && functions == other.functions;
    }
};

// Build the snapshot of commit `commit` from the lexed `files`: count and measure every function
// with `settings` (as `tollgate measure` does), record `convention` (a fingerprint), the Stroud
// number of `settings`, `created` (see current_utc_time) and this build's version, and sort the
// functions by path, start line and fallback key (keeping one of any that share all three). No
// files give a snapshot without functions.
Snapshot make_snapshot(const std::vector<lexer::FileFunctions>& files, const std::string& commit,
                       const std::string& convention, const core::MeasureSettings& settings,
                       const std::string& created);

// Return the current time in UTC as "YYYY-MM-DDTHH:MM:SSZ" (ISO 8601).
std::string current_utc_time();

// Return the function of `snapshot` in file `path` that is the same function as the one with
// `usr` and `fallback_key`: the one with that USR (when `usr` is not empty and exactly one
// function of the file has it, or several do and one of them has `fallback_key`), else the one
// with that fallback key, else the only one with the same qualified name and signature (the
// fallback key without its "#ordinal"). Return null when none or several match.
const SnapshotFunction* find_function(const Snapshot& snapshot, const std::string& path,
                                      const std::string& usr, const std::string& fallback_key);

// Return `fallback_key` without its trailing "#ordinal": the qualified name and signature. A key
// without "#" is returned as it is.
std::string name_and_signature(const std::string& fallback_key);

// Return whether `a` sorts before `b` in a snapshot: by path, start line, then fallback key.
bool snapshot_order(const SnapshotFunction& a, const SnapshotFunction& b);

} // namespace tollgate::baseline
