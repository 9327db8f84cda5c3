// SPDX-License-Identifier: MIT
// Snapshot files, read strictly: every defect named with its place and the command that fixes it.
#include "gate/baseline/snapshot_file.hpp"
#include "gate/baseline/snapshot_text.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/text_safety.hpp"
#include "tollgate/core/counts.hpp"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <sstream>

namespace fs = std::filesystem;

namespace tollgate::baseline {

using namespace snapshot_text;

namespace {

// Return whether `text` has the form "YYYY-MM-DDTHH:MM:SSZ".
bool is_utc_time(const std::string& text) {
    const std::string form = "dddd-dd-ddTdd:dd:ddZ";
    if (text.size() != form.size()) {
        return false;
    }
    for (std::size_t i = 0; i < form.size(); ++i) {
        const bool digit = text[i] >= '0' && text[i] <= '9';
        if (form[i] == 'd' ? !digit : text[i] != form[i]) {
            return false;
        }
    }
    return true;
}

// A snapshot file that is damaged or not ours: where, what, and what to do.
struct SnapshotDefect {
    std::string location; // "PATH" or "PATH:LINE:COL"
    std::string what;     // e.g. "truncated snapshot: the file is empty"
    std::string remedy;   // e.g. "rebuild it: tollgate snapshot --out PATH"

    std::string message() const { return location + ": " + what + " (" + remedy + ")"; }
};

class SnapshotReader {
public:
    SnapshotReader(const std::string& display_path, const SnapshotExpectations& expectations)
        : m_path(display_path), m_expectations(expectations) {}

    Snapshot read(const std::string& text) {
        if (text.find_first_not_of(" \t\r\n") == std::string::npos) {
            throw defect(m_path, "truncated snapshot: the file is empty");
        }
        Json document;
        try {
            document = Json::parse(text);
        } catch (const Json::parse_error& e) {
            if (e.byte > text.size()) {
                throw defect(m_path,
                             fmt::format("truncated snapshot: the JSON ends after {} bytes before "
                                         "the document is complete",
                                         text.size()));
            }
            if (text[text.find_first_not_of(" \t\r\n")] != '{') {
                throw SnapshotDefect{m_path,
                                     "not a tollgate snapshot: the file is not a JSON object",
                                     foreign_remedy()};
            }
            throw defect(location_of(text, e.byte), "corrupted snapshot: invalid JSON");
        }
        check_schema(document);
        if (const auto commit = document.find("commit");
            commit != document.end() && commit->is_string()) {
            m_short_commit = commit->get<std::string>().substr(0, 7);
        }
        check_schema_version(document);

        Snapshot snapshot;
        snapshot.schema_version = k_snapshot_schema_version;
        snapshot.tool_version = string_at(document, "tool_version", "");
        snapshot.convention = string_at(document, "convention", "");
        snapshot.stroud = number_at(document, "stroud", "");
        snapshot.commit = string_at(document, "commit", "");
        if (snapshot.commit.size() != 40 ||
            snapshot.commit.find_first_not_of("0123456789abcdef") != std::string::npos) {
            throw corrupted("/commit: expected a 40-digit hexadecimal commit id, found \"" +
                            snapshot.commit + "\"");
        }
        snapshot.created = string_at(document, "created", "");
        if (!is_utc_time(snapshot.created)) {
            throw corrupted("/created: expected a UTC time \"YYYY-MM-DDTHH:MM:SSZ\", found \"" +
                            snapshot.created + "\"");
        }
        const std::uint64_t count = unsigned_at(document, "function_count", "");
        const std::string recorded_digest = string_at(document, "content_digest", "");
        const Json& functions = member(document, "functions", "");
        if (!functions.is_array()) {
            throw corrupted(ill_typed("/functions", "an array", functions));
        }
        if (functions.size() != count) {
            throw corrupted(fmt::format("\"function_count\" is {} but {} functions follow", count,
                                        functions.size()));
        }
        snapshot.functions.reserve(functions.size());
        for (std::size_t i = 0; i < functions.size(); ++i) {
            snapshot.functions.push_back(
                read_function(functions[i], "/functions/" + std::to_string(i)));
            if (i > 0 && !snapshot_order(snapshot.functions[i - 1], snapshot.functions[i])) {
                throw corrupted(fmt::format("/functions/{}: out of order or repeated (functions "
                                            "are sorted by file, start line and fallback key)",
                                            i));
            }
        }
        // Last, so that a damaged key is named above; this catches what stays well-formed.
        if (content_digest(document) != recorded_digest) {
            throw corrupted("the content does not match \"content_digest\", the file was edited or "
                            "damaged");
        }
        check_expectations(snapshot);
        check_measures_follow_counts(snapshot);
        return snapshot;
    }

private:
    SnapshotDefect defect(const std::string& location, const std::string& what) const {
        return {location, what, "rebuild it: " + rebuild_command()};
    }

    SnapshotDefect corrupted(const std::string& what) const {
        return defect(m_path, "corrupted snapshot: " + what);
    }

    std::string rebuild_command() const {
        std::string command = "tollgate snapshot";
        if (!m_short_commit.empty()) {
            command += " --rev " + m_short_commit;
        }
        command += " --out " + shell_word(m_path);
        if (m_expectations.stroud && *m_expectations.stroud != core::MeasureSettings{}.stroud) {
            command += " --stroud " + format_stroud(*m_expectations.stroud);
        }
        return command;
    }

    std::string foreign_remedy() const {
        return "check the path; tollgate snapshot --out " + shell_word(m_path) +
               " --force replaces it";
    }

    std::string location_of(const std::string& text, std::size_t byte) const {
        // nlohmann counts the byte it stopped at from 1.
        const std::size_t end = std::min(byte > 0 ? byte - 1 : 0, text.size());
        std::size_t line = 1, column = 1;
        for (std::size_t i = 0; i < end; ++i) {
            if (text[i] == '\n') {
                ++line;
                column = 1;
            } else {
                ++column;
            }
        }
        return fmt::format("{}:{}:{}", m_path, line, column);
    }

    void check_schema(const Json& document) const {
        const std::string expected = schema_text(k_snapshot_schema_version);
        const std::string remedy = "check the path; tollgate snapshot --out " + shell_word(m_path) +
                                   " --force replaces it";
        if (!document.is_object()) {
            throw SnapshotDefect{m_path,
                                 std::string("not a tollgate snapshot: the JSON is ") +
                                     article(document) +
                                     ", expected an object with \"schema\": \"" + expected + "\"",
                                 remedy};
        }
        if (!document.contains("schema")) {
            throw SnapshotDefect{m_path,
                                 "not a tollgate snapshot: it has no \"schema\" key, expected \"" +
                                     expected + "\"",
                                 remedy};
        }
        const Json& schema = document["schema"];
        const std::string prefix = std::string(k_snapshot_schema_name) + "/";
        if (!schema.is_string() || schema.get<std::string>().rfind(prefix, 0) != 0) {
            throw SnapshotDefect{m_path,
                                 "not a tollgate snapshot: its schema is " + dump(schema, -1) +
                                     ", expected \"" + expected + "\"",
                                 remedy};
        }
    }

    void check_schema_version(const Json& document) const {
        const std::string schema = document["schema"].get<std::string>();
        const std::string number = schema.substr(std::string(k_snapshot_schema_name).size() + 1);
        if (number.empty() || number.size() > 6 ||
            number.find_first_not_of("0123456789") != std::string::npos) {
            throw corrupted("/schema: expected \"" + schema_text(k_snapshot_schema_version) +
                            "\", found \"" + schema + "\"");
        }
        const int version = std::stoi(number);
        if (version != k_snapshot_schema_version) {
            throw UsageError(fmt::format("{} was written with snapshot schema version {}, this "
                                         "tollgate {} reads version {} (rebuild it: {})",
                                         m_path, version, TOLLGATE_VERSION,
                                         k_snapshot_schema_version, rebuild_command()));
        }
    }

    void check_expectations(const Snapshot& snapshot) const {
        if (m_expectations.convention && snapshot.convention != *m_expectations.convention) {
            throw UsageError(fmt::format("{} was measured under convention \"{}\", this run "
                                         "counts \"{}\" (rebuild it: {})",
                                         m_path, snapshot.convention, *m_expectations.convention,
                                         rebuild_command()));
        }
        if (m_expectations.stroud && snapshot.stroud != *m_expectations.stroud) {
            throw UsageError(fmt::format("{} was measured with Stroud number {}, this run uses {} "
                                         "(rebuild it: {})",
                                         m_path, format_stroud(snapshot.stroud),
                                         format_stroud(*m_expectations.stroud), rebuild_command()));
        }
    }

    // The digest can be recomputed by anyone, so it does not show a forged measure: refuse a
    // snapshot whose stored measures are not the ones its own counts give. Counts are exact;
    // derived measures may differ in the last bits between two builds of the math library.
    void check_measures_follow_counts(const Snapshot& snapshot) const {
        core::MeasureSettings settings;
        settings.stroud = snapshot.stroud;
        for (std::size_t i = 0; i < snapshot.functions.size(); ++i) {
            const core::Measures& stored = snapshot.functions[i].measures;
            const core::Measures expected = core::compute_measures(
                core::counts_from_totals(stored.n1, stored.n2, stored.N1, stored.N2),
                stored.potential_operands, settings);
            for (const auto id : core::k_all_measures) {
                const double have = core::measure_value(stored, id);
                const double want = core::measure_value(expected, id);
                const bool close =
                    have == want ||
                    std::fabs(have - want) <= 1e-9 * std::max(std::fabs(have), std::fabs(want));
                if (!close) {
                    throw corrupted(fmt::format(
                        "/functions/{}/measures/{}: {} does not follow from the function's "
                        "counts (n1 {} n2 {} N1 {} N2 {} give {})",
                        i, core::measure_name(id), have, stored.n1, stored.n2, stored.N1, stored.N2,
                        want));
                }
            }
        }
    }

    SnapshotFunction read_function(const Json& object, const std::string& pointer) const {
        if (!object.is_object()) {
            throw corrupted(ill_typed(pointer, "an object", object));
        }
        SnapshotFunction f;
        f.path = string_at(object, "file", pointer);
        f.start_line = static_cast<unsigned>(unsigned_at(object, "start_line", pointer));
        f.end_line = static_cast<unsigned>(unsigned_at(object, "end_line", pointer));
        f.usr = string_at(object, "usr", pointer);
        f.fallback_key = string_at(object, "fallback_key", pointer);
        f.qualified_name = string_at(object, "function", pointer);
        f.signature = string_at(object, "signature", pointer);
        const std::string extent = string_at(object, "extent", pointer);
        if (extent == "lexical") {
            f.mode = lexer::ExtentMode::lexical;
        } else if (extent == "parser-stopped") {
            f.mode = lexer::ExtentMode::parser_stopped;
        } else if (extent != "syntax-tree") {
            throw corrupted(pointer + "/extent: expected \"syntax-tree\", \"lexical\" or " +
                            "\"parser-stopped\", found \"" + extent + "\"");
        }
        f.token_hash = string_at(object, "token_hash", pointer);
        read_marks(object, pointer, f);
        const Json& counts = member(object, "counts", pointer);
        const std::string counts_pointer = pointer + "/counts";
        if (!counts.is_object()) {
            throw corrupted(ill_typed(counts_pointer, "an object", counts));
        }
        f.measures.n1 = unsigned_at(counts, "n1", counts_pointer);
        f.measures.n2 = unsigned_at(counts, "n2", counts_pointer);
        f.measures.N1 = unsigned_at(counts, "N1", counts_pointer);
        f.measures.N2 = unsigned_at(counts, "N2", counts_pointer);
        f.measures.potential_operands = unsigned_at(object, "potential_operands", pointer);
        const Json& measures = member(object, "measures", pointer);
        const std::string measures_pointer = pointer + "/measures";
        if (!measures.is_object()) {
            throw corrupted(ill_typed(measures_pointer, "an object", measures));
        }
        for (const auto id : core::k_all_measures) {
            const std::string name(core::measure_name(id));
            const double value = number_at(measures, name.c_str(), measures_pointer);
            set_measure(f.measures, id, value);
        }
        read_exact(object, pointer, f);
        return f;
    }

    // Read the optional "marks": "inactive" and "brace-extent".
    void read_marks(const Json& object, const std::string& pointer, SnapshotFunction& f) const {
        const auto it = object.find("marks");
        if (it == object.end()) {
            return;
        }
        if (!it->is_array()) {
            throw corrupted(ill_typed(pointer + "/marks", "an array", *it));
        }
        for (const Json& mark : *it) {
            if (mark == "inactive") {
                f.inactive = true;
            } else if (mark == "brace-extent") {
                f.brace_extent = true;
            } else {
                throw corrupted(pointer +
                                "/marks: expected only \"inactive\" and \"brace-extent\"");
            }
        }
    }

    // Take the exact bytes of text keys that are not valid UTF-8 from "exact", checking that
    // each shows as the key's own text does.
    void read_exact(const Json& object, const std::string& pointer, SnapshotFunction& f) const {
        const auto it = object.find("exact");
        if (it == object.end()) {
            return;
        }
        const std::string exact_pointer = pointer + "/exact";
        if (!it->is_object()) {
            throw corrupted(ill_typed(exact_pointer, "an object", *it));
        }
        for (const auto& [key, value] : it->items()) {
            const auto known =
                std::find_if(std::begin(k_text_keys), std::end(k_text_keys),
                             [&key = key](const auto& entry) { return key == entry.first; });
            if (known == std::end(k_text_keys)) {
                throw corrupted(exact_pointer + ": unknown key \"" + key + "\"");
            }
            const std::string stored = string_at(*it, key.c_str(), exact_pointer);
            const auto bytes = ::tollgate::text::unstore_bytes(stored);
            if (!bytes) {
                throw corrupted(exact_pointer + "/" + key + ": not a stored byte string");
            }
            std::string& field = f.*(known->second);
            if (::tollgate::text::to_valid_utf8(*bytes) != field) {
                throw corrupted(exact_pointer + "/" + key + ": does not match " + pointer + "/" +
                                key);
            }
            field = *bytes;
        }
    }

    static void set_measure(core::Measures& m, core::MeasureId id, double value) {
        using core::MeasureId;
        const auto whole = static_cast<std::uint64_t>(value);
        switch (id) {
        case MeasureId::n1:
            m.n1 = whole;
            break;
        case MeasureId::n2:
            m.n2 = whole;
            break;
        case MeasureId::N1:
            m.N1 = whole;
            break;
        case MeasureId::N2:
            m.N2 = whole;
            break;
        case MeasureId::length:
            m.length = whole;
            break;
        case MeasureId::vocabulary:
            m.vocabulary = whole;
            break;
        case MeasureId::estimated_length:
            m.estimated_length = value;
            break;
        case MeasureId::volume:
            m.volume = value;
            break;
        case MeasureId::difficulty:
            m.difficulty = value;
            break;
        case MeasureId::level:
            m.level = value;
            break;
        case MeasureId::effort:
            m.effort = value;
            break;
        case MeasureId::time:
            m.time = value;
            break;
        case MeasureId::bugs_volume:
            m.bugs_volume = value;
            break;
        case MeasureId::bugs_effort:
            m.bugs_effort = value;
            break;
        case MeasureId::potential_volume:
            m.potential_volume = value;
            break;
        case MeasureId::volume_ratio:
            m.volume_ratio = value;
            break;
        }
    }

    static const char* article(const Json& value) {
        switch (value.type()) {
        case Json::value_t::null:
            return "null";
        case Json::value_t::object:
            return "an object";
        case Json::value_t::array:
            return "an array";
        case Json::value_t::string:
            return "a string";
        case Json::value_t::boolean:
            return "a boolean";
        case Json::value_t::binary:
            return "binary data";
        case Json::value_t::discarded:
            return "nothing";
        default:
            return "a number";
        }
    }

    static std::string ill_typed(const std::string& pointer, const char* expected,
                                 const Json& found) {
        return pointer + ": expected " + expected + ", found " + article(found);
    }

    const Json& member(const Json& object, const char* key, const std::string& pointer) const {
        const auto it = object.find(key);
        if (it == object.end()) {
            throw corrupted(pointer + "/" + key + ": missing");
        }
        return *it;
    }

    std::string string_at(const Json& object, const char* key, const std::string& pointer) const {
        const Json& value = member(object, key, pointer);
        if (!value.is_string()) {
            throw corrupted(ill_typed(pointer + "/" + key, "a string", value));
        }
        return value.get<std::string>();
    }

    std::uint64_t unsigned_at(const Json& object, const char* key,
                              const std::string& pointer) const {
        const Json& value = member(object, key, pointer);
        if (!value.is_number_unsigned()) {
            throw corrupted(ill_typed(pointer + "/" + key, "an unsigned integer", value));
        }
        return value.get<std::uint64_t>();
    }

    double number_at(const Json& object, const char* key, const std::string& pointer) const {
        const Json& value = member(object, key, pointer);
        if (!value.is_number()) {
            throw corrupted(ill_typed(pointer + "/" + key, "a number", value));
        }
        return value.get<double>();
    }

    std::string m_path;
    SnapshotExpectations m_expectations;
    std::string m_short_commit; // of the snapshot, once known: for the rebuild command
};

// Read the whole file, or throw UsageError naming it.
std::string read_file(const std::string& path) {
    std::error_code ec;
    if (fs::is_directory(path, ec)) {
        throw UsageError("cannot read snapshot \"" + path + "\": it is a folder");
    }
    std::ifstream in(path, std::ios::binary);
    if (!in) {
        const int error = errno;
        if (error == ENOENT) {
            throw UsageError("cannot read snapshot \"" + path +
                             "\": no such file (write one: tollgate snapshot --out " +
                             shell_word(path) + ")");
        }
        throw UsageError("cannot read snapshot \"" + path + "\": " + lowercase_error(error));
    }
    std::ostringstream buffer;
    buffer << in.rdbuf();
    if (in.bad()) {
        throw UsageError("cannot read snapshot \"" + path + "\": " + lowercase_error(errno));
    }
    return buffer.str();
}

} // namespace

Snapshot parse_snapshot(const std::string& text, const std::string& display_path,
                        const SnapshotExpectations& expectations) {
    try {
        return SnapshotReader(display_path, expectations).read(text);
    } catch (const SnapshotDefect& defect) {
        throw UsageError(defect.message());
    }
}

Snapshot load_snapshot(const std::string& path, const SnapshotExpectations& expectations) {
    return parse_snapshot(read_file(path), path, expectations);
}

std::optional<std::string> foreign_file_reason(const std::string& path) {
    std::error_code ec;
    const auto status = fs::status(path, ec);
    if (!fs::exists(status)) {
        return std::nullopt;
    }
    if (fs::is_directory(status)) {
        return std::string("it is a folder");
    }
    std::string text;
    try {
        text = read_file(path);
    } catch (const UsageError& e) {
        return std::string(e.what());
    }
    try {
        SnapshotReader(path, {}).read(text);
    } catch (const SnapshotDefect& defect) {
        return defect.what;
    } catch (const UsageError&) {
        // Another schema version: still one of ours, replaced like any snapshot.
    }
    return std::nullopt;
}

} // namespace tollgate::baseline
