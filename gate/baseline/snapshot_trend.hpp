// SPDX-License-Identifier: MIT
// The trend between two snapshots: functions that grew most, and totals per top folder.
#pragma once

#include "gate/baseline/snapshot.hpp"

#include <cstddef>
#include <optional>
#include <ostream>
#include <string>
#include <vector>

namespace tollgate::baseline {

// One function present in both snapshots whose effort grew.
struct FunctionGrowth {
    std::string path;           // repository-relative path (the same on both sides)
    unsigned head_line = 0;     // start line in head
    std::string qualified_name; // qualified name in head
    std::string signature;      // signature in head
    core::Delta effort;         // effort base -> head; percent empty when base effort is 0

    bool operator==(const FunctionGrowth& other) const {
        return path == other.path && head_line == other.head_line &&
               qualified_name == other.qualified_name && signature == other.signature &&
               effort == other.effort;
    }
};

// Sums over the functions under one top folder, base and head.
struct FolderTotals {
    std::string folder;             // first path component; "." for files at the root
    std::size_t base_functions = 0; // functions in base
    std::size_t head_functions = 0; // functions in head
    core::Delta volume;             // sum of V, base -> head
    core::Delta effort;             // sum of E, base -> head

    bool operator==(const FolderTotals& other) const {
        return folder == other.folder && base_functions == other.base_functions &&
               head_functions == other.head_functions && volume == other.volume &&
               effort == other.effort;
    }
};

// Everything `tollgate snapshot --compare BASE HEAD` reports.
struct SnapshotTrend {
    std::string convention;             // fingerprint both snapshots share
    std::string base_commit;            // 40-hex id of the base snapshot's commit
    std::string head_commit;            // 40-hex id of the head snapshot's commit
    std::string base_created;           // base snapshot's time
    std::string head_created;           // head snapshot's time
    std::size_t matched = 0;            // functions found on both sides (same file)
    std::size_t added = 0;              // functions only in head
    std::size_t removed = 0;            // functions only in base
    std::size_t grew = 0;               // matched functions whose effort went up
    std::size_t shrank = 0;             // matched functions whose effort went down
    std::size_t unchanged = 0;          // matched functions whose effort stayed equal
    std::vector<FunctionGrowth> growth; // every grown function: largest effort increase first,
                                        // then by path, head line and name
    std::vector<FolderTotals> folders;  // every top folder of either side, sorted by name
    FolderTotals total;                 // sums over every folder (folder name "total")

    bool operator==(const SnapshotTrend& other) const {
        return convention == other.convention && base_commit == other.base_commit &&
               head_commit == other.head_commit && base_created == other.base_created &&
               head_created == other.head_created && matched == other.matched &&
               added == other.added && removed == other.removed && grew == other.grew &&
               shrank == other.shrank && unchanged == other.unchanged && growth == other.growth &&
               folders == other.folders && total == other.total;
    }
};

// Compare snapshot `base` with snapshot `head`: pair functions of the same file one to one (by
// USR when it is unique on both sides, then by fallback key, then by qualified name and
// signature when unique on both sides), count added, removed, grown and shrunk functions, and
// sum volume and effort per top folder. A function moved to another file counts as removed and
// added. Two empty snapshots give an empty trend.
SnapshotTrend compare_snapshots(const Snapshot& base, const Snapshot& head);

// Write `trend` as text to `out`, listing at most `top` grown functions.
void write_trend_text(std::ostream& out, const SnapshotTrend& trend, std::size_t top);

// Write `trend` as JSON (schema "tollgate.snapshot-trend/1") to `out`, listing at most `top`
// grown functions.
void write_trend_json(std::ostream& out, const SnapshotTrend& trend, std::size_t top);

} // namespace tollgate::baseline
