// SPDX-License-Identifier: MIT
// The change between a base and a head: changed C/C++ files, their changed lines, their content.
#pragma once

#include "gate/common/side.hpp"
#include "gate/common/source.hpp"
#include "gate/walker/line_set.hpp"
#include "gate/walker/repository.hpp"
#include "gate/walker/revision_range.hpp"

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::walker {

// How a file changed between base and head.
enum class ChangeStatus {
    added,    // only in head
    modified, // at the same path on both sides
    deleted,  // only in base
    renamed,  // moved (and possibly edited), found by rename detection
};

// Why a changed file is not measured.
enum class SkipReason {
    binary,       // git sees binary content (NUL bytes, or an attribute says so)
    submodule,    // a gitlink: another repository's commit
    symlink,      // a symbolic link: its blob is a path, not source
    type_change,  // deleted and re-added as another kind of entry (file <-> symlink or submodule)
    not_c_family, // neither side has a C/C++ or Java extension
    unreadable,   // the working-tree file could not be read
    too_large,    // a side is larger than the size limit (ChangeOptions::max_file_size)
};

// Whether renames are looked for.
enum class RenameDetection {
    bounded, // detect renames unless the change is too large (see ChangeOptions)
    off,     // a moved file shows as deleted and added
};

// Return the lowercase name of `status` ("added", "modified", "deleted", "renamed").
const char* status_name(ChangeStatus status);

// Return the lowercase wording of `reason` for reports, e.g. "binary", "not C, C++ or Java".
const char* skip_reason_text(SkipReason reason);

// Options of collect_changes.
struct ChangeOptions {
    RenameDetection renames = RenameDetection::bounded; // look for renames or not
    unsigned rename_threshold = 50;       // minimum similarity (percent) of a rename, as git's -M
    std::size_t rename_limit = 400;       // candidates compared per added file during detection
    std::size_t rename_file_limit = 1000; // skip detection when more files than this changed
    std::uint64_t max_file_size = k_default_max_file_size; // bytes; a larger file is not read
                                                           // (0: no bound)
};

// One changed C/C++ file: paths, blobs and changed lines of both sides.
struct ChangedFile {
    std::string base_path;                        // path in base; empty when added
    std::string head_path;                        // path in head; empty when deleted
    ChangeStatus status = ChangeStatus::modified; // how the file changed
    unsigned similarity = 0; // similarity percent found by rename detection; 0 unless renamed
    ObjectId base_blob;      // blob in base; empty when added
    ObjectId head_blob;      // blob in head; empty when deleted or when head is the working tree
    LineSet base_lines;      // lines removed from base, in base numbering (every line if deleted)
    LineSet head_lines;      // lines added in head, in head numbering (every line if added)

    bool operator==(const ChangedFile& other) const {
        return base_path == other.base_path && head_path == other.head_path &&
               status == other.status && similarity == other.similarity &&
               base_blob == other.base_blob && head_blob == other.head_blob &&
               base_lines == other.base_lines && head_lines == other.head_lines;
    }
};

// One changed file that is not measured, and why.
struct SkippedFile {
    std::string base_path;                        // path in base; empty when added
    std::string head_path;                        // path in head; empty when deleted
    SkipReason reason = SkipReason::not_c_family; // why it is left out
    std::uint64_t size = 0;                       // bytes of its larger side when too_large, else 0

    bool operator==(const SkippedFile& other) const {
        return base_path == other.base_path && head_path == other.head_path &&
               reason == other.reason && size == other.size;
    }
};

// Everything that changed between the two sides of a resolved range.
struct ChangeSet {
    ResolvedRange range;              // what was compared
    std::vector<ChangedFile> files;   // changed C/C++ files, by path (head path, or base path when
                                      // deleted), then base path
    std::vector<SkippedFile> skipped; // changed files not measured, in the same order
    std::vector<std::string> notes;   // sentences for the report, e.g. that rename detection was
                                      // skipped; empty when there is nothing to say
    std::uint64_t max_file_size = k_default_max_file_size; // the size limit it was collected
                                                           // under, for read_side_tree

    bool operator==(const ChangeSet& other) const {
        return range == other.range && files == other.files && skipped == other.skipped &&
               notes == other.notes && max_file_size == other.max_file_size;
    }
};

// Collect the changes from `range.base` to `range.head` (a tree-to-tree diff) or to the working
// tree (staged, unstaged and untracked-but-not-ignored files), with zero context lines and bounded
// rename detection. A rename that crosses the C/C++ boundary counts as deleted or added on the
// C/C++ side. A C/C++ file with a side larger than `options.max_file_size` is skipped as too_large
// before its content is read (sizes come from object headers or the file system), and such files
// are kept out of rename detection, which would read them whole. Returns an empty ChangeSet when
// nothing changed. Throws Failure when libgit2 fails or an object is missing.
ChangeSet collect_changes(const Repository& repository, const ResolvedRange& range,
                          const ChangeOptions& options = {});

// Return the content of `file` on `side` of `changes` (from the object database, or from disk for
// the working tree), or nothing when the file has no such side (added/deleted) or the
// working-tree file has gone since. Throws Failure when a blob is missing.
std::optional<SourceFile> read_side(const Repository& repository, const ChangeSet& changes,
                                    const ChangedFile& file, Side side);

// Return every C/C++ file of `side` of `changes` with its content, sorted by path: the tree of
// the base or head commit, or the working tree read from disk. Files larger than
// `changes.max_file_size` are left unread and added to `oversized` when it is given. Throws
// Failure when an object is missing.
std::vector<SourceFile> read_side_tree(const Repository& repository, const ChangeSet& changes,
                                       Side side, std::vector<OversizedFile>* oversized = nullptr);

} // namespace tollgate::walker
