// SPDX-License-Identifier: MIT
// The Markdown report in pieces (internal to gate/report): each list in order of importance, so
// that the least important items can be left out from the end when the whole is too large.
#pragma once

#include "gate/report/change_report.hpp"

#include <cstddef>
#include <string>
#include <vector>

namespace tollgate::report::markdown {

// The lists of the report, from the first cut to the last: blocking entries go last.
enum class List {
    other_rows,   // rows of the table of functions without a finding
    diagnostics,  // compiler diagnostics, folded
    notes,        // report notes and skipped files, folded
    policy_notes, // the policy's notes (waivers and the like)
    warning,      // entries of functions with warnings only
    policy_lines, // differences of a policy the change edits
    blocking,     // entries of functions with a blocking finding
};

// How many lists there are.
inline constexpr std::size_t k_lists = 7;

// Every piece of the report.
struct Parts {
    std::string heading;                     // the verdict heading and the identity sentence
    std::string policy_head;                 // the policy-change warning's first lines, or empty
    std::string diagnostics_head;            // the diagnostics fold's summary and hint, or empty
    std::string table_head;                  // the head of the table of other functions
    std::size_t shown_rows = 0;              // other rows before the rest is folded
    bool advisory = false;                   // an advisory run: the blocking list would block
    std::vector<std::string> lists[k_lists]; // items, by List, each ending in a newline
};

// Build the parts of the report of `report` judged by `verdict`.
Parts make_parts(const delta::ChangeReport& report, const policy::Verdict& verdict,
                 const RenderOptions& options);

// Return the document with the first `kept[i]` items of each list, and a note saying what was
// left out (`limit` is the size it was cut to fit).
std::string assemble(const Parts& parts, const std::size_t (&kept)[k_lists], std::size_t limit);

} // namespace tollgate::report::markdown
