// SPDX-License-Identifier: MIT
// Snapshot files, written: the JSON text, atomic replacement, path confinement.
#include "gate/baseline/snapshot_file.hpp"

#include "gate/baseline/snapshot_text.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/output_file.hpp"
#include "gate/common/text_safety.hpp"

#include <filesystem>

namespace fs = std::filesystem;

namespace tollgate::baseline {

using namespace snapshot_text;

namespace {

// The exact bytes of `f`'s text keys that are not valid UTF-8, by key; empty when all are.
Json exact_json(const SnapshotFunction& f) {
    Json exact = Json::object();
    for (const auto& [key, field] : k_text_keys) {
        if (!::tollgate::text::is_valid_utf8(f.*field)) {
            exact[key] = ::tollgate::text::store_bytes(f.*field);
        }
    }
    return exact;
}

Json function_json(const SnapshotFunction& f) {
    Json measures = Json::object();
    for (const auto id : core::k_all_measures) {
        measures[std::string(core::measure_name(id))] = core::measure_value(f.measures, id);
    }
    Json object = Json::object();
    object["file"] = f.path;
    object["start_line"] = f.start_line;
    object["end_line"] = f.end_line;
    object["usr"] = f.usr;
    object["fallback_key"] = f.fallback_key;
    object["function"] = f.qualified_name;
    object["signature"] = f.signature;
    object["extent"] = lexer::extent_name(f.mode);
    object["token_hash"] = f.token_hash;
    if (f.inactive || f.brace_extent) {
        Json marks = Json::array();
        if (f.inactive) {
            marks.push_back("inactive");
        }
        if (f.brace_extent) {
            marks.push_back("brace-extent");
        }
        object["marks"] = std::move(marks);
    }
    object["counts"] = {
        {"n1", f.measures.n1}, {"n2", f.measures.n2}, {"N1", f.measures.N1}, {"N2", f.measures.N2}};
    object["potential_operands"] = f.measures.potential_operands;
    object["measures"] = std::move(measures);
    if (Json exact = exact_json(f); !exact.empty()) {
        object["exact"] = std::move(exact);
    }
    return object;
}

} // namespace

std::string snapshot_to_json(const Snapshot& snapshot) {
    Json functions = Json::array();
    for (const auto& f : snapshot.functions) {
        functions.push_back(function_json(f));
    }
    Json document = Json::object();
    document["schema"] = schema_text(snapshot.schema_version);
    document["tool_version"] = snapshot.tool_version;
    document["convention"] = snapshot.convention;
    document["stroud"] = snapshot.stroud;
    document["commit"] = snapshot.commit;
    document["created"] = snapshot.created;
    document["function_count"] = snapshot.functions.size();
    document["content_digest"] = "";
    document["functions"] = std::move(functions);
    document["content_digest"] = content_digest(document);
    return dump(document, 2) + "\n";
}

void check_replaceable(const std::string& path, Overwrite overwrite) {
    if (overwrite == Overwrite::snapshots_only) {
        if (const auto reason = foreign_file_reason(path)) {
            throw UsageError("refusing to replace \"" + path + "\": " + *reason +
                             " (move it away, or pass --force to replace it)");
        }
    }
}

void save_snapshot(const Snapshot& snapshot, const std::string& path, Overwrite overwrite) {
    check_replaceable(path, overwrite);
    write_output_file("snapshot", path, snapshot_to_json(snapshot));
}

std::string confine_to_repository(const std::string& path, const std::string& repository_root) {
    std::error_code ec;
    const fs::path root = fs::weakly_canonical(fs::absolute(repository_root), ec);
    fs::path wanted(path);
    if (wanted.is_relative()) {
        wanted = root / wanted;
    }
    const fs::path resolved = fs::weakly_canonical(wanted, ec);
    if (ec) {
        throw UsageError("cannot resolve snapshot path \"" + path + "\": " + ec.message());
    }
    const fs::path relative = resolved.lexically_relative(root);
    const std::string remedy =
        "(keep it inside the repository, or give the path with --out on the command line)";
    if (relative.empty() || *relative.begin() == "..") {
        throw UsageError("snapshot path \"" + path + "\" resolves to \"" + resolved.string() +
                         "\", outside the repository \"" + root.string() + "\" " + remedy);
    }
    if (relative == ".") {
        throw UsageError("snapshot path \"" + path +
                         "\" names the repository folder itself, "
                         "not a file (give a file path such as \"" +
                         k_default_snapshot_path + "\")");
    }
    return resolved.string();
}

} // namespace tollgate::baseline
