// SPDX-License-Identifier: MIT
// Keep one comment with the change's Markdown report on its pull/merge request: found again by
// its marker, edited in place, collapsed to one "now passes" line when nothing is touched any
// more; optionally one line note per blocking finding.
#pragma once

#include "gate/annotate/forge_api.hpp"
#include "gate/delta/function_delta.hpp"
#include "gate/policy/verdict.hpp"
#include "gate/report/change_report.hpp"

#include <cstddef>
#include <string>
#include <vector>

namespace tollgate::annotate {

// What a run asks for.
struct AnnotateSettings {
    std::string slot = "gate";    // names the comment, so two gates can share a request
    std::size_t body_limit = 0;   // bytes; 0: the platform's documented comment limit
    bool line_notes = false;      // one line note per blocking finding
    std::string artifact_url;     // where the full report is kept, linked when the body is cut
    report::RenderOptions render; // rows shown and file links of the Markdown table
};

// What happened to the change comment.
enum class CommentAction {
    created,   // there was none: one was posted
    updated,   // ours was found and its body replaced
    unchanged, // ours was found with this very body: nothing sent
    collapsed, // nothing is touched any more: ours now says "now passes" in one line
    none,      // nothing is touched and there was no comment: nothing posted
};

// Return the action as a word for messages ("created", "updated", ...).
const char* action_name(CommentAction action);

// What a run did.
struct AnnotateResult {
    CommentAction action = CommentAction::none; // the change comment
    std::string comment_id;                     // its id, when there is one
    bool cut = false;                           // the report was cut to fit
    std::size_t duplicates = 0;                 // further comments of ours with the same marker,
                                                // left as they are
    unsigned notes_created = 0;                 // line notes posted
    unsigned notes_updated = 0;                 // line notes edited (or resolved)
    std::vector<std::string> warnings;          // line notes that could not be posted, and why
};

// Create or update the change comment of `settings.slot` for `report` and `verdict` through
// `api`, then the line notes when asked. Throws PostError when the change comment cannot be
// read or written; a refused line note is a warning in the result.
AnnotateResult annotate_change(const delta::ChangeReport& report, const policy::Verdict& verdict,
                               ForgeApi& api, const AnnotateSettings& settings);

} // namespace tollgate::annotate
