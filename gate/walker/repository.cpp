// SPDX-License-Identifier: MIT
// libgit2 access: open a repository, resolve revisions, list trees and read blobs.
#include "gate/walker/repository.hpp"

#include "gate/common/disk_file.hpp"
#include "gate/common/errors.hpp"
#include "gate/walker/libgit2_api.hpp"

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <map>
#include <spdlog/spdlog.h>
#include <sstream>
#include <sys/stat.h>
#include <unistd.h>

namespace tollgate::walker {

namespace git {

void ensure_started() {
    // libgit2 counts init calls; one for the whole process is enough and is never undone, so
    // handles freed during static destruction still find the library running.
    static const int k_started = git_libgit2_init();
    (void)k_started;
}

std::string last_error_message() {
    const git_error* error = git_error_last();
    if (error == nullptr || error->message == nullptr || error->message[0] == '\0') {
        return "unknown libgit2 error";
    }
    return error->message;
}

int check(int code, const std::string& what) {
    if (code < 0) {
        throw Failure(what + ": " + last_error_message());
    }
    return code;
}

ObjectId to_object_id(const git_oid& id) {
    char hex[GIT_OID_HEXSZ + 1] = {};
    git_oid_tostr(hex, sizeof hex, &id);
    return ObjectId{hex};
}

git_oid to_git_oid(const ObjectId& id) {
    git_oid result{};
    if (id.hex.size() != GIT_OID_HEXSZ || git_oid_fromstr(&result, id.hex.c_str()) < 0) {
        throw Failure("invalid object id \"" + id.hex + "\"");
    }
    return result;
}

git_repository* handle_of(const Repository& repository) {
    return static_cast<git_repository*>(repository.raw());
}

Owned<git_tree> commit_tree(const Repository& repository, const ObjectId& commit) {
    const git_oid id = to_git_oid(commit);
    git_commit* raw_commit = nullptr;
    check(git_commit_lookup(&raw_commit, handle_of(repository), &id),
          "cannot read commit " + commit.short_hex());
    const Owned<git_commit> owned_commit(raw_commit);
    git_tree* tree = nullptr;
    check(git_commit_tree(&tree, raw_commit),
          "cannot read the tree of commit " + commit.short_hex());
    return Owned<git_tree>(tree);
}

} // namespace git

namespace {

std::string quoted(const std::string& text) {
    return "\"" + text + "\"";
}

// Return the folder git names in its ownership message for the git folder `git_dir`: the working
// tree holding a ".git" folder, else the git folder itself (a bare repository).
std::string repository_folder(std::string git_dir) {
    while (git_dir.size() > 1 && git_dir.back() == '/') {
        git_dir.pop_back();
    }
    const std::string suffix = "/.git";
    if (git_dir.size() > suffix.size() &&
        git_dir.compare(git_dir.size() - suffix.size(), suffix.size(), suffix) == 0) {
        git_dir.resize(git_dir.size() - suffix.size());
    }
    return git_dir;
}

// Return the owner of `folder` or of `git_dir` when it is not the effective user, as git's
// ownership check sees it; nothing when both are the user's own (or cannot be examined).
std::optional<unsigned> foreign_owner(const std::string& folder, const std::string& git_dir) {
    for (const std::string& candidate : {folder, git_dir}) {
        struct stat status {};
        if (!candidate.empty() && ::stat(candidate.c_str(), &status) == 0 &&
            status.st_uid != ::geteuid()) {
            return static_cast<unsigned>(status.st_uid);
        }
    }
    return std::nullopt;
}

// Collects the C/C++ blobs of a tree walk.
int collect_c_family_entry(const char* root, const git_tree_entry* entry, void* payload) {
    if (git_tree_entry_type(entry) != GIT_OBJECT_BLOB ||
        git_tree_entry_filemode(entry) == GIT_FILEMODE_LINK) {
        return 0;
    }
    std::string path = std::string(root) + git_tree_entry_name(entry);
    if (is_measured_path(path)) {
        auto* files = static_cast<std::vector<TreeFile>*>(payload);
        files->push_back(TreeFile{std::move(path), git::to_object_id(*git_tree_entry_id(entry))});
    }
    return 0;
}

// Collects the path of every regular blob of a tree walk.
int collect_any_entry(const char* root, const git_tree_entry* entry, void* payload) {
    if (git_tree_entry_type(entry) == GIT_OBJECT_BLOB &&
        git_tree_entry_filemode(entry) != GIT_FILEMODE_LINK) {
        static_cast<std::vector<std::string>*>(payload)->push_back(std::string(root) +
                                                                   git_tree_entry_name(entry));
    }
    return 0;
}

} // namespace

struct Repository::Impl {
    git::Owned<git_repository> repository;
};

Repository::Repository(std::unique_ptr<Impl> impl) : m_impl(std::move(impl)) {}
Repository::Repository(Repository&&) noexcept = default;
Repository& Repository::operator=(Repository&&) noexcept = default;
Repository::~Repository() = default;

std::optional<Repository> Repository::find(const std::string& path) {
    git::ensure_started();
    git_repository* raw = nullptr;
    const int code = git_repository_open_ext(&raw, path.c_str(), 0, nullptr);
    if (code == 0) {
        auto impl = std::make_unique<Impl>();
        impl->repository.reset(raw);
        return Repository(std::move(impl));
    }
    if (code != GIT_ENOTFOUND && code != GIT_EOWNER) {
        git::check(code, "cannot open the repository at " + quoted(path));
    }
    const std::string message = git::last_error_message();
    // libgit2 1.5 reports a repository of another user as "not found" when no safe.directory is
    // configured at all: find git's folder without opening it, then ask who owns it.
    git_buf found = GIT_BUF_INIT;
    const bool discovered = git_repository_discover(&found, path.c_str(), 0, nullptr) == 0;
    const std::string git_dir = discovered ? std::string(found.ptr) : std::string();
    git_buf_dispose(&found);
    git_error_clear();
    if (git_dir.empty() && code == GIT_ENOTFOUND) {
        return std::nullopt;
    }
    const std::string folder = git_dir.empty() ? path : repository_folder(git_dir);
    const std::optional<unsigned> owner = foreign_owner(folder, git_dir);
    if (code == GIT_EOWNER || owner) {
        throw UsageError(fmt::format(
            "detected dubious ownership in repository at \"{}\": it is owned by {}, and tollgate "
            "runs as uid {} (if you trust it: git config --global --add safe.directory {})",
            folder, owner ? "uid " + std::to_string(*owner) : std::string("another user"),
            static_cast<unsigned>(::geteuid()), shell_word(folder)));
    }
    throw Failure("cannot open the repository at " + quoted(folder) + ": " + message);
}

Repository Repository::open(const std::string& path) {
    std::optional<Repository> found = find(path);
    if (!found) {
        throw UsageError("not a git repository: " + quoted(path) +
                         " (run inside a git work tree, or name one with -C DIR)");
    }
    return std::move(*found);
}

std::string Repository::workdir() const {
    const char* dir = git_repository_workdir(m_impl->repository.get());
    return dir == nullptr ? std::string() : std::string(dir);
}

std::string Repository::git_dir() const {
    return git_repository_path(m_impl->repository.get());
}

bool Repository::is_bare() const {
    return git_repository_is_bare(m_impl->repository.get()) == 1;
}

ObjectId Repository::resolve_commit(const std::string& revision, const std::string& role) const {
    git_repository* repo = m_impl->repository.get();
    const std::string subject =
        "cannot resolve " + (role.empty() ? std::string() : role + " ") + quoted(revision) + ": ";
    git_object* raw = nullptr;
    const int code = git_revparse_single(&raw, repo, revision.c_str());
    if (code == GIT_ENOTFOUND || code == GIT_EUNBORNBRANCH) {
        if (git_repository_head_unborn(repo) == 1 && revision.rfind("HEAD", 0) == 0) {
            throw UsageError(subject + "the repository has no commits yet");
        }
        const std::string suggestion = closest_match(revision, reference_names());
        throw UsageError(
            subject + "reference not found" +
            (suggestion.empty() ? std::string() : " (did you mean " + quoted(suggestion) + "?)"));
    }
    if (code == GIT_EAMBIGUOUS) {
        throw UsageError(subject + "the short id is ambiguous (give more digits)");
    }
    if (code == GIT_EINVALIDSPEC) {
        throw UsageError(subject + "invalid revision syntax: " + git::last_error_message());
    }
    git::check(code, subject.substr(0, subject.size() - 2));
    const git::Owned<git_object> object(raw);
    git_object* peeled = nullptr;
    if (git_object_peel(&peeled, raw, GIT_OBJECT_COMMIT) < 0) {
        throw UsageError(subject + "it names a " + git_object_type2string(git_object_type(raw)) +
                         ", not a commit");
    }
    const git::Owned<git_object> commit(peeled);
    return git::to_object_id(*git_object_id(peeled));
}

std::vector<TreeFile> Repository::list_c_family_files(const ObjectId& commit) const {
    const git::Owned<git_tree> tree = git::commit_tree(*this, commit);
    std::vector<TreeFile> files;
    git::check(git_tree_walk(tree.get(), GIT_TREEWALK_PRE, collect_c_family_entry, &files),
               "cannot list the tree of commit " + commit.short_hex());
    std::sort(files.begin(), files.end(),
              [](const TreeFile& a, const TreeFile& b) { return a.path < b.path; });
    return files;
}

std::vector<std::string> Repository::list_file_paths(const ObjectId& commit) const {
    const git::Owned<git_tree> tree = git::commit_tree(*this, commit);
    std::vector<std::string> paths;
    git::check(git_tree_walk(tree.get(), GIT_TREEWALK_PRE, collect_any_entry, &paths),
               "cannot list the tree of commit " + commit.short_hex());
    std::sort(paths.begin(), paths.end());
    return paths;
}

std::string Repository::read_blob(const ObjectId& blob) const {
    const git_oid id = git::to_git_oid(blob);
    git_blob* raw = nullptr;
    git::check(git_blob_lookup(&raw, m_impl->repository.get(), &id),
               "cannot read blob " + blob.short_hex());
    const git::Owned<git_blob> owned(raw);
    const auto* bytes = static_cast<const char*>(git_blob_rawcontent(raw));
    return std::string(bytes, static_cast<std::size_t>(git_blob_rawsize(raw)));
}

std::optional<SourceFile> Repository::read_file(const ObjectId& commit,
                                                const std::string& path) const {
    const git::Owned<git_tree> tree = git::commit_tree(*this, commit);
    git_tree_entry* raw = nullptr;
    const int code = git_tree_entry_bypath(&raw, tree.get(), path.c_str());
    if (code == GIT_ENOTFOUND) {
        return std::nullopt;
    }
    git::check(code, "cannot look up " + quoted(path) + " in commit " + commit.short_hex());
    const git::Owned<git_tree_entry> entry(raw);
    if (git_tree_entry_type(raw) != GIT_OBJECT_BLOB ||
        git_tree_entry_filemode(raw) == GIT_FILEMODE_LINK) {
        return std::nullopt;
    }
    return SourceFile{path, read_blob(git::to_object_id(*git_tree_entry_id(raw)))};
}

std::uint64_t Repository::blob_size(const ObjectId& blob) const {
    const git_oid id = git::to_git_oid(blob);
    git_odb* raw_odb = nullptr;
    git::check(git_repository_odb(&raw_odb, m_impl->repository.get()),
               "cannot open the object database");
    const git::Owned<git_odb> odb(raw_odb);
    std::size_t size = 0;
    git_object_t type = GIT_OBJECT_INVALID;
    git::check(git_odb_read_header(&size, &type, raw_odb, &id),
               "cannot read blob " + blob.short_hex());
    return size;
}

std::vector<SourceFile> Repository::read_c_family_files(const ObjectId& commit,
                                                        const SizeLimit& limit) const {
    std::vector<SourceFile> files;
    for (const TreeFile& entry : list_c_family_files(commit)) {
        if (limit.max_bytes != 0) {
            const std::uint64_t size = blob_size(entry.blob);
            if (limit.refuses(size)) {
                if (limit.oversized != nullptr) {
                    limit.oversized->push_back({entry.path, size});
                }
                continue;
            }
        }
        files.push_back(SourceFile{entry.path, read_blob(entry.blob)});
    }
    return files;
}

std::vector<SourceFile> Repository::read_worktree_c_family_files(const SizeLimit& limit) const {
    git_repository* repo = m_impl->repository.get();
    const std::string root = workdir();
    if (root.empty()) {
        throw UsageError("a bare repository has no working tree (pass a revision instead)");
    }
    // Tracked files come from the index (even when an ignore rule matches them); untracked ones
    // from a status scan that leaves ignored files out. Both are then read from disk.
    std::map<std::string, bool> paths;
    git_index* raw_index = nullptr;
    git::check(git_repository_index(&raw_index, repo), "cannot open the index");
    const git::Owned<git_index> index(raw_index);
    git::check(git_index_read(raw_index, 0), "cannot read the index");
    const std::size_t count = git_index_entrycount(raw_index);
    for (std::size_t i = 0; i < count; ++i) {
        const git_index_entry* entry = git_index_get_byindex(raw_index, i);
        if (entry->mode != GIT_FILEMODE_COMMIT && entry->mode != GIT_FILEMODE_LINK &&
            is_measured_path(entry->path)) {
            paths[entry->path] = true;
        }
    }
    git_status_options options = GIT_STATUS_OPTIONS_INIT;
    options.show = GIT_STATUS_SHOW_WORKDIR_ONLY;
    options.flags = GIT_STATUS_OPT_INCLUDE_UNTRACKED | GIT_STATUS_OPT_RECURSE_UNTRACKED_DIRS |
                    GIT_STATUS_OPT_EXCLUDE_SUBMODULES;
    git_status_list* raw_status = nullptr;
    git::check(git_status_list_new(&raw_status, repo, &options), "cannot scan the working tree");
    const git::Owned<git_status_list> status(raw_status);
    const std::size_t status_count = git_status_list_entrycount(raw_status);
    for (std::size_t i = 0; i < status_count; ++i) {
        const git_status_entry* entry = git_status_byindex(raw_status, i);
        if ((entry->status & GIT_STATUS_WT_NEW) != 0 && entry->index_to_workdir != nullptr &&
            is_measured_path(entry->index_to_workdir->new_file.path)) {
            paths[entry->index_to_workdir->new_file.path] = true;
        }
    }
    std::vector<SourceFile> files;
    for (const auto& item : paths) {
        const std::filesystem::path on_disk = std::filesystem::path(root) / item.first;
        DiskFile file = read_regular_file(on_disk.string(), limit.max_bytes);
        if (file.entry == DiskEntry::unreadable) {
            throw Failure("cannot read " + quoted(on_disk.string()));
        }
        if (file.entry == DiskEntry::oversized) {
            if (limit.oversized != nullptr) {
                limit.oversized->push_back({item.first, file.size});
            }
            continue;
        }
        if (file.entry != DiskEntry::regular) {
            // Deleted from disk, a symlink (never followed), a FIFO or device (never opened).
            if (file.entry != DiskEntry::missing) {
                spdlog::warn("skipped \"{}\": {}", item.first, disk_entry_text(file.entry));
            }
            continue;
        }
        files.push_back(SourceFile{item.first, std::move(file.content)});
    }
    return files;
}

std::vector<std::string> Repository::reference_names() const {
    git_reference_iterator* raw_iterator = nullptr;
    git::check(git_reference_iterator_new(&raw_iterator, m_impl->repository.get()),
               "cannot list references");
    const git::Owned<git_reference_iterator> iterator(raw_iterator);
    std::vector<std::string> names;
    git_reference* raw = nullptr;
    while (git_reference_next(&raw, raw_iterator) == 0) {
        const git::Owned<git_reference> reference(raw);
        if (git_reference_is_branch(raw) == 1 || git_reference_is_remote(raw) == 1 ||
            git_reference_is_tag(raw) == 1) {
            names.emplace_back(git_reference_shorthand(raw));
        }
    }
    std::sort(names.begin(), names.end());
    names.erase(std::unique(names.begin(), names.end()), names.end());
    return names;
}

void* Repository::raw() const {
    return m_impl->repository.get();
}

} // namespace tollgate::walker
