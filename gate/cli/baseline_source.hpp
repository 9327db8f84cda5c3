// SPDX-License-Identifier: MIT
// Reading the baseline snapshot `check` may trust: a file the pipeline names, or the policy's
// baseline.path as a blob of the base commit; never a file the change itself can write.
#pragma once

#include "gate/baseline/snapshot.hpp"
#include "gate/baseline/snapshot_file.hpp"
#include "gate/delta/measure_change.hpp"
#include "gate/delta/snapshot_check.hpp"
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "gate/walker/repository.hpp"
#include "gate/walker/revision_range.hpp"

#include <map>
#include <optional>
#include <string>
#include <vector>

namespace tollgate {

// The baseline snapshot of one check, from a trusted place, or none.
struct TrustedBaseline {
    std::optional<baseline::Snapshot> snapshot; // empty when none is given, configured or usable
    std::string label;                          // where it was read, for notes, e.g.
                                                // "baselines/snapshot.json at base 3f2a91c"
    std::string rebuild_path;                   // the path "tollgate snapshot --out" would take
    std::vector<std::string> notes;             // sentences for every report
    std::string warning; // why a stale snapshot (another convention or Stroud number) is not
                         // used, for stderr; empty when none
};

// Return the snapshot a check of `range` may trust: the file `given` with --baseline (unless it
// is a file of the working tree that the head commit added or changed: then a note says it is
// not used), else the policy `judging`'s baseline.path read from the base commit's tree (a note
// when it is not there). Never reads the policy's path from the working tree or the head.
// A snapshot of another convention or Stroud number than `expectations` is not used: `warning`
// and a note say so and how to rebuild it. Throws UsageError when `given` or the base's file is
// not a valid snapshot, or when baseline.path is not a plain path inside the repository.
TrustedBaseline load_trusted_baseline(const std::string& given, const policy::Policy& judging,
                                      const walker::Repository& repository,
                                      const walker::ResolvedRange& range,
                                      const baseline::SnapshotExpectations& expectations);

// How a check uses its trusted snapshot once the base is parsed.
struct SnapshotUse {
    bool tolerates = false;         // its measures may tolerate existing ceiling findings
    std::vector<std::string> notes; // sentences for every report
    std::string warning;            // the disagreement, for stderr; empty when none
};

// Decide how `trusted` is used against `range` after `check` compared it with the parsed base:
// a snapshot of another commit only tolerates (a note says the base was parsed); one of the
// base that agrees tolerates too; one that disagrees is not used at all, and the note and
// the warning name the first function, both values and the command that rebuilds it.
SnapshotUse decide_snapshot_use(const TrustedBaseline& trusted, const walker::ResolvedRange& range,
                                const delta::SnapshotCheck& check);

// The baseline side of one check: read before anything is measured or written (so a snapshot
// the run writes with --update-baseline is never read back in it), used once the base is parsed.
class CheckBaseline {
public:
    // Load the snapshot the check may trust (see load_trusted_baseline, with the convention and
    // Stroud number of `settings`) and, when there is one, have `settings` compare it with the
    // parsed base. `settings` then points into this object: keep it alive while measuring.
    CheckBaseline(const std::string& given, const policy::Policy& judging,
                  const walker::Repository& repository, const walker::ResolvedRange& range,
                  delta::MeasureChangeSettings& settings);
    CheckBaseline(const CheckBaseline&) = delete;
    CheckBaseline& operator=(const CheckBaseline&) = delete;

    // Add the notes of the snapshot's use to `report`, print a disagreement on stderr as a
    // warning, and give `options` the snapshot's measures for tolerating existing findings when
    // it may (see decide_snapshot_use). `options` then points into this object.
    void apply(const walker::ResolvedRange& range, delta::ChangeReport& report,
               policy::JudgeOptions& options);

private:
    TrustedBaseline m_trusted;
    delta::SnapshotCheck m_check;
    std::map<std::string, core::Measures> m_recorded; // by identity, for tolerating
};

} // namespace tollgate
