// SPDX-License-Identifier: MIT
// The few REST endpoints of each platform that keep one comment (and optional line notes) on a
// pull/merge request. Each request shape is named beside its code with the platform's API page.
#pragma once

#include "gate/annotate/http_client.hpp"
#include "gate/annotate/platform.hpp"
#include "gate/policy/verdict.hpp"

#include <string>
#include <vector>

namespace tollgate::annotate {

// A comment, note or review comment as the platform lists it.
struct RemoteComment {
    std::string id;             // its id; a GitLab thread's note is "DISCUSSION/NOTE"
    std::string body;           // its Markdown text
    std::string author;         // the author's login (GitHub, Gitea) or numeric id (GitLab)
    bool author_is_bot = false; // GitHub says the author is a bot or app account
};

// Who the token belongs to, when the platform says.
struct Account {
    std::string author; // compared with RemoteComment::author
    bool known = false; // false: the platform would not say (GitHub's workflow token)
};

// Return true when `comment` may be one tollgate wrote with this token: by `account` when it is
// known; otherwise, on GitHub, by a bot account (a workflow token cannot ask who it is, and
// people cannot post as bots); elsewhere by anyone.
bool written_by(const RemoteComment& comment, const Account& account, Platform platform);

// Return the platform's comment size limit in characters (see comment_body_limit's notes in
// forge_api.cpp: GitHub 65,536, GitLab 1,000,000, Gitea/Forgejo undocumented: 65,536 chosen).
std::size_t comment_body_limit(Platform platform);

// Speaks one platform's REST API for one pull/merge request.
class ForgeApi {
public:
    // Talk to `target` through `client`, authenticating with `token`.
    ForgeApi(Target target, HttpClient& client, std::string token);

    // Ask who the token belongs to. Throws PostError when the token is refused (401).
    Account who_am_i();

    // Return every comment of the pull/merge request, following pagination (Link rel="next",
    // or GitLab's X-Next-Page) up to 100 pages. Throws PostError on a refusal.
    std::vector<RemoteComment> list_comments();
    // Create a comment with `body`; return its id. Throws PostError on a refusal.
    std::string create_comment(const std::string& body);
    // Replace the body of comment `id`. Throws PostError on a refusal.
    void update_comment(const std::string& id, const std::string& body);

    // Return the line-level notes (GitHub review comments, GitLab thread openers).
    std::vector<RemoteComment> list_line_notes();
    // Create a line note with `body` on `finding`'s first line in head `head_commit`. Throws
    // PostError when the platform refuses (e.g. the line is not part of the diff).
    std::string create_line_note(const std::string& body, const policy::Finding& finding,
                                 const std::string& head_commit);
    // Replace the body of line note `id`.
    void update_line_note(const std::string& id, const std::string& body);

    // Return the number of list pages read so far.
    unsigned pages_read() const { return m_pages; }
    // Return the target this client speaks to.
    const Target& target() const { return m_target; }

private:
    std::string repository_path() const;
    std::string request_path() const;
    HttpResponse call(Method method, const std::string& url, const std::string& body,
                      const std::string& what);
    std::vector<std::string> list_pages(const std::string& first_url, const std::string& what);

    Target m_target;
    HttpClient& m_client;
    std::string m_token;
    unsigned m_pages = 0;
};

} // namespace tollgate::annotate
