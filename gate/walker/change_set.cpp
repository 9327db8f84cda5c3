// SPDX-License-Identifier: MIT
// Collect the changed C/C++ files between a base and a head with libgit2's diff, and read them.
#include "gate/walker/change_set.hpp"

#include "gate/common/disk_file.hpp"
#include "gate/common/errors.hpp"
#include "gate/walker/libgit2_api.hpp"
#include "gate/walker/rename_similarity.hpp"

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <tuple>

namespace tollgate::walker {

namespace {

// Return the reason to skip `delta` before its content is loaded, or nothing to measure it.
std::optional<SkipReason> skip_by_kind(const git_diff_delta& delta) {
    if (delta.status == GIT_DELTA_TYPECHANGE) {
        return SkipReason::type_change;
    }
    if (delta.status == GIT_DELTA_UNREADABLE) {
        return SkipReason::unreadable;
    }
    if (delta.old_file.mode == GIT_FILEMODE_COMMIT || delta.new_file.mode == GIT_FILEMODE_COMMIT) {
        return SkipReason::submodule;
    }
    if (delta.old_file.mode == GIT_FILEMODE_LINK || delta.new_file.mode == GIT_FILEMODE_LINK) {
        return SkipReason::symlink;
    }
    return std::nullopt;
}

std::optional<ChangeStatus> status_of(git_delta_t status) {
    switch (status) {
    case GIT_DELTA_ADDED:
    case GIT_DELTA_UNTRACKED:
    case GIT_DELTA_COPIED:
        return ChangeStatus::added;
    case GIT_DELTA_DELETED:
        return ChangeStatus::deleted;
    case GIT_DELTA_MODIFIED:
    case GIT_DELTA_CONFLICTED:
        return ChangeStatus::modified;
    case GIT_DELTA_RENAMED:
        return ChangeStatus::renamed;
    default:
        return std::nullopt; // unmodified, ignored: not a change
    }
}

// Return every line of `content` as a set (1..number of lines; a last line without a newline
// counts).
LineSet whole_file(const std::string& content) {
    const auto newlines = static_cast<unsigned>(std::count(content.begin(), content.end(), '\n'));
    const unsigned lines = newlines + ((content.empty() || content.back() == '\n') ? 0U : 1U);
    LineSet set;
    set.add(1, lines);
    return set;
}

// Read a working-tree file only when it is a regular file (never a symlink, FIFO or device).
std::optional<std::string> read_disk_file(const std::string& path) {
    DiskFile file = read_regular_file(path);
    if (file.entry != DiskEntry::regular) {
        return std::nullopt;
    }
    return std::move(file.content);
}

bool working_tree_head(const ChangeSet& changes) {
    return changes.range.head_source == HeadSource::worktree;
}

std::string sort_path(const std::string& base_path, const std::string& head_path) {
    return head_path.empty() ? base_path : head_path;
}

std::string quoted_path(const ChangedFile& file) {
    return "\"" + sort_path(file.base_path, file.head_path) + "\"";
}

// Build the diff of `range` with zero context lines; untracked files count in the working tree.
// A non-empty `only` restricts it to exactly those paths.
git::Owned<git_diff> diff_range(const Repository& repository, const ResolvedRange& range,
                                const std::vector<std::string>& only = {}) {
    git_repository* repo = git::handle_of(repository);
    const git::Owned<git_tree> base_tree = git::commit_tree(repository, range.base);
    git_diff_options options = GIT_DIFF_OPTIONS_INIT;
    options.context_lines = 0;
    options.interhunk_lines = 0;
    // The indent heuristic is git's default since 2.14; without it hunks may slide elsewhere.
    options.flags = GIT_DIFF_INCLUDE_TYPECHANGE | GIT_DIFF_INDENT_HEURISTIC;
    std::vector<char*> pathspec;
    for (const auto& path : only) {
        pathspec.push_back(const_cast<char*>(path.c_str()));
    }
    if (!only.empty()) {
        options.flags |= GIT_DIFF_DISABLE_PATHSPEC_MATCH;
        options.pathspec.strings = pathspec.data();
        options.pathspec.count = pathspec.size();
    }
    git_diff* raw = nullptr;
    if (range.head_source == HeadSource::worktree) {
        options.flags |= GIT_DIFF_INCLUDE_UNTRACKED | GIT_DIFF_RECURSE_UNTRACKED_DIRS |
                         GIT_DIFF_SHOW_UNTRACKED_CONTENT;
        git::check(git_diff_tree_to_workdir_with_index(&raw, repo, base_tree.get(), &options),
                   "cannot compare " + range.base.short_hex() + " with the working tree");
    } else {
        const git::Owned<git_tree> head_tree = git::commit_tree(repository, range.head);
        git::check(git_diff_tree_to_tree(&raw, repo, base_tree.get(), head_tree.get(), &options),
                   "cannot compare " + range.base.short_hex() + " with " + range.head.short_hex());
    }
    return git::Owned<git_diff>(raw);
}

// Return whether `options` let rename detection run on a diff of `changed` files.
bool renames_wanted(std::size_t changed, const ChangeOptions& options) {
    return options.renames != RenameDetection::off && changed <= options.rename_file_limit;
}

// Return the size of `side` of `delta` without reading it: from the object header of its blob, or
// from the file system for the working tree; nothing when the side is absent or its size cannot
// be learnt (a blob missing from a partial clone: libgit2 skips those itself).
std::optional<std::uint64_t> side_size(const Repository& repository, const ResolvedRange& range,
                                       const git_diff_delta& delta, Side side) {
    const git_diff_file& file = side == Side::base ? delta.old_file : delta.new_file;
    if (side == Side::head && range.head_source == HeadSource::worktree) {
        // A symlink is never followed, so only a regular file has a size here.
        const std::filesystem::path path = std::filesystem::path(repository.workdir()) / file.path;
        std::error_code error;
        if (!std::filesystem::is_regular_file(std::filesystem::symlink_status(path, error))) {
            return std::nullopt;
        }
        const auto size = std::filesystem::file_size(path, error);
        return error ? std::nullopt : std::optional<std::uint64_t>(size);
    }
    if (git_oid_is_zero(&file.id) == 1) {
        return std::nullopt;
    }
    git_odb* raw = nullptr;
    if (git_repository_odb(&raw, git::handle_of(repository)) < 0) {
        return std::nullopt;
    }
    const git::Owned<git_odb> odb(raw);
    std::size_t size = 0;
    git_object_t type = GIT_OBJECT_INVALID;
    if (git_odb_read_header(&size, &type, raw, &file.id) < 0) {
        git_error_clear();
        return std::nullopt;
    }
    return size;
}

// One file left out of the diff before rename detection because a side is over the size limit.
struct OversizedChange {
    std::string base_path; // path in base; empty when added
    std::string head_path; // path in head; empty when deleted
    std::uint64_t size = 0;
};

// Return the added and deleted files of `diff` (the candidates rename detection would read whole
// to score their similarity) that have a side over `options.max_file_size`.
std::vector<OversizedChange> oversized_candidates(const Repository& repository,
                                                  const ResolvedRange& range, git_diff* diff,
                                                  const ChangeOptions& options) {
    std::vector<OversizedChange> found;
    const SizeLimit limit{options.max_file_size, nullptr};
    if (options.max_file_size == 0) {
        return found;
    }
    const std::size_t count = git_diff_num_deltas(diff);
    for (std::size_t index = 0; index < count; ++index) {
        const git_diff_delta& delta = *git_diff_get_delta(diff, index);
        const bool deleted = delta.status == GIT_DELTA_DELETED;
        const bool added = delta.status == GIT_DELTA_ADDED || delta.status == GIT_DELTA_UNTRACKED;
        if (!deleted && !added) {
            continue;
        }
        const auto size = side_size(repository, range, delta, deleted ? Side::base : Side::head);
        if (size && limit.refuses(*size)) {
            found.push_back({deleted ? delta.old_file.path : std::string(),
                             added ? delta.new_file.path : std::string(), *size});
        }
    }
    return found;
}

// Return every path of `diff` except those of `left_out`.
std::vector<std::string> paths_except(git_diff* diff,
                                      const std::vector<OversizedChange>& left_out) {
    std::vector<std::string> paths;
    const std::size_t count = git_diff_num_deltas(diff);
    for (std::size_t index = 0; index < count; ++index) {
        const git_diff_delta& delta = *git_diff_get_delta(diff, index);
        const bool excluded = std::any_of(left_out.begin(), left_out.end(), [&](const auto& o) {
            return o.base_path == delta.old_file.path || o.head_path == delta.new_file.path;
        });
        if (!excluded) {
            paths.emplace_back(delta.old_file.path);
            if (std::string(delta.new_file.path) != delta.old_file.path) {
                paths.emplace_back(delta.new_file.path);
            }
        }
    }
    return paths;
}

// Run rename detection on `diff` unless `options` turn it off or the diff is too large; return a
// note when it was skipped for size.
std::string find_renames(git_diff* diff, const ResolvedRange& range, const ChangeOptions& options) {
    if (options.renames == RenameDetection::off) {
        return {};
    }
    const std::size_t changed = git_diff_num_deltas(diff);
    if (!renames_wanted(changed, options)) {
        return "rename detection skipped: " + std::to_string(changed) +
               " changed files exceed the limit of " + std::to_string(options.rename_file_limit) +
               " (moved files show as deleted and added)";
    }
    git_diff_find_options find = GIT_DIFF_FIND_OPTIONS_INIT;
    find.flags = GIT_DIFF_FIND_RENAMES;
    if (range.head_source == HeadSource::worktree) {
        find.flags |= GIT_DIFF_FIND_FOR_UNTRACKED;
    }
    find.rename_threshold = static_cast<std::uint16_t>(options.rename_threshold);
    // libgit2 reads 0 as "use diff.renameLimit", so keep at least one candidate.
    find.rename_limit = std::max<std::size_t>(1, options.rename_limit);
    // Score candidates as git does, so a rename here is a rename in the user's git diff.
    const unsigned threshold = options.rename_threshold;
    git_diff_similarity_metric metric = make_similarity_metric(&threshold);
    find.metric = &metric;
    git::check(git_diff_find_similar(diff, &find), "cannot detect renames");
    return {};
}

// Fill the changed lines of `file` from the zero-context patch of delta `index`; return false when
// git sees binary content.
bool collect_lines(git_diff* diff, std::size_t index, ChangedFile& file) {
    git_patch* raw = nullptr;
    git::check(git_patch_from_diff(&raw, diff, index),
               "cannot compute the diff of " + quoted_path(file));
    const git::Owned<git_patch> patch(raw);
    if (raw == nullptr || (git_patch_get_delta(raw)->flags & GIT_DIFF_FLAG_BINARY) != 0) {
        return false;
    }
    const std::size_t hunks = git_patch_num_hunks(raw);
    for (std::size_t hunk = 0; hunk < hunks; ++hunk) {
        const int lines = git::check(git_patch_num_lines_in_hunk(raw, hunk), "cannot read a hunk");
        for (int line = 0; line < lines; ++line) {
            const git_diff_line* diff_line = nullptr;
            git::check(
                git_patch_get_line_in_hunk(&diff_line, raw, hunk, static_cast<std::size_t>(line)),
                "cannot read a diff line");
            if (diff_line->origin == GIT_DIFF_LINE_DELETION && diff_line->old_lineno > 0) {
                file.base_lines.add(static_cast<unsigned>(diff_line->old_lineno));
            } else if (diff_line->origin == GIT_DIFF_LINE_ADDITION && diff_line->new_lineno > 0) {
                file.head_lines.add(static_cast<unsigned>(diff_line->new_lineno));
            }
        }
    }
    return true;
}

} // namespace

const char* status_name(ChangeStatus status) {
    switch (status) {
    case ChangeStatus::added:
        return "added";
    case ChangeStatus::modified:
        return "modified";
    case ChangeStatus::deleted:
        return "deleted";
    case ChangeStatus::renamed:
        return "renamed";
    }
    return "modified";
}

const char* skip_reason_text(SkipReason reason) {
    switch (reason) {
    case SkipReason::binary:
        return "binary";
    case SkipReason::submodule:
        return "submodule";
    case SkipReason::symlink:
        return "symlink";
    case SkipReason::type_change:
        return "type change (deleted and re-added as another kind of entry)";
    case SkipReason::not_c_family:
        return "not C, C++ or Java";
    case SkipReason::unreadable:
        return "unreadable";
    case SkipReason::too_large:
        return "too large";
    }
    return "not C, C++ or Java";
}

ChangeSet collect_changes(const Repository& repository, const ResolvedRange& range,
                          const ChangeOptions& options) {
    ChangeSet changes;
    changes.range = range;
    changes.max_file_size = options.max_file_size;
    const SizeLimit limit{options.max_file_size, nullptr};
    git::Owned<git_diff> diff = diff_range(repository, range);
    // libgit2 reads every rename candidate whole: leave the oversized ones out of the diff first.
    std::vector<OversizedChange> left_out;
    if (renames_wanted(git_diff_num_deltas(diff.get()), options)) {
        left_out = oversized_candidates(repository, range, diff.get(), options);
    }
    bool nothing_else = false;
    if (!left_out.empty()) {
        const std::vector<std::string> rest = paths_except(diff.get(), left_out);
        nothing_else = rest.empty(); // an empty path list would mean every path
        if (!nothing_else) {
            diff = diff_range(repository, range, rest);
        }
    }
    for (const auto& o : left_out) {
        SkippedFile skipped;
        skipped.base_path = o.base_path;
        skipped.head_path = o.head_path;
        const bool c_family = is_measured_path(o.base_path.empty() ? o.head_path : o.base_path);
        skipped.reason = c_family ? SkipReason::too_large : SkipReason::not_c_family;
        skipped.size = c_family ? o.size : 0;
        changes.skipped.push_back(std::move(skipped));
    }
    const std::string rename_note = find_renames(diff.get(), range, options);
    if (!rename_note.empty()) {
        changes.notes.push_back(rename_note);
    }
    const bool worktree = range.head_source == HeadSource::worktree;
    const std::size_t count = nothing_else ? 0 : git_diff_num_deltas(diff.get());
    for (std::size_t index = 0; index < count; ++index) {
        const git_diff_delta& delta = *git_diff_get_delta(diff.get(), index);
        const std::optional<ChangeStatus> status = status_of(delta.status);
        const bool is_type_change =
            delta.status == GIT_DELTA_TYPECHANGE || delta.status == GIT_DELTA_UNREADABLE;
        if (!status && !is_type_change) {
            continue;
        }
        ChangedFile file;
        if (status != ChangeStatus::added) {
            file.base_path = delta.old_file.path;
        }
        if (status != ChangeStatus::deleted) {
            file.head_path = delta.new_file.path;
        }
        const bool base_c = !file.base_path.empty() && is_measured_path(file.base_path);
        const bool head_c = !file.head_path.empty() && is_measured_path(file.head_path);
        std::optional<SkipReason> skip = skip_by_kind(delta);
        std::uint64_t too_large_size = 0;
        if (!skip && !base_c && !head_c) {
            skip = SkipReason::not_c_family;
        }
        if (!skip) {
            file.status = *status;
            // A rename across the C/C++ boundary is, for measuring, a deletion or an addition.
            const bool crosses = file.status == ChangeStatus::renamed && base_c != head_c;
            if (crosses) {
                file.status = base_c ? ChangeStatus::deleted : ChangeStatus::added;
                (base_c ? file.head_path : file.base_path).clear();
            } else if (file.status == ChangeStatus::renamed) {
                file.similarity = delta.similarity;
            }
            if (!file.base_path.empty()) {
                file.base_blob = git::to_object_id(delta.old_file.id);
            }
            if (!file.head_path.empty() && !worktree) {
                file.head_blob = git::to_object_id(delta.new_file.id);
            }
            std::uint64_t largest = 0;
            for (const Side side : {Side::base, Side::head}) {
                if (!(side == Side::base ? file.base_path : file.head_path).empty()) {
                    largest = std::max<std::uint64_t>(
                        largest, side_size(repository, range, delta, side).value_or(0));
                }
            }
            if (limit.refuses(largest)) {
                skip = SkipReason::too_large;
                too_large_size = largest;
            } else if (!collect_lines(diff.get(), index, file)) {
                skip = SkipReason::binary;
            } else if (crosses) {
                file.base_lines = LineSet();
                file.head_lines = LineSet();
                const std::optional<SourceFile> content =
                    read_side(repository, changes, file, base_c ? Side::base : Side::head);
                (base_c ? file.base_lines : file.head_lines) =
                    whole_file(content ? content->content : std::string());
            }
        }
        if (skip) {
            SkippedFile skipped;
            if (delta.status != GIT_DELTA_ADDED && delta.status != GIT_DELTA_UNTRACKED) {
                skipped.base_path = delta.old_file.path;
            }
            if (delta.status != GIT_DELTA_DELETED) {
                skipped.head_path = delta.new_file.path;
            }
            skipped.reason = *skip;
            skipped.size = *skip == SkipReason::too_large ? too_large_size : 0;
            changes.skipped.push_back(std::move(skipped));
        } else {
            changes.files.push_back(std::move(file));
        }
    }
    std::sort(changes.files.begin(), changes.files.end(),
              [](const ChangedFile& a, const ChangedFile& b) {
                  return std::make_tuple(sort_path(a.base_path, a.head_path), a.base_path) <
                         std::make_tuple(sort_path(b.base_path, b.head_path), b.base_path);
              });
    std::sort(changes.skipped.begin(), changes.skipped.end(),
              [](const SkippedFile& a, const SkippedFile& b) {
                  return std::make_tuple(sort_path(a.base_path, a.head_path), a.base_path) <
                         std::make_tuple(sort_path(b.base_path, b.head_path), b.base_path);
              });
    return changes;
}

std::optional<SourceFile> read_side(const Repository& repository, const ChangeSet& changes,
                                    const ChangedFile& file, Side side) {
    if (side == Side::base) {
        if (file.base_path.empty()) {
            return std::nullopt;
        }
        return SourceFile{file.base_path, repository.read_blob(file.base_blob)};
    }
    if (file.head_path.empty()) {
        return std::nullopt;
    }
    if (working_tree_head(changes)) {
        std::optional<std::string> content = read_disk_file(repository.workdir() + file.head_path);
        if (!content) {
            return std::nullopt;
        }
        return SourceFile{file.head_path, std::move(*content)};
    }
    return SourceFile{file.head_path, repository.read_blob(file.head_blob)};
}

std::vector<SourceFile> read_side_tree(const Repository& repository, const ChangeSet& changes,
                                       Side side, std::vector<OversizedFile>* oversized) {
    const SizeLimit limit{changes.max_file_size, oversized};
    if (side == Side::base) {
        return repository.read_c_family_files(changes.range.base, limit);
    }
    if (working_tree_head(changes)) {
        return repository.read_worktree_c_family_files(limit);
    }
    return repository.read_c_family_files(changes.range.head, limit);
}

} // namespace tollgate::walker
