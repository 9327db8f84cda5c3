// SPDX-License-Identifier: MIT
// Partial replays on disk and their merge; the arithmetic stays with distribute() on the merge.
#include "gate/calibrate/shard_replay.hpp"

#include "gate/calibrate/shard_report_json.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/lexer/file_functions_json.hpp"
#include "gate/policy/policy.hpp"

#include <algorithm>
#include <fstream>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>
#include <stdexcept>

namespace tollgate::calibrate {

namespace {

using nlohmann::json;
using text::store_bytes;

using lexer::stored_text;

std::string quoted(const std::string& name) {
    return "\"" + text::terminal_text(name) + "\"";
}

json commit_to_json(const walker::HistoryCommit& c) {
    return {{"commit", c.id.hex},
            {"parent", c.parent ? json(c.parent->hex) : json(nullptr)},
            {"parent_count", c.parent_count},
            {"subject", store_bytes(c.subject)},
            {"time", c.time}};
}

walker::HistoryCommit commit_from_json(const json& j) {
    walker::HistoryCommit c;
    c.id.hex = j.at("commit").get<std::string>();
    if (!j.at("parent").is_null()) {
        c.parent = walker::ObjectId{j.at("parent").get<std::string>()};
    }
    j.at("parent_count").get_to(c.parent_count);
    c.subject = stored_text(j.at("subject"));
    j.at("time").get_to(c.time);
    return c;
}

json cache_to_json(const CacheCounts& c) {
    return {{"visits", c.visits},
            {"hits", c.hits},
            {"parses", c.parses},
            {"damaged", c.damaged},
            {"write_failures", c.write_failures},
            {"distinct_blobs", c.distinct_blobs}};
}

CacheCounts cache_from_json(const json& j) {
    CacheCounts c;
    j.at("visits").get_to(c.visits);
    j.at("hits").get_to(c.hits);
    j.at("parses").get_to(c.parses);
    j.at("damaged").get_to(c.damaged);
    j.at("write_failures").get_to(c.write_failures);
    j.at("distinct_blobs").get_to(c.distinct_blobs);
    return c;
}

json scope_to_json(const CalibrationScope& scope) {
    json vendored = json::array();
    for (const auto& folder : scope.vendored) {
        vendored.push_back(
            {{"path", store_bytes(folder.path)},
             {"sign",
              folder.sign == VendoredSign::test_framework ? "test_framework" : "licensed_bundle"}});
    }
    return {{"policy", store_bytes(policy::describe_policy(scope.policy))},
            {"origin", store_bytes(scope.origin)},
            {"draft", scope.draft},
            {"keep_vendored", scope.handling == VendoredHandling::keep},
            {"vendored", vendored}};
}

CalibrationScope scope_from_json(const json& j) {
    CalibrationScope scope;
    scope.origin = stored_text(j.at("origin"));
    try {
        scope.policy = policy::load_policy(stored_text(j.at("policy")), scope.origin);
    } catch (const std::exception&) {
        throw std::runtime_error("its policy does not load");
    }
    j.at("draft").get_to(scope.draft);
    scope.handling =
        j.at("keep_vendored").get<bool>() ? VendoredHandling::keep : VendoredHandling::exclude;
    for (const auto& folder : j.at("vendored")) {
        const std::string sign = folder.at("sign").get<std::string>();
        if (sign != "test_framework" && sign != "licensed_bundle") {
            throw std::runtime_error("unknown vendored sign");
        }
        scope.vendored.push_back({stored_text(folder.at("path")),
                                  sign == "test_framework" ? VendoredSign::test_framework
                                                           : VendoredSign::licensed_bundle,
                                  0, 0});
    }
    return scope;
}

bool same_history(const walker::History& a, const walker::History& b) {
    return a.tip_name == b.tip_name && a.commits == b.commits;
}

} // namespace

walker::History shard_history(const walker::History& history, const ShardSpec& shard) {
    walker::History block;
    block.tip_name = history.tip_name;
    const std::size_t total = history.commits.size();
    const std::size_t begin = shard_begin(total, shard.index, shard.count);
    const std::size_t end = shard_begin(total, shard.index + 1, shard.count);
    block.commits.assign(history.commits.begin() + static_cast<std::ptrdiff_t>(begin),
                         history.commits.begin() + static_cast<std::ptrdiff_t>(end));
    return block;
}

std::string replay_part_to_json(const ReplayPart& part) {
    json history = json::array();
    for (const auto& c : part.history.commits) {
        history.push_back(commit_to_json(c));
    }
    json commits = json::array();
    for (const auto& rc : part.replay.commits) {
        json dropped = json::array();
        for (const auto& path : rc.dropped) {
            dropped.push_back(store_bytes(path));
        }
        commits.push_back({{"commit", rc.commit.id.hex},
                           {"report", change_report_to_json(rc.report)},
                           {"dropped", dropped}});
    }
    json notes = json::array();
    for (const auto& note : part.replay.notes) {
        notes.push_back(store_bytes(note));
    }
    json settings = json::object();
    for (const auto& [key, value] : part.settings) {
        settings[key] = store_bytes(value);
    }
    const json doc = {{"schema", k_replay_part_schema},
                      {"tool_version", part.tool_version},
                      {"shard", part.shard.text()},
                      {"settings", settings},
                      {"tip", store_bytes(part.history.tip_name)},
                      {"history", history},
                      {"scope", scope_to_json(part.scope)},
                      {"complete", part.replay.end == ReplayEnd::complete},
                      {"notes", notes},
                      {"commits", commits},
                      {"cache", cache_to_json(part.cache)},
                      {"blobs", part.blobs},
                      {"seconds", part.seconds},
                      {"threads", part.threads}};
    return text::dump_json(doc, -1) + "\n";
}

ReplayPart parse_replay_part(const std::string& text, const std::string& name) {
    json doc;
    try {
        doc = json::parse(text);
    } catch (const std::exception&) {
        throw UsageError(quoted(name) +
                         " is not JSON (give the file that \"tollgate calibrate --shard K/N\" "
                         "wrote)");
    }
    if (!doc.is_object() || !doc.contains("schema") || !doc["schema"].is_string() ||
        doc["schema"].get<std::string>() != k_replay_part_schema) {
        throw UsageError(quoted(name) + " is not a partial calibrate result (schema \"" +
                         k_replay_part_schema + "\" expected; write one with \"tollgate " +
                         "calibrate --shard K/N\")");
    }
    ReplayPart part;
    try {
        part.tool_version = doc.at("tool_version").get<std::string>();
        part.shard = parse_shard_spec(doc.at("shard").get<std::string>(), "shard");
        for (const auto& [key, value] : doc.at("settings").items()) {
            part.settings[key] = stored_text(value);
        }
        part.history.tip_name = stored_text(doc.at("tip"));
        for (const auto& c : doc.at("history")) {
            part.history.commits.push_back(commit_from_json(c));
        }
        part.scope = scope_from_json(doc.at("scope"));
        part.replay.history = shard_history(part.history, part.shard);
        const auto& block = part.replay.history.commits;
        std::size_t next = 0; // commits come in history order, each once
        for (const auto& c : doc.at("commits")) {
            const std::string id = c.at("commit").get<std::string>();
            while (next < block.size() && block[next].id.hex != id) {
                ++next;
            }
            if (next == block.size()) {
                throw std::runtime_error("a commit outside the shard's block");
            }
            ReplayedCommit replayed{block[next], change_report_from_json(c.at("report")), {}};
            for (const auto& path : c.at("dropped")) {
                replayed.dropped.push_back(stored_text(path));
            }
            part.replay.commits.push_back(std::move(replayed));
            ++next;
        }
        for (const auto& note : doc.at("notes")) {
            part.replay.notes.push_back(stored_text(note));
        }
        part.replay.end =
            doc.at("complete").get<bool>() ? ReplayEnd::complete : ReplayEnd::interrupted;
        part.cache = cache_from_json(doc.at("cache"));
        doc.at("blobs").get_to(part.blobs);
        doc.at("seconds").get_to(part.seconds);
        doc.at("threads").get_to(part.threads);
    } catch (const UsageError&) {
        throw UsageError(quoted(name) + " is damaged: its shard is not K/N (write it again "
                                        "with \"tollgate calibrate --shard K/N\")");
    } catch (const std::exception& error) {
        throw UsageError(quoted(name) + " is damaged: " + error.what() +
                         " (write it again with \"tollgate calibrate --shard K/N\")");
    }
    return part;
}

ReplayPart read_replay_part(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) {
        throw UsageError("cannot read " + quoted(path) + " (check the path of the part)");
    }
    std::ostringstream text;
    text << in.rdbuf();
    return parse_replay_part(text.str(), path);
}

MergedReplay merge_replay_parts(std::vector<ReplayPart> parts,
                                const std::vector<std::string>& names) {
    if (parts.empty()) {
        throw UsageError("--merge needs the parts of a sharded run (give every part file)");
    }
    const auto name = [&](std::size_t i) {
        return quoted(i < names.size() ? names[i] : "part " + std::to_string(i + 1));
    };
    for (std::size_t i = 0; i < parts.size(); ++i) {
        if (parts[i].tool_version != TOLLGATE_VERSION) {
            throw UsageError(name(i) + " was written by tollgate " +
                             text::terminal_text(parts[i].tool_version) + ", this is tollgate " +
                             TOLLGATE_VERSION +
                             " (run every shard and the merge with one version)");
        }
    }
    const ReplayPart& first = parts.front();
    std::vector<const ReplayPart*> by_shard(first.shard.count, nullptr);
    std::vector<std::size_t> origin(first.shard.count, 0);
    for (std::size_t i = 0; i < parts.size(); ++i) {
        const ReplayPart& part = parts[i];
        if (part.shard.count != first.shard.count) {
            throw UsageError(name(i) + " is shard " + part.shard.text() + " but " + name(0) +
                             " is shard " + first.shard.text() +
                             " (merge the parts of one sharded run)");
        }
        for (const auto& [key, value] : first.settings) {
            const auto other = part.settings.find(key);
            if (other == part.settings.end() || other->second != value) {
                throw UsageError(
                    "the parts disagree on " + key + ": " + name(0) + " has \"" +
                    text::terminal_text(value) + "\", " + name(i) + " has \"" +
                    text::terminal_text(other == part.settings.end() ? "" : other->second) +
                    "\" (run every shard with the same options)");
            }
        }
        if (part.settings.size() != first.settings.size()) {
            throw UsageError("the parts disagree on their settings: " + name(i) +
                             " has others "
                             "than " +
                             name(0) + " (run every shard with the same options)");
        }
        if (!same_history(part.history, first.history)) {
            throw UsageError(name(i) + " replayed another history than " + name(0) +
                             " (the range resolved to other commits: run every shard on the same "
                             "commit with the same --range, --max-commits and --since)");
        }
        const std::size_t slot = part.shard.index - 1;
        if (by_shard[slot] != nullptr) {
            throw UsageError(name(i) + " repeats shard " + part.shard.text() + " of " +
                             name(origin[slot]) + " (give each shard once)");
        }
        if (part.replay.end != ReplayEnd::complete) {
            throw UsageError(name(i) + " is an interrupted shard (" + part.shard.text() +
                             "): run it again");
        }
        by_shard[slot] = &part;
        origin[slot] = i;
    }
    for (unsigned k = 0; k < first.shard.count; ++k) {
        if (by_shard[k] == nullptr) {
            throw UsageError("shard " + ShardSpec{k + 1, first.shard.count}.text() +
                             " is missing (give all " + std::to_string(first.shard.count) +
                             " parts)");
        }
    }

    MergedReplay merged;
    merged.replay.history = first.history;
    merged.scope = first.scope;
    std::set<std::string> blobs;
    for (const ReplayPart* part : by_shard) {
        for (const auto& rc : part->replay.commits) {
            merged.replay.commits.push_back(rc);
        }
        for (const auto& note : part->replay.notes) {
            merged.replay.notes.push_back(note);
        }
        merged.cache.visits += part->cache.visits;
        merged.cache.hits += part->cache.hits;
        merged.cache.parses += part->cache.parses;
        merged.cache.damaged += part->cache.damaged;
        merged.cache.write_failures += part->cache.write_failures;
        blobs.insert(part->blobs.begin(), part->blobs.end());
        merged.seconds += part->seconds;
        merged.threads += part->threads;
    }
    merged.cache.distinct_blobs = blobs.size();
    merged.replay.end = ReplayEnd::complete;
    return merged;
}

} // namespace tollgate::calibrate
