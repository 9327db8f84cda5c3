// SPDX-License-Identifier: MIT
// libgit2 access: open a repository, resolve revisions, list trees and read blobs.
#pragma once

#include "gate/common/source.hpp"

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::walker {

// A full 40-hex object id.
struct ObjectId {
    std::string hex; // 40 lowercase hex digits
    bool operator==(const ObjectId& other) const { return hex == other.hex; }
    bool operator!=(const ObjectId& other) const { return hex != other.hex; }
    bool operator<(const ObjectId& other) const { return hex < other.hex; }
    std::string short_hex() const { return hex.substr(0, 7); } // first 7 digits
};

// One file of a tree.
struct TreeFile {
    std::string path; // repository-relative, '/' separated
    ObjectId blob;    // its blob id
    bool operator==(const TreeFile& other) const {
        return path == other.path && blob == other.blob;
    }
};

// An open git repository (work tree or bare). Move-only; owns the git_repository.
class Repository {
public:
    // Open the repository containing `path` (searching parent folders; bare repositories too).
    // Throws UsageError `not a git repository: "PATH" (...)` when there is none, UsageError
    // `detected dubious ownership in repository at "DIR": ...` (git's words, with its remedy)
    // when another user owns it, and Failure when libgit2 cannot read the one it found.
    static Repository open(const std::string& path);

    // Open the repository containing `path` as open() does, or return nothing when `path` lies
    // in no repository. Throws as open() does for a repository it finds but cannot open.
    static std::optional<Repository> find(const std::string& path);

    Repository(Repository&&) noexcept;
    Repository& operator=(Repository&&) noexcept;
    ~Repository();

    // Return the working tree's absolute path ('/'-terminated), or empty for a bare repository.
    std::string workdir() const;
    // Return true for a bare repository.
    bool is_bare() const;
    // Return the git folder's absolute path ('/'-terminated): ".git/" of a working tree, or the
    // bare repository itself.
    std::string git_dir() const;

    // Resolve `revision` (any git revision syntax: HEAD~2, a tag, a short id, main@{1}) to a
    // commit id, peeling tags. Throws UsageError `cannot resolve ROLE "REVISION": CAUSE` (with
    // "did you mean" among reference names) when it does not resolve to a commit; `role` (e.g.
    // "base") is left out of the message when empty.
    ObjectId resolve_commit(const std::string& revision, const std::string& role = {}) const;

    // Return the C/C++ and Java files (by is_measured_path) of `commit`'s tree, sorted by path;
    // symlinks and submodules are left out. Throws Failure when the commit is missing.
    std::vector<TreeFile> list_c_family_files(const ObjectId& commit) const;

    // Return the path of every regular file of `commit`'s tree, whatever its language, sorted;
    // symlinks and submodules are left out. Throws Failure when the commit is missing.
    std::vector<std::string> list_file_paths(const ObjectId& commit) const;

    // Return the bytes of blob `blob`. Throws Failure when it is missing.
    std::string read_blob(const ObjectId& blob) const;

    // Return the file at `path` in `commit`, or nothing when the tree has no such regular file
    // (absent, a folder, a symlink or a submodule). Throws Failure when the commit is missing.
    std::optional<SourceFile> read_file(const ObjectId& commit, const std::string& path) const;

    // Return every C/C++ and Java file of `commit` with its content, sorted by path. A blob
    // larger than `limit` is left unread (its size comes from the object header) and listed in
    // `limit.oversized`. Throws Failure when the commit or a blob is missing.
    std::vector<SourceFile> read_c_family_files(const ObjectId& commit,
                                                const SizeLimit& limit = {}) const;

    // Return every C/C++ and Java file of the working tree (tracked or untracked, not ignored),
    // with its content read from disk, sorted by path; files deleted from disk, symlinks and
    // submodules are left out, and a file larger than `limit` is left unread (its size taken from
    // the open file) and listed in `limit.oversized`. Throws UsageError for a bare repository,
    // Failure when a file cannot be read.
    std::vector<SourceFile> read_worktree_c_family_files(const SizeLimit& limit = {}) const;

    // Return the size in bytes of blob `blob` from its object header, without reading it. Throws
    // Failure when it is missing.
    std::uint64_t blob_size(const ObjectId& blob) const;

    // Return the short names of local branches, remote branches and tags, sorted; empty for a
    // repository without references.
    std::vector<std::string> reference_names() const;

    // Return the libgit2 handle (a git_repository*), for other walker code only; never null.
    void* raw() const;

private:
    struct Impl;
    explicit Repository(std::unique_ptr<Impl> impl);
    std::unique_ptr<Impl> m_impl;
};

} // namespace tollgate::walker
