// SPDX-License-Identifier: MIT
// The annotate stage: find our comment by its marker, then create, edit or collapse it.
#include "gate/annotate/annotate.hpp"

#include "gate/annotate/comment_body.hpp"

#include <map>
#include <spdlog/spdlog.h>

namespace tollgate::annotate {

namespace {

// Return the key of a line note of `slot` from its first line, or empty when it is not one.
std::string note_key_of(const std::string& body, const std::string& slot) {
    const std::string head = note_marker(slot, "");
    const std::string prefix = head.substr(0, head.size() - 4); // without " -->"
    if (body.compare(0, prefix.size(), prefix) != 0) {
        return {};
    }
    const std::string key = body.substr(prefix.size(), 16);
    if (key.size() != 16 || key.find_first_not_of("0123456789abcdef") != std::string::npos) {
        return {};
    }
    return starts_with_marker(body, note_marker(slot, key)) ? key : std::string();
}

// Return our line notes of `slot` by key (the oldest note of each key).
std::map<std::string, RemoteComment> our_line_notes(ForgeApi& api, const Account& account,
                                                    const std::string& slot) {
    std::map<std::string, RemoteComment> notes;
    for (const auto& note : api.list_line_notes()) {
        const std::string key = note_key_of(note.body, slot);
        if (!key.empty() && written_by(note, account, *api.target().platform)) {
            notes.emplace(key, note);
        }
    }
    return notes;
}

// Edit the line note `note` of a finding that no longer blocks to say so (once).
void resolve_note(ForgeApi& api, const std::string& key, const RemoteComment& note,
                  const std::string& slot, const std::string& head_commit, AnnotateResult& result) {
    const std::string body = compose_resolved_note(key, slot, head_commit);
    if (normalise_newlines(note.body) == body) {
        return;
    }
    try {
        api.update_line_note(note.id, body);
        ++result.notes_updated;
    } catch (const PostError& e) {
        result.warnings.push_back(std::string("resolving a line note: ") + e.what());
    }
}

void annotate_lines(const delta::ChangeReport& report, const policy::Verdict& verdict,
                    ForgeApi& api, const Account& account, const AnnotateSettings& settings,
                    AnnotateResult& result) {
    const Platform platform = *api.target().platform;
    if (platform == Platform::gitea) {
        result.warnings.push_back("line notes are not supported on Gitea/Forgejo; only the "
                                  "comment was posted");
        return;
    }
    if (report.head_commit.empty()) {
        result.warnings.push_back("line notes need a head commit (the working tree is not one)");
        return;
    }
    std::map<std::string, const policy::Finding*> wanted; // key -> finding
    for (const auto& finding : verdict.findings) {
        if (finding.blocks() && finding.start_line > 0 && !finding.path.empty()) {
            wanted.emplace(finding_key(finding), &finding);
        }
    }
    const std::map<std::string, RemoteComment> existing =
        our_line_notes(api, account, settings.slot);
    for (const auto& [key, finding] : wanted) {
        const std::string body = compose_line_note(*finding, settings.slot);
        try {
            const auto it = existing.find(key);
            if (it == existing.end()) {
                api.create_line_note(body, *finding, report.head_commit);
                ++result.notes_created;
            } else if (normalise_newlines(it->second.body) != body) {
                api.update_line_note(it->second.id, body);
                ++result.notes_updated;
            }
        } catch (const PostError& e) {
            result.warnings.push_back(std::string("line note on ") + finding->path + ":" +
                                      std::to_string(finding->start_line) + ": " + e.what());
        }
    }
    for (const auto& [key, note] : existing) {
        if (wanted.count(key) == 0) {
            resolve_note(api, key, note, settings.slot, report.head_commit, result);
        }
    }
}

} // namespace

const char* action_name(CommentAction action) {
    switch (action) {
    case CommentAction::created:
        return "created";
    case CommentAction::updated:
        return "updated";
    case CommentAction::unchanged:
        return "unchanged";
    case CommentAction::collapsed:
        return "collapsed";
    case CommentAction::none:
        return "none";
    }
    return "none";
}

AnnotateResult annotate_change(const delta::ChangeReport& report, const policy::Verdict& verdict,
                               ForgeApi& api, const AnnotateSettings& settings) {
    const Platform platform = *api.target().platform;
    const Account account = api.who_am_i();
    spdlog::debug("annotate: the token's account is {}",
                  account.known ? "\"" + account.author + "\"" : "not known");
    const std::string marker = comment_marker(settings.slot);
    std::vector<RemoteComment> ours;
    for (auto& comment : api.list_comments()) {
        if (starts_with_marker(comment.body, marker) && written_by(comment, account, platform)) {
            ours.push_back(std::move(comment));
        }
    }
    spdlog::debug("annotate: {} comment(s) with our marker in {} page(s)", ours.size(),
                  api.pages_read());

    AnnotateResult result;
    const bool nothing_touched = report.functions.empty() && verdict.findings.empty();
    std::string body;
    if (nothing_touched) {
        body = compose_now_passes(report, settings.slot);
    } else {
        const std::size_t limit =
            settings.body_limit > 0 ? settings.body_limit : comment_body_limit(platform);
        const CommentBody composed = compose_comment(report, verdict, settings.render,
                                                     settings.slot, limit, settings.artifact_url);
        body = composed.text;
        result.cut = composed.cut;
    }
    if (ours.empty()) {
        if (!nothing_touched) {
            result.comment_id = api.create_comment(body);
            result.action = CommentAction::created;
        }
    } else {
        const RemoteComment& kept = ours.front(); // the oldest: the one reviewers saw first
        result.comment_id = kept.id;
        result.duplicates = ours.size() - 1;
        if (normalise_newlines(kept.body) == body) {
            result.action = CommentAction::unchanged;
        } else {
            api.update_comment(kept.id, body);
            result.action = nothing_touched ? CommentAction::collapsed : CommentAction::updated;
        }
    }
    if (settings.line_notes) {
        try {
            annotate_lines(report, verdict, api, account, settings, result);
        } catch (const PostError& e) {
            result.warnings.push_back(std::string("line notes: ") + e.what());
        }
    }
    return result;
}

} // namespace tollgate::annotate
