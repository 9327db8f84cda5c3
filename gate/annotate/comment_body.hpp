// SPDX-License-Identifier: MIT
// The text of the comment tollgate keeps on a pull/merge request: a hidden marker line of our
// own, then the Markdown report (cut to the platform's size limit), or one "now passes" line.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/policy/verdict.hpp"
#include "gate/report/change_report.hpp"

#include <cstddef>
#include <string>

namespace tollgate::annotate {

// Return true when `slot` may name a comment: 1 to 64 of [A-Za-z0-9._-].
bool valid_slot(const std::string& slot);

// Return the marker line of the change comment of `slot`, an HTML comment Markdown renderers
// hide: "<!-- tollgate:annotate slot=gate -->".
std::string comment_marker(const std::string& slot);

// Return the marker line of the line note keyed `key` (16 hex digits) of `slot`:
// "<!-- tollgate:annotate slot=gate note=0123456789abcdef -->".
std::string note_marker(const std::string& slot, const std::string& key);

// Return true when `body` starts with the line `marker` (ended by "\n", "\r\n" or the body's
// end). A marker anywhere else, e.g. quoted from a report, does not count.
bool starts_with_marker(const std::string& body, const std::string& marker);

// Return `body` with "\r\n" turned into "\n" (platforms may store either).
std::string normalise_newlines(const std::string& body);

// What the comment body of one run says.
struct CommentBody {
    std::string text;            // the whole body, marker line first
    bool cut = false;            // the report did not fit whole
    std::size_t shown_functions; // rows of the table in the body
};

// Compose the change comment of `slot`: the marker line, then the Markdown report rendered by
// report::write_change_markdown. When the body would exceed `limit` bytes, table rows are left
// out from the end (smallest growth first) and a closing note says how many are shown and links
// `artifact_url` (http or https only) where the full report is kept; if even one row is too
// many, the rendered text is cut at a line boundary.
CommentBody compose_comment(const delta::ChangeReport& report, const policy::Verdict& verdict,
                            const report::RenderOptions& options, const std::string& slot,
                            std::size_t limit, const std::string& artifact_url);

// Compose the one-line body that replaces the table when the change no longer touches any
// function: the marker line and "**Tollgate: now passes**: ..." naming the head commit.
std::string compose_now_passes(const delta::ChangeReport& report, const std::string& slot);

// Return the key of a blocking finding's line note: 16 hex digits of a 64-bit FNV-1a hash of
// its rule id, function and signature, so that the same finding keeps its note across runs and
// no text of the finding reaches the marker.
std::string finding_key(const policy::Finding& finding);

// Compose a line note for `finding`: its marker line and the finding's message, escaped.
std::string compose_line_note(const policy::Finding& finding, const std::string& slot);

// Compose the body that replaces a line note whose finding is gone, naming the head commit.
std::string compose_resolved_note(const std::string& key, const std::string& slot,
                                  const std::string& head_commit);

// Return `text` escaped as Markdown inline text: every ASCII punctuation character that
// Markdown or HTML gives a meaning is backslash-escaped or written as an entity, and line breaks
// become spaces, so the text stays one plain run of characters.
std::string escape_inline(const std::string& text);

} // namespace tollgate::annotate
