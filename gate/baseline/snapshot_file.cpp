// SPDX-License-Identifier: MIT
// Snapshot files, written: the JSON text, atomic replacement, path confinement.
#include "gate/baseline/snapshot_file.hpp"

#include "gate/baseline/snapshot_text.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/text_safety.hpp"

#include <cerrno>
#include <chrono>
#include <cstdlib>
#include <fcntl.h>
#include <filesystem>
#include <signal.h>
#include <sys/stat.h>
#include <thread>
#include <unistd.h>

namespace fs = std::filesystem;

namespace tollgate::baseline {

using namespace snapshot_text;

namespace {

constexpr const char* k_temp_marker = ".tollgate-tmp-";

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

// Remove temporary files of `target`'s pattern whose writer no longer runs.
void remove_stale_temporaries(const fs::path& folder, const std::string& name) {
    const std::string prefix = "." + name + k_temp_marker;
    std::error_code ec;
    for (fs::directory_iterator it(folder, ec), end; !ec && it != end; it.increment(ec)) {
        const std::string entry = it->path().filename().string();
        if (entry.rfind(prefix, 0) != 0) {
            continue;
        }
        const std::string rest = entry.substr(prefix.size());
        const std::size_t dash = rest.find('-');
        if (dash == 0 || dash == std::string::npos ||
            rest.find_first_not_of("0123456789") != dash) {
            continue;
        }
        const long pid = std::strtol(rest.substr(0, dash).c_str(), nullptr, 10);
        if (pid == static_cast<long>(getpid())) {
            continue;
        }
        if (kill(static_cast<pid_t>(pid), 0) == -1 && errno == ESRCH) {
            std::error_code remove_error;
            fs::remove(it->path(), remove_error);
        }
    }
}

[[noreturn]] void write_failure(const std::string& path, int error) {
    throw Failure("cannot write snapshot \"" + path + "\": " + lowercase_error(error));
}

// Sleep when the test hook asks for it (see k_pause_before_rename_variable).
void pause_for_tests() {
    const char* seconds = std::getenv(k_pause_before_rename_variable);
    if (seconds != nullptr && *seconds != '\0') {
        std::this_thread::sleep_for(std::chrono::duration<double>(std::strtod(seconds, nullptr)));
    }
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
    std::error_code ec;
    if (fs::is_directory(path, ec)) {
        throw UsageError("cannot write snapshot \"" + path + "\": it is a folder");
    }
    // Write beside the file the path finally names, so the rename stays on one file system.
    const fs::path target = fs::weakly_canonical(fs::absolute(path));
    const fs::path folder = target.parent_path();
    fs::create_directories(folder, ec);
    if (ec) {
        throw Failure("cannot create folder \"" + folder.string() + "\": " + ec.message());
    }
    const std::string name = target.filename().string();
    remove_stale_temporaries(folder, name);

    const std::string text = snapshot_to_json(snapshot);
    std::string temporary =
        (folder / ("." + name + k_temp_marker + std::to_string(getpid()) + "-XXXXXX")).string();
    const int fd = mkstemp(temporary.data());
    if (fd == -1) {
        write_failure(path, errno);
    }
    auto fail = [&](int error) {
        close(fd);
        unlink(temporary.c_str());
        write_failure(path, error);
    };
    for (std::size_t written = 0; written < text.size();) {
        const ssize_t n = write(fd, text.data() + written, text.size() - written);
        if (n < 0) {
            if (errno == EINTR) {
                continue;
            }
            fail(errno);
        }
        written += static_cast<std::size_t>(n);
    }
    const mode_t mask = umask(0);
    umask(mask);
    if (fchmod(fd, 0666 & ~mask) != 0 || fsync(fd) != 0) {
        fail(errno);
    }
    if (close(fd) != 0) {
        const int error = errno;
        unlink(temporary.c_str());
        write_failure(path, error);
    }
    pause_for_tests();
    if (std::rename(temporary.c_str(), target.c_str()) != 0) {
        const int error = errno;
        unlink(temporary.c_str());
        write_failure(path, error);
    }
    // Make the rename itself durable.
    const int folder_fd = open(folder.c_str(), O_RDONLY | O_DIRECTORY);
    if (folder_fd != -1) {
        fsync(folder_fd);
        close(folder_fd);
    }
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
