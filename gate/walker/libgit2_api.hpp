// SPDX-License-Identifier: MIT
// The one wrapper of libgit2's C API: library start-up, error codes to exceptions, owned handles.
#pragma once

// Only files under gate/walker include this header (and so git2.h).
#include "gate/walker/repository.hpp"

#include <git2.h>
#include <memory>
#include <string>

namespace tollgate::walker::git {

// Start libgit2 once per process (a static guard); later calls do nothing. Never throws.
void ensure_started();

// Return libgit2's last error message for this thread, or "unknown libgit2 error" when it has none.
std::string last_error_message();

// Throw Failure "`what`: <libgit2's message>" when `code` is negative; return `code` otherwise.
int check(int code, const std::string& what);

// Deleters that hand each handle back to its libgit2 free function.
struct Dispose {
    void operator()(git_repository* handle) const { git_repository_free(handle); }
    void operator()(git_object* handle) const { git_object_free(handle); }
    void operator()(git_commit* handle) const { git_commit_free(handle); }
    void operator()(git_tree* handle) const { git_tree_free(handle); }
    void operator()(git_tree_entry* handle) const { git_tree_entry_free(handle); }
    void operator()(git_blob* handle) const { git_blob_free(handle); }
    void operator()(git_reference* handle) const { git_reference_free(handle); }
    void operator()(git_reference_iterator* handle) const { git_reference_iterator_free(handle); }
    void operator()(git_index* handle) const { git_index_free(handle); }
    void operator()(git_status_list* handle) const { git_status_list_free(handle); }
    void operator()(git_diff* handle) const { git_diff_free(handle); }
    void operator()(git_patch* handle) const { git_patch_free(handle); }
    void operator()(git_odb* handle) const { git_odb_free(handle); }
};

// An owned libgit2 handle.
template <typename Handle>
using Owned = std::unique_ptr<Handle, Dispose>;

// Return `repository`'s libgit2 handle (never null for an open repository).
git_repository* handle_of(const Repository& repository);

// Return `id` as an ObjectId (40 lowercase hex digits).
ObjectId to_object_id(const git_oid& id);

// Return `id` as a git_oid. Throws Failure when `id` is not 40 hex digits.
git_oid to_git_oid(const ObjectId& id);

// Return the tree of commit `commit`. Throws Failure when the commit or its tree is missing.
Owned<git_tree> commit_tree(const Repository& repository, const ObjectId& commit);

} // namespace tollgate::walker::git
