// SPDX-License-Identifier: MIT
// Building snapshots from lexed functions, and finding a function in one.
#include "gate/baseline/snapshot.hpp"

#include "tollgate/core/counts.hpp"

#include <algorithm>
#include <ctime>
#include <tuple>

namespace tollgate::baseline {

bool snapshot_order(const SnapshotFunction& a, const SnapshotFunction& b) {
    return std::tie(a.path, a.start_line, a.fallback_key) <
           std::tie(b.path, b.start_line, b.fallback_key);
}

Snapshot make_snapshot(const std::vector<lexer::FileFunctions>& files, const std::string& commit,
                       const std::string& convention, const core::MeasureSettings& settings,
                       const std::string& created) {
    Snapshot snapshot;
    snapshot.tool_version = TOLLGATE_VERSION;
    snapshot.convention = convention;
    snapshot.stroud = settings.stroud;
    snapshot.commit = commit;
    snapshot.created = created;
    for (const auto& file : files) {
        for (const auto& span : file.functions) {
            SnapshotFunction function;
            function.path = span.path;
            function.start_line = span.start_line;
            function.end_line = span.end_line;
            function.usr = span.usr;
            function.fallback_key = span.fallback_key;
            function.qualified_name = span.qualified_name;
            function.signature = span.signature;
            function.mode = span.mode;
            function.token_hash = span.token_hash;
            function.inactive = span.inactive;
            function.brace_extent = span.brace_extent;
            // The same two calls as measure_span, so that snapshot and `measure` agree exactly.
            function.measures = core::compute_measures(core::count_tokens(span.tokens),
                                                       span.potential_operands, settings);
            snapshot.functions.push_back(std::move(function));
        }
    }
    std::sort(snapshot.functions.begin(), snapshot.functions.end(), snapshot_order);
    // The fallback key's ordinal makes keys unique within a file; should the lexer ever report a
    // definition twice, keep one so that the file stays strictly ordered and loadable.
    snapshot.functions.erase(std::unique(snapshot.functions.begin(), snapshot.functions.end(),
                                         [](const SnapshotFunction& a, const SnapshotFunction& b) {
                                             return !snapshot_order(a, b) && !snapshot_order(b, a);
                                         }),
                             snapshot.functions.end());
    return snapshot;
}

std::string current_utc_time() {
    const std::time_t now = std::time(nullptr);
    std::tm utc{};
    gmtime_r(&now, &utc);
    char text[32];
    std::strftime(text, sizeof text, "%Y-%m-%dT%H:%M:%SZ", &utc);
    return text;
}

std::string name_and_signature(const std::string& fallback_key) {
    const std::size_t hash = fallback_key.rfind('#');
    return hash == std::string::npos ? fallback_key : fallback_key.substr(0, hash);
}

const SnapshotFunction* find_function(const Snapshot& snapshot, const std::string& path,
                                      const std::string& usr, const std::string& fallback_key) {
    // Functions are sorted by path first: the file's functions are one contiguous run.
    const auto first = std::lower_bound(
        snapshot.functions.begin(), snapshot.functions.end(), path,
        [](const SnapshotFunction& f, const std::string& p) { return f.path < p; });
    const auto last = std::upper_bound(
        first, snapshot.functions.end(), path,
        [](const std::string& p, const SnapshotFunction& f) { return p < f.path; });

    // Return the only function of [first, last) that `matches`, or null.
    auto only = [&](auto matches) -> const SnapshotFunction* {
        const SnapshotFunction* found = nullptr;
        for (auto it = first; it != last; ++it) {
            if (matches(*it)) {
                if (found != nullptr) {
                    return nullptr;
                }
                found = &*it;
            }
        }
        return found;
    };

    if (!usr.empty()) {
        if (const auto* by_usr = only([&](const SnapshotFunction& f) { return f.usr == usr; })) {
            return by_usr;
        }
        // A USR shared by several functions (macro-made ones) is settled by the fallback key.
        if (const auto* both = only([&](const SnapshotFunction& f) {
                return f.usr == usr && f.fallback_key == fallback_key;
            })) {
            return both;
        }
    }
    if (const auto* by_key =
            only([&](const SnapshotFunction& f) { return f.fallback_key == fallback_key; })) {
        return by_key;
    }
    const std::string wanted = name_and_signature(fallback_key);
    return only(
        [&](const SnapshotFunction& f) { return name_and_signature(f.fallback_key) == wanted; });
}

} // namespace tollgate::baseline
