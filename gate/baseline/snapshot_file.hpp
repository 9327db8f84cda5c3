// SPDX-License-Identifier: MIT
// Snapshot files: the JSON format, atomic writes, strict loading and path confinement.
#pragma once

#include "gate/baseline/snapshot.hpp"
#include "gate/common/output_file.hpp"

#include <optional>
#include <string>

namespace tollgate::baseline {

// What a loaded snapshot must agree with to be used by this run.
struct SnapshotExpectations {
    std::optional<std::string> convention; // fingerprint this run counts under; empty: any
    std::optional<double> stroud;          // Stroud number this run uses; empty: any
};

// Whether save_snapshot may replace a file that is not a Tollgate snapshot.
enum class Overwrite {
    snapshots_only, // replace only a missing file or a readable Tollgate snapshot (of any
                    // convention, schema version or Stroud number)
    anything,       // replace whatever is there (--force)
};

// Environment variable of the test hook that pauses save_snapshot (every output file's writer)
// between syncing its temporary file and renaming it; see gate/common/output_file.hpp.
inline constexpr const char* k_pause_before_rename_variable =
    tollgate::k_pause_before_rename_variable;

// Return the JSON text of `snapshot` (2-space indent, fixed key order, trailing newline): the
// same snapshot gives the same bytes.
std::string snapshot_to_json(const Snapshot& snapshot);

// Parse the JSON text `text` of a snapshot read from `display_path` (used in messages only) and
// check it against `expectations`. Throws UsageError naming `display_path` and what is wrong for
// an empty, truncated, corrupted (invalid JSON, a missing or ill-typed key, functions out of
// order, a digest mismatch) or foreign (not "tollgate.snapshot/N") text, and for a snapshot of
// another schema version, convention or Stroud number, with the command that rebuilds it.
Snapshot parse_snapshot(const std::string& text, const std::string& display_path,
                        const SnapshotExpectations& expectations = {});

// Read and parse the snapshot file at `path` (see parse_snapshot; `path` is named in messages as
// given). Throws UsageError as parse_snapshot does and when the file is missing or unreadable.
Snapshot load_snapshot(const std::string& path, const SnapshotExpectations& expectations = {});

// Write `snapshot` to `path` atomically with write_output_file (a killed writer leaves the
// previous file intact; missing folders are created). Throws UsageError when `path` exists and is
// not a Tollgate snapshot and `overwrite` is Overwrite::snapshots_only; Failure `cannot write
// snapshot "PATH": REASON` when the file system refuses, or `path` is a folder.
void save_snapshot(const Snapshot& snapshot, const std::string& path,
                   Overwrite overwrite = Overwrite::snapshots_only);

// Check that `path` may be replaced under `overwrite` (see save_snapshot), before any work is
// done. Throws UsageError `refusing to replace "PATH": ...` naming what is wrong with the file.
void check_replaceable(const std::string& path, Overwrite overwrite);

// Return why the existing file at `path` cannot be replaced without --force (it is not a
// readable Tollgate snapshot), or nothing when `path` is missing or holds a Tollgate snapshot of
// any convention, schema version or Stroud number.
std::optional<std::string> foreign_file_reason(const std::string& path);

// Return `path` (relative paths taken from `repository_root`) as an absolute path with symlinks
// of its existing part resolved, after checking that it lies inside `repository_root`. Throws
// UsageError when it lies outside, by `..`, an absolute path or a symlink, or names the root.
std::string confine_to_repository(const std::string& path, const std::string& repository_root);

} // namespace tollgate::baseline
