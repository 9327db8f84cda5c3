// SPDX-License-Identifier: MIT
// Snapshot parts: written by `snapshot --shard`, checked against each other and joined by
// `snapshot --merge`.
#include "gate/baseline/snapshot_shard.hpp"

#include "gate/baseline/snapshot_file.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/output_file.hpp"
#include "gate/common/text_safety.hpp"

#include <algorithm>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

namespace tollgate::baseline {

namespace {

using nlohmann::json;

std::string quoted(const std::string& name) {
    return "\"" + text::terminal_text(name) + "\"";
}

std::string number_text(double value) {
    std::ostringstream out;
    out << value;
    return out.str();
}

} // namespace

std::string snapshot_part_to_json(const SnapshotPart& part) {
    const json doc = {{"schema", k_snapshot_part_schema},
                      {"shard", part.shard.text()},
                      {"files", part.files},
                      {"settings", part.settings},
                      {"snapshot", snapshot_to_json(part.snapshot)}};
    return text::dump_json(doc, 1) + "\n";
}

SnapshotPart parse_snapshot_part(const std::string& text, const std::string& name) {
    const std::string remedy = " (write it again with \"tollgate snapshot --shard K/N\")";
    json doc;
    try {
        doc = json::parse(text);
    } catch (const std::exception&) {
        throw UsageError(quoted(name) + " is not JSON" + remedy);
    }
    if (!doc.is_object() || !doc.contains("schema") || !doc["schema"].is_string() ||
        doc["schema"].get<std::string>() != k_snapshot_part_schema) {
        throw UsageError(quoted(name) + " is not a snapshot part (schema \"" +
                         k_snapshot_part_schema + "\" expected)" + remedy);
    }
    SnapshotPart part;
    std::string inner;
    try {
        part.shard = parse_shard_spec(doc.at("shard").get<std::string>(), "shard");
        doc.at("files").get_to(part.files);
        doc.at("settings").get_to(part.settings);
        inner = doc.at("snapshot").get<std::string>();
    } catch (const std::exception&) {
        throw UsageError(quoted(name) +
                         " is damaged: a missing or mistyped shard, files, "
                         "settings or snapshot" +
                         remedy);
    }
    part.snapshot = parse_snapshot(inner, name);
    for (const auto& f : part.snapshot.functions) {
        if (shard_of_path(f.path, part.shard.count) != part.shard.index - 1) {
            throw UsageError(quoted(name) + " holds " + quoted(f.path) +
                             ", a file of another "
                             "shard than " +
                             part.shard.text() + remedy);
        }
    }
    return part;
}

SnapshotPart load_snapshot_part(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) {
        throw UsageError("cannot read " + quoted(path) + " (check the path of the part)");
    }
    std::ostringstream text;
    text << in.rdbuf();
    return parse_snapshot_part(text.str(), path);
}

void save_snapshot_part(const SnapshotPart& part, const std::string& path) {
    write_output_file("snapshot part", path, snapshot_part_to_json(part));
}

Snapshot merge_snapshot_parts(std::vector<SnapshotPart> parts,
                              const std::vector<std::string>& names, const std::string& created) {
    if (parts.empty()) {
        throw UsageError("--merge needs the parts of a sharded run (give every part file)");
    }
    const auto name = [&](std::size_t i) {
        return quoted(i < names.size() ? names[i] : "part " + std::to_string(i + 1));
    };
    const SnapshotPart& first = parts.front();
    std::vector<std::size_t> slot_of(first.shard.count, parts.size());
    for (std::size_t i = 0; i < parts.size(); ++i) {
        const Snapshot& s = parts[i].snapshot;
        const auto disagree = [&](const std::string& what, const std::string& mine,
                                  const std::string& theirs) {
            throw UsageError("the parts disagree on " + what + ": " + name(0) + " has \"" +
                             text::terminal_text(theirs) + "\", " + name(i) + " has \"" +
                             text::terminal_text(mine) +
                             "\" (run every shard on one commit with the same options)");
        };
        if (s.tool_version != TOLLGATE_VERSION) {
            throw UsageError(name(i) + " was written by tollgate " +
                             text::terminal_text(s.tool_version) + ", this is tollgate " +
                             TOLLGATE_VERSION +
                             " (run every shard and the merge with one version)");
        }
        if (s.commit != first.snapshot.commit) {
            disagree("the commit", s.commit, first.snapshot.commit);
        }
        if (s.convention != first.snapshot.convention) {
            disagree("the convention", s.convention, first.snapshot.convention);
        }
        if (s.stroud != first.snapshot.stroud) {
            disagree("the Stroud number", number_text(s.stroud),
                     number_text(first.snapshot.stroud));
        }
        for (const auto& [key, value] : first.settings) {
            const auto other = parts[i].settings.find(key);
            if (other == parts[i].settings.end() || other->second != value) {
                disagree(key, other == parts[i].settings.end() ? "" : other->second, value);
            }
        }
        if (parts[i].settings.size() != first.settings.size()) {
            throw UsageError("the parts disagree on their settings: " + name(i) + " has others " +
                             "than " + name(0) + " (run every shard with the same options)");
        }
        if (parts[i].shard.count != first.shard.count) {
            throw UsageError(name(i) + " is shard " + parts[i].shard.text() + " but " + name(0) +
                             " is shard " + first.shard.text() +
                             " (merge the parts of one sharded run)");
        }
        std::size_t& slot = slot_of[parts[i].shard.index - 1];
        if (slot != parts.size()) {
            throw UsageError(name(i) + " repeats shard " + parts[i].shard.text() + " of " +
                             name(slot) + " (give each shard once)");
        }
        slot = i;
    }
    for (unsigned k = 0; k < first.shard.count; ++k) {
        if (slot_of[k] == parts.size()) {
            throw UsageError("shard " + ShardSpec{k + 1, first.shard.count}.text() +
                             " is missing (give all " + std::to_string(first.shard.count) +
                             " parts)");
        }
    }
    Snapshot merged = first.snapshot;
    merged.created = created;
    merged.functions.clear();
    for (auto& part : parts) {
        for (auto& f : part.snapshot.functions) {
            merged.functions.push_back(std::move(f));
        }
    }
    // Each file lies in one shard, so the parts' functions only need the snapshot's order.
    std::sort(merged.functions.begin(), merged.functions.end(), snapshot_order);
    return merged;
}

} // namespace tollgate::baseline
