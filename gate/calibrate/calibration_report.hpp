// SPDX-License-Identifier: MIT
// Renderers of a calibration: terminal text, JSON and a self-contained HTML page.
#pragma once

#include "gate/calibrate/block_rate.hpp"
#include "gate/calibrate/calibration_scope.hpp"
#include "gate/calibrate/distribution.hpp"
#include "gate/calibrate/lex_file_cache.hpp"
#include "gate/calibrate/replay.hpp"

#include <optional>
#include <ostream>
#include <vector>

namespace tollgate::calibrate {

// Everything a calibration report shows.
struct Calibration {
    const Replay* replay = nullptr;                 // the replayed history (not owned)
    const CalibrationScope* scope = nullptr;        // policy honoured, vendored folders (not
                                                    // owned); may be null
    std::vector<MeasureDistribution> distributions; // one per measure asked for
    std::optional<WhatIf> what_if;                  // with --policy
    std::optional<BlockRateSuggestion> suggestion;  // with --suggest-block-rate
    CacheCounts cache;                              // lexed-file cache use
    double seconds = 0;                             // wall time of the replay
    unsigned threads = 1;                           // worker threads used
};

// Write `calibration` as a terminal report: per measure a percentile table and text histograms,
// the largest values with their commits, then the what-if counts. Never throws.
void write_calibration_text(std::ostream& out, const Calibration& calibration);

// Write `calibration` as JSON (schema "tollgate.calibrate/1"). Never throws.
void write_calibration_json(std::ostream& out, const Calibration& calibration);

// Write `calibration` as one self-contained HTML page (inline CSS and SVG histograms; no script,
// font or network access). Never throws.
void write_calibration_html(std::ostream& out, const Calibration& calibration);

} // namespace tollgate::calibrate
