// SPDX-License-Identifier: MIT
// The shared parse context of one revision: headers, include folders, compile database flags.
#include "gate/common/errors.hpp"
#include "gate/isolate/path_guard.hpp"
#include "gate/lexer/include_aliases.hpp"
#include "gate/lexer/lexer.hpp"

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <set>
#include <spdlog/spdlog.h>

namespace tollgate::lexer {

namespace {

namespace fs = std::filesystem;

// Split a shell command line into words (quotes and backslashes as a POSIX shell reads them).
std::vector<std::string> split_command(const std::string& command) {
    std::vector<std::string> words;
    std::string word;
    bool in_word = false;
    char quote = 0;
    for (std::size_t i = 0; i < command.size(); ++i) {
        const char c = command[i];
        if (quote != 0) {
            if (c == quote) {
                quote = 0;
            } else if (c == '\\' && quote == '"' && i + 1 < command.size()) {
                word += command[++i];
            } else {
                word += c;
            }
        } else if (c == '\'' || c == '"') {
            quote = c;
            in_word = true;
        } else if (c == '\\' && i + 1 < command.size()) {
            word += command[++i];
            in_word = true;
        } else if (std::isspace(static_cast<unsigned char>(c)) != 0) {
            if (in_word) {
                words.push_back(word);
                word.clear();
                in_word = false;
            }
        } else {
            word += c;
            in_word = true;
        }
    }
    if (in_word) {
        words.push_back(word);
    }
    return words;
}

// Return `path` relative to `root` with '/' separators, or nothing when it lies outside.
std::optional<std::string> inside(const fs::path& path, const fs::path& root) {
    if (root.empty()) {
        return std::nullopt;
    }
    const fs::path relative = path.lexically_normal().lexically_relative(root.lexically_normal());
    const std::string text = relative.generic_string();
    if (relative.empty() || text == ".." || text.rfind("../", 0) == 0) {
        return std::nullopt;
    }
    return text == "." ? std::string() : text;
}

// What the flags of one compile command may name outside the repository.
struct HostPaths {
    DatabaseOrigin origin = DatabaseOrigin::found;
    std::vector<std::string> system_roots;         // system include folders (always allowed)
    std::set<std::string>* trusted_dirs = nullptr; // collects the host paths a given database names
};

bool under_root(const std::string& path, const std::vector<std::string>& roots) {
    for (const std::string& root : roots) {
        if (path == root || path.rfind(root + "/", 0) == 0) {
            return true;
        }
    }
    return false;
}

// Map a path flag's value: inside the repository it moves to the virtual root; outside it stays a
// host path when the database is trusted or the path is a system folder, else it is dropped.
std::optional<std::string> map_path(const std::string& value, const fs::path& directory,
                                    const fs::path& root, const HostPaths& host) {
    fs::path path(value);
    if (path.is_relative()) {
        path = directory / path;
    }
    if (auto relative = inside(path, root)) {
        return std::string(k_virtual_root) + *relative;
    }
    const std::string host_path = path.lexically_normal().string();
    if (under_root(host_path, host.system_roots)) {
        return host_path;
    }
    if (host.origin == DatabaseOrigin::given) {
        host.trusted_dirs->insert(host_path);
        return host_path;
    }
    spdlog::debug("compile database found in the working tree names \"{}\" outside the "
                  "repository: left out (pass it with --compile-commands to trust it)",
                  host_path);
    return std::nullopt;
}

std::vector<std::string> kept_flags(const std::vector<std::string>& words,
                                    const fs::path& directory, const fs::path& root,
                                    const HostPaths& host) {
    std::vector<std::string> flags;
    static const std::vector<std::string> k_path_flags = {"-I", "-isystem", "-include", "-iquote"};
    for (std::size_t i = 0; i < words.size(); ++i) {
        const std::string& word = words[i];
        if (word.rfind("-std=", 0) == 0) {
            flags.push_back(word);
            continue;
        }
        if (word == "-D" || word == "-U") {
            if (i + 1 < words.size()) {
                flags.push_back(word + words[++i]);
            }
            continue;
        }
        if (word.rfind("-D", 0) == 0 || word.rfind("-U", 0) == 0) {
            flags.push_back(word);
            continue;
        }
        for (const std::string& flag : k_path_flags) {
            if (word == flag) {
                if (i + 1 < words.size()) {
                    if (auto mapped = map_path(words[++i], directory, root, host)) {
                        flags.push_back(flag);
                        flags.push_back(*mapped);
                    }
                }
                break;
            }
            if (flag == "-I" && word.rfind(flag, 0) == 0) {
                if (auto mapped = map_path(word.substr(2), directory, root, host)) {
                    flags.push_back("-I" + *mapped);
                }
                break;
            }
        }
    }
    return flags;
}

} // namespace

std::optional<Language> language_for_path(const std::string& path, std::optional<Language> force) {
    if (force) {
        return force;
    }
    const std::string ext = lower_extension(path);
    if (ext == ".c") {
        return Language::c;
    }
    if (is_c_family_path(path)) {
        return Language::cxx;
    }
    return std::nullopt;
}

ParseContext make_parse_context(const std::vector<SourceFile>& files,
                                const std::string& compile_commands_json,
                                const std::string& repository_root, DatabaseOrigin origin) {
    ParseContext context;
    std::set<std::string> include_dirs = {""};
    for (const SourceFile& file : files) {
        if (is_header_path(file.path)) {
            context.headers.push_back(file);
        }
        // Every folder whose last component is include/, at any depth.
        std::string::size_type slash = file.path.find('/');
        while (slash != std::string::npos) {
            const std::string folder = file.path.substr(0, slash);
            const auto last = folder.find_last_of('/');
            const std::string name = last == std::string::npos ? folder : folder.substr(last + 1);
            if (name == "include") {
                include_dirs.insert(folder);
            }
            slash = file.path.find('/', slash + 1);
        }
    }
    context.include_dirs.assign(include_dirs.begin(), include_dirs.end());
    for (SourceFile& alias : parent_include_aliases(files, context.headers, context.include_dirs)) {
        context.headers.push_back(std::move(alias));
    }
    if (compile_commands_json.empty()) {
        return context;
    }
    nlohmann::json database;
    try {
        database = nlohmann::json::parse(compile_commands_json);
    } catch (const nlohmann::json::exception& error) {
        throw UsageError(std::string("compile_commands.json is not valid json: ") + error.what() +
                         " (regenerate it with your build tool)");
    }
    if (!database.is_array()) {
        throw UsageError("compile_commands.json is not a list of entries (regenerate it with "
                         "your build tool)");
    }
    const fs::path root(repository_root);
    std::set<std::string> trusted;
    HostPaths host;
    host.origin = origin;
    host.system_roots = isolate::system_include_roots();
    host.trusted_dirs = &trusted;
    for (const auto& entry : database) {
        if (!entry.is_object() || !entry.contains("file") || !entry["file"].is_string()) {
            continue;
        }
        const fs::path directory(entry.value("directory", std::string()));
        fs::path file(entry["file"].get<std::string>());
        if (file.is_relative()) {
            file = directory / file;
        }
        const auto relative = inside(file, root);
        if (!relative) {
            continue;
        }
        std::vector<std::string> words;
        if (entry.contains("arguments") && entry["arguments"].is_array()) {
            for (const auto& word : entry["arguments"]) {
                if (word.is_string()) {
                    words.push_back(word.get<std::string>());
                }
            }
        } else if (entry.contains("command") && entry["command"].is_string()) {
            words = split_command(entry["command"].get<std::string>());
        }
        context.file_flags[*relative] = kept_flags(words, directory, root, host);
    }
    context.trusted_dirs.assign(trusted.begin(), trusted.end());
    return context;
}

namespace {

// Number of leading '/'-separated components `a` and `b` share.
std::size_t shared_components(const std::string& a, const std::string& b) {
    std::size_t shared = 0;
    std::size_t i = 0;
    while (i < a.size() && i < b.size()) {
        const std::size_t next_a = a.find('/', i);
        const std::size_t next_b = b.find('/', i);
        const std::size_t end_a = next_a == std::string::npos ? a.size() : next_a;
        const std::size_t end_b = next_b == std::string::npos ? b.size() : next_b;
        if (end_a != end_b || a.compare(i, end_a - i, b, i, end_b - i) != 0) {
            break;
        }
        ++shared;
        i = end_a + 1;
    }
    return shared;
}

std::string folder_of(const std::string& path) {
    const auto slash = path.rfind('/');
    return slash == std::string::npos ? std::string() : path.substr(0, slash);
}

} // namespace

const std::vector<std::string>* flags_for(const ParseContext& context, const std::string& path) {
    if (const auto own = context.file_flags.find(path); own != context.file_flags.end()) {
        return &own->second;
    }
    const auto language = language_for_path(path, context.force_language);
    const std::string folder = folder_of(path);
    const std::vector<std::string>* best = nullptr;
    std::size_t best_shared = 0;
    // The map is ordered, so ties go to the first path: the choice is deterministic.
    for (const auto& [candidate, flags] : context.file_flags) {
        if (language_for_path(candidate, context.force_language) != language) {
            continue;
        }
        const std::size_t shared = shared_components(folder, folder_of(candidate));
        if (best == nullptr || shared > best_shared) {
            best = &flags;
            best_shared = shared;
        }
    }
    return best;
}

void add_include_dirs(ParseContext& context, const std::vector<SourceFile>& files,
                      const std::vector<std::string>& folders) {
    if (folders.empty()) {
        return;
    }
    std::vector<std::string> flags;
    for (const std::string& folder : folders) {
        flags.push_back("-I" + folder);
        // A folder on disk was named by whoever runs Tollgate, never by the change: the parser
        // process may read it.
        if (folder.rfind(k_virtual_root, 0) != 0 &&
            std::find(context.trusted_dirs.begin(), context.trusted_dirs.end(), folder) ==
                context.trusted_dirs.end()) {
            context.trusted_dirs.push_back(folder);
        }
    }
    // Decide for every file first: an entry added here must not lend its flags to another file.
    std::vector<std::string> uncovered;
    for (const SourceFile& file : files) {
        if (flags_for(context, file.path) == nullptr) {
            uncovered.push_back(file.path);
        }
    }
    for (const std::string& path : uncovered) {
        context.file_flags[path] = flags;
    }
}

} // namespace tollgate::lexer
