// SPDX-License-Identifier: MIT
// Request shapes of the three platforms. None could be checked against the live documentation
// here (no network): each is marked `from memory` with the page and section it comes from, and
// tests/gate/annotate/fake_forge.py accepts exactly these shapes.
#include "gate/annotate/forge_api.hpp"

#include <fmt/format.h>
#include <nlohmann/json.hpp>

namespace tollgate::annotate {

namespace {

using nlohmann::json;

// Percent-encode `text` as one URL path segment (RFC 3986 unreserved characters kept).
std::string encode_segment(const std::string& text) {
    std::string out;
    for (const unsigned char c : text) {
        if (std::isalnum(c) != 0 || c == '-' || c == '.' || c == '_' || c == '~') {
            out += static_cast<char>(c);
        } else {
            out += fmt::format("%{:02X}", static_cast<unsigned>(c));
        }
    }
    return out;
}

// Return the URL of rel="next" in a Link header (RFC 8288), or empty.
std::string next_link(const std::string& header) {
    std::size_t start = 0;
    while (start < header.size()) {
        const auto open = header.find('<', start);
        const auto close = header.find('>', open == std::string::npos ? start : open);
        if (open == std::string::npos || close == std::string::npos) {
            return {};
        }
        const auto end = header.find(',', close);
        const std::string params = header.substr(close + 1, end - close - 1);
        if (params.find("rel=\"next\"") != std::string::npos ||
            params.find("rel=next") != std::string::npos) {
            return header.substr(open + 1, close - open - 1);
        }
        if (end == std::string::npos) {
            return {};
        }
        start = end + 1;
    }
    return {};
}

// Return `url` with its query parameter `name` set to `value`.
std::string with_query(const std::string& url, const std::string& name, const std::string& value) {
    const auto query = url.find('?');
    std::string base = url.substr(0, query);
    std::string rest = query == std::string::npos ? std::string() : url.substr(query + 1);
    std::string kept;
    std::size_t start = 0;
    while (start <= rest.size() && !rest.empty()) {
        const auto amp = rest.find('&', start);
        const std::string pair = rest.substr(start, amp - start);
        if (pair.rfind(name + "=", 0) != 0 && !pair.empty()) {
            kept += (kept.empty() ? "" : "&") + pair;
        }
        if (amp == std::string::npos) {
            break;
        }
        start = amp + 1;
    }
    kept += (kept.empty() ? "" : "&") + name + "=" + value;
    return base + "?" + kept;
}

// Return the platform's short reason ("message", "error" or the first error) from an error
// answer, cut to 200 bytes; empty when it gives none.
std::string platform_reason(const std::string& body) {
    const json answer = json::parse(body, nullptr, false);
    std::string reason;
    if (answer.is_object()) {
        for (const char* key : {"message", "error", "error_description"}) {
            if (answer.contains(key) && answer[key].is_string()) {
                reason = answer[key].get<std::string>();
                break;
            }
            if (answer.contains(key) && !answer[key].is_null()) {
                reason = answer[key].dump();
                break;
            }
        }
        if (answer.contains("errors") && answer["errors"].is_array() && !answer["errors"].empty()) {
            const json& first = answer["errors"][0];
            std::string detail = first.dump();
            if (first.is_string()) {
                detail = first.get<std::string>();
            } else if (first.is_object() && first.contains("message") &&
                       first["message"].is_string()) {
                detail = first["message"].get<std::string>();
            }
            reason += (reason.empty() ? "" : ": ") + detail;
        }
    }
    std::string clean;
    for (const char c : reason.substr(0, 200)) {
        clean += static_cast<unsigned char>(c) < 0x20 ? ' ' : c;
    }
    return clean;
}

std::string id_text(const json& value) {
    if (value.is_number_unsigned() || value.is_number_integer()) {
        return std::to_string(value.get<long long>());
    }
    return value.is_string() ? value.get<std::string>() : std::string();
}

std::string string_field(const json& object, const char* key) {
    return object.is_object() && object.contains(key) && object[key].is_string()
               ? object[key].get<std::string>()
               : std::string();
}

RemoteComment comment_from(const json& item, Platform platform) {
    RemoteComment c;
    c.id = item.is_object() && item.contains("id") ? id_text(item["id"]) : std::string();
    c.body = string_field(item, "body");
    if (platform == Platform::gitlab) {
        if (item.contains("author") && item["author"].is_object() &&
            item["author"].contains("id")) {
            c.author = id_text(item["author"]["id"]);
        }
    } else if (item.contains("user") && item["user"].is_object()) {
        c.author = string_field(item["user"], "login");
        c.author_is_bot = string_field(item["user"], "type") == "Bot";
    }
    return c;
}

json parse_array(const std::string& body, const std::string& what) {
    json page = json::parse(body, nullptr, false);
    if (!page.is_array()) {
        throw PostError(what + ": the platform's answer is not a JSON array");
    }
    return page;
}

} // namespace

bool written_by(const RemoteComment& comment, const Account& account, Platform platform) {
    if (account.known) {
        return !comment.author.empty() && comment.author == account.author;
    }
    return platform != Platform::github || comment.author_is_bot;
}

std::size_t comment_body_limit(Platform platform) {
    switch (platform) {
    case Platform::github:
        // GitHub answers 422 "Body is too long (maximum is 65536 characters)" to a longer issue
        // comment (`from memory`; the REST API docs "REST API endpoints for issue comments" do
        // not state a maximum as far as recalled).
        return 65536;
    case Platform::gitlab:
        // GitLab docs "Notes API", parameter `body` of "Create new merge request note":
        // "Limited to 1,000,000 characters." (`from memory`).
        return 1000000;
    case Platform::gitea:
        // Gitea's and Forgejo's API docs ("issue" - "Add a comment to an issue") state no limit
        // (`from memory`); 65,536 is our choice, GitHub's figure, well inside any database
        // TEXT column.
        return 65536;
    }
    return 65536;
}

ForgeApi::ForgeApi(Target target, HttpClient& client, std::string token)
    : m_target(std::move(target)), m_client(client), m_token(std::move(token)) {}

std::string ForgeApi::repository_path() const {
    const Platform platform = *m_target.platform;
    if (platform == Platform::gitlab) {
        // A numeric project id, or the URL-encoded full path ("group%2Fsub%2Fproject").
        return m_target.api_url + "/projects/" + encode_segment(m_target.repository);
    }
    const auto slash = m_target.repository.find('/');
    if (slash == std::string::npos || slash == 0 || slash + 1 == m_target.repository.size() ||
        m_target.repository.find('/', slash + 1) != std::string::npos) {
        throw PostError("repository \"" + m_target.repository +
                        "\" should be written OWNER/NAME (give --repository)");
    }
    return m_target.api_url + "/repos/" + encode_segment(m_target.repository.substr(0, slash)) +
           "/" + encode_segment(m_target.repository.substr(slash + 1));
}

std::string ForgeApi::request_path() const {
    const std::string number = encode_segment(m_target.number);
    switch (*m_target.platform) {
    case Platform::github:
    case Platform::gitea:
        return repository_path() + "/issues/" + number;
    case Platform::gitlab:
        return repository_path() + "/merge_requests/" + number;
    }
    return {};
}

HttpResponse ForgeApi::call(Method method, const std::string& url, const std::string& body,
                            const std::string& what) {
    HttpRequest request;
    request.method = method;
    request.url = url;
    request.body = body;
    switch (*m_target.platform) {
    case Platform::github:
        // GitHub REST API docs, "Authenticating to the REST API" and "Getting started with the
        // REST API" (media type and version headers) (`from memory`).
        request.headers = {"Authorization: Bearer " + m_token,
                           "Accept: application/vnd.github+json",
                           "X-GitHub-Api-Version: 2022-11-28"};
        break;
    case Platform::gitlab:
        // GitLab docs "REST API", section "Authentication": a personal, project or group access
        // token in the OAuth-compliant header "Authorization: Bearer" (`from memory`).
        request.headers = {"Authorization: Bearer " + m_token, "Accept: application/json"};
        break;
    case Platform::gitea:
        // Gitea docs "API Usage", section "Authentication": "Authorization: token ..."
        // (`from memory`).
        request.headers = {"Authorization: token " + m_token, "Accept: application/json"};
        break;
    }
    HttpResponse response = m_client.send(request);
    if (response.status >= 200 && response.status < 300) {
        return response;
    }
    const std::string reason = redact(platform_reason(response.body), m_token);
    std::string hint;
    switch (response.status) {
    case 401:
        hint = " (the token is missing, expired or not accepted)";
        break;
    case 403:
        hint = " (the token lacks the permission: GitHub needs \"pull-requests: write\", GitLab "
               "the \"api\" scope, Gitea/Forgejo \"write:issue\")";
        break;
    case 404:
        hint = " (no such repository or pull/merge request, or the token cannot see it)";
        break;
    case 429:
        hint = " (rate limited; retries exhausted)";
        break;
    default:
        break;
    }
    throw PostError(fmt::format("{}: HTTP {}{}{}", what, response.status,
                                reason.empty() ? std::string() : " \"" + reason + "\"", hint),
                    response.status);
}

std::vector<std::string> ForgeApi::list_pages(const std::string& first_url,
                                              const std::string& what) {
    std::vector<std::string> pages;
    const std::string origin = url_origin(m_target.api_url);
    std::string url = first_url;
    for (unsigned page = 1; !url.empty(); ++page) {
        if (page > 100) {
            throw PostError(what + ": more than 100 pages; giving up");
        }
        const HttpResponse response = call(Method::get, url, {}, what);
        ++m_pages;
        pages.push_back(response.body);
        const auto link = response.headers.find("link");
        std::string next = link == response.headers.end() ? std::string() : next_link(link->second);
        if (next.empty()) {
            // GitLab's offset pagination also says X-Next-Page (empty on the last page).
            const auto next_page = response.headers.find("x-next-page");
            if (next_page != response.headers.end() && !next_page->second.empty() &&
                next_page->second.find_first_not_of("0123456789") == std::string::npos) {
                next = with_query(url, "page", next_page->second);
            }
        }
        if (!next.empty() && url_origin(next) != origin) {
            throw PostError(what + ": the next page is on another host; not following it");
        }
        url = next;
    }
    return pages;
}

Account ForgeApi::who_am_i() {
    // GitHub "REST API endpoints for users" - "Get the authenticated user": GET /user; GitLab
    // "Users API" - "Get the current user": GET /user; Gitea "user" - "Get the authenticated
    // user": GET /user (`from memory`). GitHub's workflow token (GITHUB_TOKEN) is refused with
    // 403 there, which only means "unknown" (as does a 404).
    try {
        const HttpResponse response =
            call(Method::get, m_target.api_url + "/user", {}, "asking who the token belongs to");
        const json user = json::parse(response.body, nullptr, false);
        Account account;
        if (user.is_object()) {
            account.author = *m_target.platform == Platform::gitlab
                                 ? (user.contains("id") ? id_text(user["id"]) : std::string())
                                 : string_field(user, "login");
        }
        account.known = !account.author.empty();
        return account;
    } catch (const PostError& e) {
        if (e.status() != 403 && e.status() != 404) {
            throw; // a refused token, an unreachable or failing platform
        }
        return {};
    }
}

std::vector<RemoteComment> ForgeApi::list_comments() {
    std::string url;
    switch (*m_target.platform) {
    case Platform::github:
        // GitHub "REST API endpoints for issue comments" - "List issue comments":
        // GET /repos/{owner}/{repo}/issues/{issue_number}/comments?per_page=100&page=N, pages
        // linked by the Link header ("Using pagination in the REST API") (`from memory`).
        url = request_path() + "/comments?per_page=100";
        break;
    case Platform::gitlab:
        // GitLab "Notes API" - "List all merge request notes":
        // GET /projects/:id/merge_requests/:merge_request_iid/notes?sort=asc&order_by=created_at,
        // offset pagination per "REST API" - "Pagination" (Link, X-Next-Page) (`from memory`).
        url = request_path() + "/notes?per_page=100&sort=asc&order_by=created_at";
        break;
    case Platform::gitea:
        // Gitea "issue" - "List all comments on an issue":
        // GET /repos/{owner}/{repo}/issues/{index}/comments (`from memory`; `page`/`limit` are
        // sent in case the server paginates, and its Link header is followed).
        url = request_path() + "/comments?limit=50";
        break;
    }
    std::vector<RemoteComment> comments;
    for (const std::string& body : list_pages(url, "listing the comments")) {
        for (const json& item : parse_array(body, "listing the comments")) {
            if (*m_target.platform == Platform::gitlab && item.is_object() &&
                item.value("system", false)) {
                continue; // GitLab's own notes ("added 1 commit")
            }
            comments.push_back(comment_from(item, *m_target.platform));
        }
    }
    return comments;
}

std::string ForgeApi::create_comment(const std::string& body) {
    // GitHub "Create an issue comment": POST .../issues/{issue_number}/comments {"body"} -> 201;
    // GitLab "Create new merge request note": POST .../merge_requests/:iid/notes {"body"} -> 201;
    // Gitea "Add a comment to an issue": POST .../issues/{index}/comments {"body"} -> 201
    // (`from memory`).
    const std::string url =
        request_path() + (*m_target.platform == Platform::gitlab ? "/notes" : "/comments");
    const HttpResponse response =
        call(Method::post, url, json{{"body", body}}.dump(), "creating the comment");
    const json created = json::parse(response.body, nullptr, false);
    return created.is_object() && created.contains("id") ? id_text(created["id"]) : std::string();
}

void ForgeApi::update_comment(const std::string& id, const std::string& body) {
    // GitHub "Update an issue comment": PATCH /repos/{owner}/{repo}/issues/comments/{comment_id};
    // GitLab "Modify existing merge request note": PUT .../merge_requests/:iid/notes/:note_id;
    // Gitea "Edit a comment": PATCH /repos/{owner}/{repo}/issues/comments/{id}; each {"body"}
    // -> 200 (`from memory`).
    const std::string payload = json{{"body", body}}.dump();
    if (*m_target.platform == Platform::gitlab) {
        call(Method::put, request_path() + "/notes/" + encode_segment(id), payload,
             "updating the comment");
    } else {
        call(Method::patch, repository_path() + "/issues/comments/" + encode_segment(id), payload,
             "updating the comment");
    }
}

std::vector<RemoteComment> ForgeApi::list_line_notes() {
    std::vector<RemoteComment> notes;
    if (*m_target.platform == Platform::github) {
        // GitHub "REST API endpoints for pull request review comments" - "List review comments
        // on a pull request": GET /repos/{owner}/{repo}/pulls/{pull_number}/comments
        // (`from memory`).
        const std::string url = repository_path() + "/pulls/" + encode_segment(m_target.number) +
                                "/comments?per_page=100";
        for (const std::string& body : list_pages(url, "listing the line notes")) {
            for (const json& item : parse_array(body, "listing the line notes")) {
                notes.push_back(comment_from(item, Platform::github));
            }
        }
    } else if (*m_target.platform == Platform::gitlab) {
        // GitLab "Discussions API" - "List project merge request discussion items":
        // GET /projects/:id/merge_requests/:iid/discussions; a thread's first note opens it
        // (`from memory`).
        for (const std::string& body :
             list_pages(request_path() + "/discussions?per_page=100", "listing the line notes")) {
            for (const json& thread : parse_array(body, "listing the line notes")) {
                if (!thread.is_object() || !thread.contains("notes") ||
                    !thread["notes"].is_array() || thread["notes"].empty()) {
                    continue;
                }
                RemoteComment note = comment_from(thread["notes"][0], Platform::gitlab);
                note.id = string_field(thread, "id") + "/" + note.id;
                notes.push_back(note);
            }
        }
    } else {
        throw PostError("line notes are not supported on Gitea/Forgejo");
    }
    return notes;
}

std::string ForgeApi::create_line_note(const std::string& body, const policy::Finding& finding,
                                       const std::string& head_commit) {
    if (*m_target.platform == Platform::github) {
        // GitHub "Create a review comment for a pull request":
        // POST /repos/{owner}/{repo}/pulls/{pull_number}/comments
        // {"body", "commit_id", "path", "line", "side": "RIGHT"} -> 201; 422 when the line is
        // not part of the diff (`from memory`).
        const json payload = {{"body", body},
                              {"commit_id", head_commit},
                              {"path", finding.path},
                              {"line", finding.start_line},
                              {"side", "RIGHT"}};
        const HttpResponse response =
            call(Method::post,
                 repository_path() + "/pulls/" + encode_segment(m_target.number) + "/comments",
                 payload.dump(), "creating a line note on " + finding.path);
        const json created = json::parse(response.body, nullptr, false);
        return created.is_object() && created.contains("id") ? id_text(created["id"])
                                                             : std::string();
    }
    if (*m_target.platform != Platform::gitlab) {
        throw PostError("line notes are not supported on Gitea/Forgejo");
    }
    // GitLab "Merge requests API" - "Get merge request diff versions":
    // GET /projects/:id/merge_requests/:iid/versions, newest first, with base_commit_sha,
    // start_commit_sha and head_commit_sha (`from memory`).
    const HttpResponse versions_answer =
        call(Method::get, request_path() + "/versions", {}, "reading the diff versions");
    const json versions = json::parse(versions_answer.body, nullptr, false);
    if (!versions.is_array() || versions.empty() || !versions[0].is_object()) {
        throw PostError("reading the diff versions: the merge request has none");
    }
    const json& latest = versions[0];
    const std::string head_sha = string_field(latest, "head_commit_sha");
    if (!head_commit.empty() && head_sha != head_commit) {
        throw PostError("the merge request's latest diff is of " + head_sha.substr(0, 12) +
                        ", not of the checked head " + head_commit.substr(0, 12));
    }
    // GitLab "Discussions API" - "Create a new thread in the merge request diff":
    // POST /projects/:id/merge_requests/:iid/discussions {"body", "position": {"position_type":
    // "text", "base_sha", "start_sha", "head_sha", "old_path", "new_path", "new_line"}} -> 201
    // (`from memory`).
    const json payload = {{"body", body},
                          {"position",
                           {{"position_type", "text"},
                            {"base_sha", string_field(latest, "base_commit_sha")},
                            {"start_sha", string_field(latest, "start_commit_sha")},
                            {"head_sha", head_sha},
                            {"old_path", finding.path},
                            {"new_path", finding.path},
                            {"new_line", finding.start_line}}}};
    const HttpResponse response = call(Method::post, request_path() + "/discussions",
                                       payload.dump(), "creating a line note on " + finding.path);
    const json created = json::parse(response.body, nullptr, false);
    if (!created.is_object() || !created.contains("notes") || !created["notes"].is_array() ||
        created["notes"].empty()) {
        return {};
    }
    return string_field(created, "id") + "/" + id_text(created["notes"][0]["id"]);
}

void ForgeApi::update_line_note(const std::string& id, const std::string& body) {
    const std::string payload = json{{"body", body}}.dump();
    if (*m_target.platform == Platform::github) {
        // GitHub "Update a review comment for a pull request":
        // PATCH /repos/{owner}/{repo}/pulls/comments/{comment_id} {"body"} (`from memory`).
        call(Method::patch, repository_path() + "/pulls/comments/" + encode_segment(id), payload,
             "updating a line note");
        return;
    }
    // GitLab "Discussions API" - "Modify an existing merge request thread note":
    // PUT /projects/:id/merge_requests/:iid/discussions/:discussion_id/notes/:note_id {"body"}
    // (`from memory`).
    const auto slash = id.find('/');
    call(Method::put,
         request_path() + "/discussions/" + encode_segment(id.substr(0, slash)) + "/notes/" +
             encode_segment(slash == std::string::npos ? std::string() : id.substr(slash + 1)),
         payload, "updating a line note");
}

} // namespace tollgate::annotate
