// SPDX-License-Identifier: MIT
// The report model of a change: each touched function's base and head measures and their deltas.
#pragma once

#include "tollgate/core/measures.hpp"

#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace tollgate::delta {

// What happened to a touched function.
enum class DeltaLabel {
    added,     // only in head
    changed,   // in both, its tokens differ
    removed,   // only in base
    moved,     // the same function in another file or place; tokens may differ too
    unchanged, // touched by the diff, but its tokens are the same (comments, layout)
};

// Return the lowercase label name ("added", "changed", "removed", "moved", "unchanged").
const char* label_name(DeltaLabel label);

// One side of a touched function.
struct FunctionSide {
    std::string path;            // repository-relative path on this side
    unsigned start_line = 0;     // first line of the definition
    unsigned end_line = 0;       // last line of the definition
    bool lexical = false;        // extent came from the lexical cross-check
    bool parser_stopped = false; // the parser stopped on this side's file (or the other side's):
                                 // measured lexically
    bool inactive = false;       // defined in an #if branch the preprocessor skipped
    bool brace_extent = false;   // libclang's extent disagreed with brace matching: braces' taken
    std::string token_hash;      // digest of the counted tokens
    core::Measures measures;     // every measure on this side

    bool operator==(const FunctionSide& other) const {
        return path == other.path && start_line == other.start_line && end_line == other.end_line &&
               lexical == other.lexical && parser_stopped == other.parser_stopped &&
               token_hash == other.token_hash && measures == other.measures &&
               inactive == other.inactive && brace_extent == other.brace_extent;
    }
};

// A touched function, paired across the change.
struct FunctionDelta {
    std::string name;                          // qualified name (head's, or base's when removed)
    std::string signature;                     // parameter types
    std::string identity;                      // USR, or the fallback key when there is none
    DeltaLabel label = DeltaLabel::changed;    // what happened
    std::optional<FunctionSide> base;          // empty when added
    std::optional<FunctionSide> head;          // empty when removed
    std::optional<std::string> base_name;      // the base's qualified name when it differs from
                                               // `name` (a namespace or class renamed)
    std::optional<std::string> base_signature; // the base's parameter types when they differ
                                               // from `signature` (a parameter list edited)

    // Return the change of measure `id`; a missing side counts as zero.
    core::Delta delta(core::MeasureId id) const;
    // Return the side a reviewer should look at: head, or base when removed.
    const FunctionSide& shown_side() const { return head ? *head : *base; }
    // Return true when either side was measured lexically because the parser stopped.
    bool parser_stopped() const {
        return (base && base->parser_stopped) || (head && head->parser_stopped);
    }

    bool operator==(const FunctionDelta& other) const {
        return name == other.name && signature == other.signature && identity == other.identity &&
               label == other.label && base == other.base && head == other.head &&
               base_name == other.base_name && base_signature == other.base_signature;
    }
};

// A changed file that was not measured.
struct SkippedPath {
    std::string path;   // head path, or base path when deleted
    std::string reason; // e.g. "binary", "not C/C++"
    bool operator==(const SkippedPath& other) const {
        return path == other.path && reason == other.reason;
    }
};

// A parser warning, on one side.
struct ChangeWarning {
    std::string side;    // "base" or "head"
    std::string path;    // repository-relative path
    unsigned line = 0;   // 0 when not tied to a line
    std::string message; // lowercase sentence
};

// The changed lines of one C/C++ file that fall inside no measured function: file-scope code,
// macros, declarations, or lines the front end could not attribute. Blank and comment-only
// lines are not counted; a line edited in place counts once on each side.
struct UnmeasuredLines {
    std::string path;                                // head path, or base path when deleted
    std::vector<std::pair<unsigned, unsigned>> base; // deleted lines outside every base function,
                                                     // as inclusive ranges in base numbering
    std::vector<std::pair<unsigned, unsigned>> head; // added lines outside every head function,
                                                     // as inclusive ranges in head numbering
    unsigned count = 0;                              // lines in `base` and `head` together

    bool operator==(const UnmeasuredLines& other) const {
        return path == other.path && base == other.base && head == other.head &&
               count == other.count;
    }
};

// Sums over a set of functions.
struct Totals {
    unsigned functions = 0;                  // touched functions
    unsigned added = 0;                      // of which added
    unsigned removed = 0;                    // of which removed
    unsigned changed = 0;                    // of which changed or moved with other tokens
    double base_volume = 0, head_volume = 0; // summed V
    double base_effort = 0, head_effort = 0; // summed E
    double base_difficulty_max = 0, head_difficulty_max = 0; // largest D on each side
};

// Per-file totals.
struct FileTotals {
    std::string path; // head path, or base path when deleted
    Totals totals;    // over the file's touched functions
};

// Everything the renderers show about one change.
struct ChangeReport {
    std::string base_label;               // e.g. "main (3f2a91c)"
    std::string head_label;               // e.g. "HEAD (9b1c0de)" or "working tree"
    std::string base_commit;              // full id of the base
    std::string head_commit;              // full id of the head; empty for the working tree
    std::string convention;               // counting-convention fingerprint
    std::vector<std::string> notes;       // how the base was chosen, rename detection bounded, ...
    std::vector<FunctionDelta> functions; // touched functions, in report order (see sort_deltas)
    std::vector<FileTotals> files;        // per changed file, by path
    Totals totals;                        // the whole change
    std::vector<SkippedPath> skipped;     // changed files not measured
    std::vector<ChangeWarning> warnings;  // parser warnings on either side
    unsigned measured_files = 0;          // changed C/C++ files measured
    bool compile_database = false;        // a compile_commands.json was given or found
    unsigned files_without_compile_flags = 0; // measured files no compile_commands.json entry
                                              // covers (every one when there is none)
    std::vector<UnmeasuredLines> unmeasured;  // per changed C/C++ file with changed lines outside
                                              // every measured function, by path
    unsigned unmeasured_lines = 0;            // the sum of their counts
};

// Sort `functions` for reports: largest effort growth first, then by path, line and name, so
// the order is the same on every run.
void sort_deltas(std::vector<FunctionDelta>& functions);

// Compute per-file and whole-change totals of `report.functions` into `report`.
void compute_totals(ChangeReport& report);

} // namespace tollgate::delta
