// SPDX-License-Identifier: MIT
// Reading the files a command measures, from git or from disk.
#include "gate/cli/sources.hpp"

#include "gate/common/disk_file.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/input_file.hpp"
#include "gate/walker/repository.hpp"

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <spdlog/spdlog.h>
#include <sstream>

namespace fs = std::filesystem;

namespace tollgate {

namespace {

// Return `path` relative to `root` with '/' separators, or nothing when it lies outside.
std::optional<std::string> relative_inside(const fs::path& path, const fs::path& root) {
    const fs::path absolute = fs::weakly_canonical(fs::absolute(path));
    const fs::path base = fs::weakly_canonical(root);
    const fs::path relative = absolute.lexically_relative(base);
    if (relative.empty() || *relative.begin() == "..") {
        return std::nullopt;
    }
    std::string text = relative.generic_string();
    return text == "." ? std::string() : text;
}

// Every C/C++ and Java file under `root` (skipping hidden folders and build folders), from disk;
// files over `limit` are listed there instead of read.
std::vector<SourceFile> read_disk_tree(const fs::path& root, const SizeLimit& limit) {
    std::vector<SourceFile> files;
    std::error_code ec;
    fs::recursive_directory_iterator it(root, fs::directory_options::skip_permission_denied, ec);
    for (; !ec && it != fs::recursive_directory_iterator(); it.increment(ec)) {
        const fs::path& p = it->path();
        const std::string name = p.filename().string();
        if (it->is_directory() && (name.rfind('.', 0) == 0 || name.rfind("build", 0) == 0)) {
            it.disable_recursion_pending();
            continue;
        }
        if (!is_measured_path(name) || it->is_directory()) {
            continue;
        }
        // Never follow a symlink or open a FIFO or device named like a source file.
        DiskFile file = read_regular_file(p.string(), limit.max_bytes);
        if (file.entry == DiskEntry::unreadable) {
            throw UsageError("cannot read \"" + p.string() + "\"");
        }
        if (file.entry == DiskEntry::oversized) {
            limit.oversized->push_back({p.lexically_relative(root).generic_string(), file.size});
            continue;
        }
        if (file.entry != DiskEntry::regular) {
            if (file.entry != DiskEntry::missing) {
                spdlog::warn("skipped \"{}\": {}", p.lexically_relative(root).generic_string(),
                             disk_entry_text(file.entry));
            }
            continue;
        }
        files.push_back({p.lexically_relative(root).generic_string(), std::move(file.content)});
    }
    std::sort(files.begin(), files.end(),
              [](const SourceFile& a, const SourceFile& b) { return a.path < b.path; });
    return files;
}

// Return true when `path` is `wanted` or lies under the folder `wanted` ("" is the root).
bool selects(const std::string& wanted, const std::string& path) {
    return path == wanted || wanted.empty() ||
           (path.size() > wanted.size() && path.compare(0, wanted.size(), wanted) == 0 &&
            path[wanted.size()] == '/');
}

// Keep the files of `all` that `paths` select (a file, or every file under a folder), and in
// `oversized` only the files left unread that they select.
std::vector<SourceFile> select_files(const std::vector<SourceFile>& all,
                                     std::vector<OversizedFile>& oversized,
                                     const std::vector<std::string>& relative_paths,
                                     const std::vector<std::string>& as_given) {
    if (relative_paths.empty()) {
        return all;
    }
    std::vector<SourceFile> selected;
    std::vector<OversizedFile> selected_oversized;
    for (std::size_t i = 0; i < relative_paths.size(); ++i) {
        const std::string& wanted = relative_paths[i];
        bool found = false;
        for (const auto& file : all) {
            if (selects(wanted, file.path)) {
                found = true;
                selected.push_back(file);
            }
        }
        for (const auto& file : oversized) {
            if (selects(wanted, file.path)) {
                found = true;
                selected_oversized.push_back(file);
            }
        }
        if (!found) {
            throw UsageError("no C, C++ or Java file at \"" + as_given[i] +
                             "\" (give a .c, .cc, .cpp, .cxx, .c++, header or .java file, or a "
                             "folder)");
        }
    }
    std::sort(selected.begin(), selected.end(),
              [](const SourceFile& a, const SourceFile& b) { return a.path < b.path; });
    selected.erase(
        std::unique(selected.begin(), selected.end(),
                    [](const SourceFile& a, const SourceFile& b) { return a.path == b.path; }),
        selected.end());
    std::sort(selected_oversized.begin(), selected_oversized.end(),
              [](const OversizedFile& a, const OversizedFile& b) { return a.path < b.path; });
    selected_oversized.erase(std::unique(selected_oversized.begin(), selected_oversized.end()),
                             selected_oversized.end());
    oversized = std::move(selected_oversized);
    return selected;
}

// Read a compile database found in the working tree, which may be the change under review: a
// symlink or FIFO there is not followed. Return nothing when there is none to read.
std::optional<std::string> read_found_database(const fs::path& path) {
    DiskFile file = read_regular_file(path.string());
    if (file.entry == DiskEntry::regular) {
        spdlog::debug("using compile database {}", path.string());
        return std::move(file.content);
    }
    if (file.entry != DiskEntry::missing) {
        spdlog::warn("compile database \"{}\" left out: {}", path.string(),
                     disk_entry_text(file.entry));
    }
    return std::nullopt;
}

} // namespace

std::string read_compile_commands(const std::string& given, const std::string& root) {
    if (!given.empty()) {
        return read_named_file("compile database", given, "give a compile_commands.json file");
    }
    if (root.empty()) {
        return {};
    }
    for (const char* candidate : {"compile_commands.json", "build/compile_commands.json"}) {
        if (auto found = read_found_database(fs::path(root) / candidate)) {
            return std::move(*found);
        }
    }
    return {};
}

std::vector<std::string> resolve_include_dirs(const std::vector<std::string>& given,
                                              const std::string& root) {
    std::vector<std::string> folders;
    for (const std::string& folder : given) {
        if (const auto inside = root.empty() ? std::nullopt : relative_inside(folder, root)) {
            folders.push_back(std::string(lexer::k_virtual_root) + *inside);
            continue;
        }
        const fs::path absolute = fs::weakly_canonical(fs::absolute(folder));
        if (!fs::is_directory(absolute)) {
            throw UsageError("include folder \"" + folder + "\" does not exist");
        }
        folders.push_back(absolute.string());
    }
    return folders;
}

std::string resolve_cache_dir(bool no_cache, const std::string& given) {
    if (no_cache) {
        return {};
    }
    return given.empty() ? default_cache_dir() : given;
}

std::string default_cache_dir() {
    if (const char* dir = std::getenv("TOLLGATE_CACHE_DIR"); dir != nullptr && *dir != '\0') {
        return dir;
    }
    if (const char* xdg = std::getenv("XDG_CACHE_HOME"); xdg != nullptr && *xdg != '\0') {
        return std::string(xdg) + "/tollgate";
    }
    if (const char* home = std::getenv("HOME"); home != nullptr && *home != '\0') {
        return std::string(home) + "/.cache/tollgate";
    }
    return {};
}

LoadedSources load_sources(const SourceRequest& request) {
    LoadedSources loaded;
    std::vector<SourceFile> all;
    fs::path root;

    // Outside a repository the working tree is a plain folder; a repository that cannot be
    // opened (owned by another user) is an error, never read as a folder.
    std::optional<walker::Repository> repository =
        walker::Repository::find(fs::current_path().string());
    if (!repository && !request.revision.empty()) {
        repository.emplace(walker::Repository::open(fs::current_path().string()));
    }

    const SizeLimit limit{request.max_file_size, &loaded.oversized};
    if (repository) {
        // Without a working tree around the current folder (a bare repository, or inside the git
        // folder) paths name files of the revision from the current folder.
        const bool in_git_dir =
            relative_inside(fs::current_path(), repository->git_dir()).has_value();
        root = repository->is_bare() || (in_git_dir && !request.revision.empty())
                   ? fs::current_path()
                   : fs::path(repository->workdir());
        if (!request.revision.empty()) {
            const walker::ObjectId commit = repository->resolve_commit(request.revision);
            all = repository->read_c_family_files(commit, limit);
            loaded.label = "revision " + commit.short_hex() + " (" + request.revision + ")";
        } else {
            all = repository->read_worktree_c_family_files(limit);
            loaded.label = "working tree";
        }
    } else {
        root = fs::current_path();
        all = read_disk_tree(root, limit);
        loaded.label = "folder " + root.string();
    }
    loaded.root = root.string();

    std::vector<std::string> relative;
    for (const auto& path : request.paths) {
        const auto inside = relative_inside(path, root);
        if (!inside) {
            throw UsageError("\"" + path + "\" lies outside " + loaded.label + " at \"" +
                             root.string() + "\" (run tollgate from inside the code base)");
        }
        std::string rel = *inside;
        while (!rel.empty() && rel.back() == '/') {
            rel.pop_back();
        }
        relative.push_back(rel);
    }
    loaded.selected = select_files(all, loaded.oversized, relative, request.paths);

    const std::string compile_db = read_compile_commands(request.compile_commands, root.string());
    loaded.context =
        lexer::make_parse_context(all, compile_db, root.string(),
                                  request.compile_commands.empty() ? lexer::DatabaseOrigin::found
                                                                   : lexer::DatabaseOrigin::given);
    loaded.context.force_language = request.force_language;
    lexer::add_include_dirs(loaded.context, all,
                            resolve_include_dirs(request.include_dirs, root.string()));
    loaded.context.cache_dir = resolve_cache_dir(request.no_cache, request.cache_dir);
    spdlog::debug("{}: {} C/C++ files, {} selected, {} headers", loaded.label, all.size(),
                  loaded.selected.size(), loaded.context.headers.size());
    return loaded;
}

} // namespace tollgate
