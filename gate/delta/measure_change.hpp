// SPDX-License-Identifier: MIT
// The gate's measuring pipeline for one change: lex both sides of the changed files, pair and
// measure the touched functions, and build the report model.
#pragma once

#include "gate/baseline/snapshot.hpp"
#include "gate/delta/function_delta.hpp"
#include "gate/lexer/lex_cache.hpp"
#include "gate/walker/change_set.hpp"
#include "gate/walker/repository.hpp"
#include "tollgate/core/convention.hpp"
#include "tollgate/core/measures.hpp"

#include <optional>
#include <string>
#include <vector>

namespace tollgate::delta {

// Settings of the measuring pipeline.
struct MeasureChangeSettings {
    core::MeasureSettings measures;        // Stroud number
    core::Convention convention;           // counting convention switches
    std::string compile_commands_json;     // text of a compile_commands.json, or empty
    std::string compile_commands_root;     // absolute folder its paths are relative to
    std::string cache_dir;                 // precompiled-header cache; empty disables it
    std::vector<std::string> include_dirs; // -I folders for files without compile-database
                                           // flags, as lexer::add_include_dirs takes them
    unsigned jobs = 0;                     // parser threads, 0 = all cores
    lexer::LexCache* lex_cache = nullptr;  // lexed files to reuse and to keep (not owned);
                                           // null parses every file
    const baseline::Snapshot* base_snapshot = nullptr; // a snapshot of the base commit: its
                                                       // measures replace parsing the base side;
                                                       // ignored when its commit is not the base
    std::string base_snapshot_path;                    // where it was read, for the report's note
};

// Measure the change `changes` in `repository`: each changed C/C++ file is parsed once per side
// (headers of the same revision supplied from memory), and only touched functions are measured.
// With a snapshot of the base commit in `settings`, the base side is read from it instead.
// Throws Failure when a blob cannot be read or libclang fails.
ChangeReport measure_change(const walker::Repository& repository, const walker::ChangeSet& changes,
                            const MeasureChangeSettings& settings);

} // namespace tollgate::delta
