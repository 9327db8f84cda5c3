// SPDX-License-Identifier: MIT
// A whole revision, measured into a snapshot.
#include "gate/cli/snapshot_revision.hpp"

#include "gate/baseline/snapshot_file.hpp"
#include "gate/cli/measure_span.hpp"
#include "gate/cli/sources.hpp"
#include "gate/java/java_front_end.hpp"
#include "gate/lexer/lex_files.hpp"
#include "tollgate/core/convention.hpp"

#include <algorithm>
#include <atomic>

namespace tollgate {

SnapshotResult snapshot_revision(const SnapshotRequest& request) {
    SourceRequest sources;
    sources.revision = request.commit;
    sources.compile_commands = request.compile_commands;
    sources.cache_dir = request.cache_dir;
    sources.no_cache = request.no_cache;
    sources.max_file_size = request.max_file_size;
    sources.include_dirs = request.include_dirs;
    LoadedSources loaded = load_sources(sources);
    if (request.shard) { // the shard's files only; every header stays in the context
        auto& selected = loaded.selected;
        selected.erase(std::remove_if(selected.begin(), selected.end(),
                                      [&](const SourceFile& file) {
                                          return shard_of_path(file.path, request.shard->count) !=
                                                 request.shard->index - 1;
                                      }),
                       selected.end());
    }
    std::atomic<std::size_t> done{0};
    const auto files =
        loaded.selected.empty()
            ? std::vector<lexer::FileFunctions>()
            : lexer::lex_files(loaded.selected, loaded.context, request.jobs,
                               [&](const lexer::FileFunctions&) {
                                   if (request.on_progress) {
                                       request.on_progress(++done, loaded.selected.size());
                                   }
                               });

    core::MeasureSettings settings;
    settings.stroud = request.stroud;
    SnapshotResult result;
    result.snapshot = baseline::make_snapshot(files, request.commit,
                                              java::build_fingerprint(loaded.context.convention),
                                              settings, baseline::current_utc_time());
    result.files = files.size();
    result.warnings = collect_warnings(files).size();
    result.oversized = loaded.oversized;
    return result;
}

} // namespace tollgate
