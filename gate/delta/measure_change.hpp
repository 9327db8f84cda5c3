// SPDX-License-Identifier: MIT
// The gate's measuring pipeline for one change: lex both sides of the changed files, pair and
// measure the touched functions, and build the report model.
#pragma once

#include "gate/baseline/snapshot.hpp"
#include "gate/delta/function_delta.hpp"
#include "gate/delta/snapshot_check.hpp"
#include "gate/lexer/lex_cache.hpp"
#include "gate/lexer/lexer.hpp"
#include "gate/walker/change_set.hpp"
#include "gate/walker/repository.hpp"
#include "tollgate/core/convention.hpp"
#include "tollgate/core/measures.hpp"

#include <functional>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::delta {

// Settings of the measuring pipeline.
struct MeasureChangeSettings {
    core::MeasureSettings measures;    // Stroud number
    core::Convention convention;       // counting convention switches
    std::string compile_commands_json; // text of a compile_commands.json, or empty
    std::string compile_commands_root; // absolute folder its paths are relative to
    lexer::DatabaseOrigin compile_commands_origin =
        lexer::DatabaseOrigin::found;      // given by the pipeline (trusted) or found
    std::string cache_dir;                 // precompiled-header cache; empty disables it
    std::vector<std::string> include_dirs; // -I folders for files without compile-database
                                           // flags, as lexer::add_include_dirs takes them
    unsigned jobs = 0;                     // parser threads, 0 = all cores
    lexer::LexCache* lex_cache = nullptr;  // lexed files to reuse and to keep (not owned);
                                           // null parses every file
    const baseline::Snapshot* base_snapshot = nullptr; // a trusted snapshot to compare with the
                                                       // parsed base when it is of the base
                                                       // commit (not owned); may be null
    SnapshotCheck* snapshot_check = nullptr;           // receives that comparison (not owned); the
                                                       // comparison is made only when this is set
    // Called (serialised) after each file side parsed with the sides done and the total to
    // parse (sides from the lexed-file cache are not counted); may be empty.
    std::function<void(std::size_t done, std::size_t total)> on_progress;
};

// Measure the change `changes` in `repository`: each changed C/C++ file is parsed once per side
// (headers of the same revision supplied from memory), and only touched functions are measured.
// With a snapshot of the base commit and a `snapshot_check` in `settings`, every touched base
// function of the snapshot is compared with the parsed one (see check_base_snapshot); the
// report's base sides are always the parsed ones.
// Throws Failure when a blob cannot be read or libclang fails.
ChangeReport measure_change(const walker::Repository& repository, const walker::ChangeSet& changes,
                            const MeasureChangeSettings& settings);

} // namespace tollgate::delta
