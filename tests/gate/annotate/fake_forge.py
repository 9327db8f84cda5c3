#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""A fake code-hosting platform for the tests of "tollgate annotate".

It serves, on 127.0.0.1 only, the few REST endpoints the command uses, for GitHub (paths at the
root), GitLab (under /api/v4) and Gitea/Forgejo (under /api/v1); records every request (method,
path, query, headers, body) as one JSON line in the log; keeps the comments in memory and writes
them to the state file after each change; and injects faults (any status, e.g. 401, 404, 422,
429 with Retry-After, 500) and slow answers as its configuration says. The configuration file is
read again on every request, so a test can change the faults between two runs. The server stops
by itself after --lifetime seconds.

The request shapes below are the platforms' documented ones, recalled without access to the
documentation (no network here): every one is `from memory`.
- GitHub REST API docs, "REST API endpoints for issue comments": "List issue comments"
  (GET /repos/{owner}/{repo}/issues/{issue_number}/comments, per_page and page, Link header as in
  "Using pagination in the REST API"), "Create an issue comment" (POST, {"body"}, 201), "Update an
  issue comment" (PATCH /repos/{owner}/{repo}/issues/comments/{comment_id}, {"body"}, 200).
  "REST API endpoints for pull request review comments": "List review comments on a pull
  request" (GET /repos/{owner}/{repo}/pulls/{pull_number}/comments), "Create a review comment for
  a pull request" (POST, {"body", "commit_id", "path", "line", "side"}, 201, 422 when the line is
  not in the diff), "Update a review comment for a pull request" (PATCH
  /repos/{owner}/{repo}/pulls/comments/{comment_id}). "REST API endpoints for users": "Get the
  authenticated user" (GET /user; the workflow token GITHUB_TOKEN is refused with 403).
  "Authenticating to the REST API": "Authorization: Bearer TOKEN"; a User-Agent is required.
  Too long a comment: 422 "Body is too long (maximum is 65536 characters)".
- GitLab docs, "Notes API": "List all merge request notes" (GET
  /projects/:id/merge_requests/:merge_request_iid/notes), "Create new merge request note" (POST,
  body limited to 1,000,000 characters, 201), "Modify existing merge request note" (PUT
  .../notes/:note_id, 200). "Discussions API": "List project merge request discussion items"
  (GET .../discussions), "Create a new thread in the merge request diff" (POST .../discussions
  with "position"), "Modify an existing merge request thread note" (PUT
  .../discussions/:discussion_id/notes/:note_id). "Merge requests API": "Get merge request diff
  versions" (GET .../versions). "Users API": "Get the current user" (GET /user). "REST API":
  "Pagination" (X-Page, X-Per-Page, X-Next-Page, X-Total, Link), "Authentication"
  ("Authorization: Bearer" or "PRIVATE-TOKEN").
- Gitea API (Swagger "issue"): "List all comments on an issue" (GET
  /repos/{owner}/{repo}/issues/{index}/comments), "Add a comment to an issue" (POST, 201), "Edit a
  comment" (PATCH /repos/{owner}/{repo}/issues/comments/{id}, 200); "user": "Get the
  authenticated user" (GET /user); "API Usage" - "Authentication": "Authorization: token TOKEN".
  Forgejo serves the same API.
"""

import argparse
import json
import os
import re
import ssl
import threading
import time
import urllib.parse
from http.server import BaseHTTPRequestHandler, ThreadingHTTPServer

LOCK = threading.Lock()
STATE = {"next_id": 1000, "collections": {}}
ARGS = None


def load_config():
    with open(ARGS.config, encoding="utf-8") as f:
        return json.load(f)


def save_state():
    tmp = ARGS.state + ".tmp"
    with open(tmp, "w", encoding="utf-8") as f:
        json.dump(STATE["collections"], f, indent=1)
    os.replace(tmp, ARGS.state)


def new_id():
    STATE["next_id"] += 1
    return STATE["next_id"]


def collection(key):
    return STATE["collections"].setdefault(key, [])


def seed(config):
    for item in config.get("seed", []):
        entry = {"id": item.get("id") or new_id(), "body": item["body"],
                 "author": item.get("author", "someone"), "type": item.get("type", "User")}
        for extra in ("path", "line", "discussion"):
            if extra in item:
                entry[extra] = item[extra]
        collection(item["collection"]).append(entry)
    save_state()


class Handler(BaseHTTPRequestHandler):
    protocol_version = "HTTP/1.1"
    server_version = "FakeForge/1"

    def log_message(self, *args):  # quiet: the request log is the record
        pass

    # -- plumbing ------------------------------------------------------------------------------
    def reply(self, status, payload=None, headers=None):
        data = b"" if payload is None else json.dumps(payload).encode("utf-8")
        self.send_response(status)
        for name, value in (headers or {}).items():
            self.send_header(name, value)
        if payload is not None:
            self.send_header("Content-Type", "application/json")
        self.send_header("Content-Length", str(len(data)))
        self.end_headers()
        if data:
            self.wfile.write(data)

    def record(self, body):
        parsed = urllib.parse.urlsplit(self.path)
        entry = {"time": time.time(), "method": self.command, "path": parsed.path,
                 "query": parsed.query, "headers": dict(self.headers.items()),
                 "body": body.decode("utf-8", "replace")}
        with open(ARGS.log, "a", encoding="utf-8") as f:
            f.write(json.dumps(entry) + "\n")

    def base_url(self):
        scheme = "https" if ARGS.tls_cert else "http"
        return "%s://%s" % (scheme, self.headers.get("Host", "127.0.0.1"))

    def handle_any(self):
        length = int(self.headers.get("Content-Length") or 0)
        body = self.rfile.read(length) if length else b""
        config = load_config()
        with LOCK:
            self.record(body)
            fault = self.take_fault(config)
        slow = config.get("slow")
        if slow and re.search(slow.get("path", ".*"), self.path) and \
                slow.get("method", self.command) == self.command:
            time.sleep(min(float(slow.get("seconds", 1)), 10.0))
        if fault is not None:
            headers = {}
            if "retry_after" in fault:
                headers["Retry-After"] = str(fault["retry_after"])
            self.reply(fault["status"], fault.get("body", {"message": "injected fault"}), headers)
            return
        try:
            payload = json.loads(body) if body else None
        except ValueError:
            self.reply(400, {"message": "Problems parsing JSON"})
            return
        with LOCK:
            self.route(config, payload)

    def take_fault(self, config):
        for fault in config.get("faults", []):
            if fault.get("method", self.command) != self.command:
                continue
            if not re.search(fault.get("path", ".*"), urllib.parse.urlsplit(self.path).path):
                continue
            key = json.dumps(fault, sort_keys=True)
            used = STATE.setdefault("fault_uses", {}).get(key, 0)
            if "times" in fault and used >= fault["times"]:
                continue
            STATE["fault_uses"][key] = used + 1
            return fault
        return None

    def do_GET(self):
        self.handle_any()

    def do_POST(self):
        self.handle_any()

    def do_PATCH(self):
        self.handle_any()

    def do_PUT(self):
        self.handle_any()

    def do_DELETE(self):
        self.handle_any()

    # -- authentication ------------------------------------------------------------------------
    def authorised(self, config, platform):
        token = config["token"]
        auth = self.headers.get("Authorization", "")
        if platform == "gitea":
            ok = auth == "token " + token
        elif platform == "gitlab":
            ok = auth == "Bearer " + token or self.headers.get("PRIVATE-TOKEN") == token
        else:
            ok = auth == "Bearer " + token
        if not ok:
            message = {"github": "Bad credentials", "gitlab": "401 Unauthorized",
                       "gitea": "token is required"}[platform]
            self.reply(401, {"message": message})
            return False
        if platform == "github" and not self.headers.get("User-Agent"):
            self.reply(403, {"message": "Request forbidden by administrative rules. Please make "
                                        "sure your request has a User-Agent header"})
            return False
        return True

    # -- listing with pagination -----------------------------------------------------------------
    def page_of(self, config, items, platform, render):
        query = urllib.parse.parse_qs(urllib.parse.urlsplit(self.path).query)
        size_key = "limit" if platform == "gitea" else "per_page"
        default = 30 if platform == "github" else (20 if platform == "gitlab" else 50)
        asked = int(query.get(size_key, [default])[0])
        per_page = max(1, min(asked, int(config.get("per_page_max", 100))))
        page = max(1, int(query.get("page", ["1"])[0]))
        last = max(1, (len(items) + per_page - 1) // per_page)
        chunk = items[(page - 1) * per_page: page * per_page]
        headers = {}
        path = urllib.parse.urlsplit(self.path).path
        links = []
        params = {k: v[0] for k, v in query.items()}
        if page < last:
            params["page"] = str(page + 1)
            links.append('<%s%s?%s>; rel="next"' % (self.base_url(), path,
                                                    urllib.parse.urlencode(params)))
        params["page"] = str(last)
        links.append('<%s%s?%s>; rel="last"' % (self.base_url(), path,
                                                urllib.parse.urlencode(params)))
        if not config.get("omit_link_header"):
            headers["Link"] = ", ".join(links)
        if platform == "gitlab":
            headers.update({"X-Page": str(page), "X-Per-Page": str(per_page),
                            "X-Next-Page": str(page + 1) if page < last else "",
                            "X-Total": str(len(items))})
        if platform == "gitea":
            headers["X-Total-Count"] = str(len(items))
        self.reply(200, [render(item) for item in chunk], headers)

    # -- routes --------------------------------------------------------------------------------
    def route(self, config, payload):
        path = urllib.parse.unquote(urllib.parse.urlsplit(self.path).path)
        raw = urllib.parse.urlsplit(self.path).path
        if raw.startswith("/api/v4/"):
            return self.gitlab(config, payload, raw[len("/api/v4"):])
        if raw.startswith("/api/v1/"):
            return self.gitea(config, payload, path[len("/api/v1"):])
        return self.github(config, payload, path)

    def valid_body(self, payload, limit, platform):
        if not isinstance(payload, dict) or not isinstance(payload.get("body"), str):
            if platform == "gitlab":
                self.reply(400, {"error": "body is missing"})
            else:
                self.reply(422, {"message": "Validation Failed",
                                 "errors": [{"field": "body", "code": "missing_field"}]})
            return False
        if len(payload["body"]) > limit:
            if platform == "gitlab":
                self.reply(400, {"message": {"note": ["is too long (maximum is %d characters)"
                                                      % limit]}})
            else:
                self.reply(422, {"message": "Validation Failed",
                                 "errors": [{"resource": "IssueComment", "code": "custom",
                                             "field": "body",
                                             "message": "body is too long (maximum is %d "
                                                        "characters)" % limit}]})
            return False
        return True

    def github_user(self, entry):
        return {"login": entry["author"], "type": entry.get("type", "User")}

    def github(self, config, payload, path):
        if not self.authorised(config, "github"):
            return
        me = config.get("github_user", {"login": "github-actions[bot]", "type": "Bot"})
        if path == "/user" and self.command == "GET":
            if config.get("github_user_status", 403) != 200:
                return self.reply(config.get("github_user_status", 403),
                                  {"message": "Resource not accessible by integration"})
            return self.reply(200, {"login": me["login"], "id": 1, "type": me["type"]})
        m = re.fullmatch(r"/repos/([^/]+)/([^/]+)/issues/(\d+)/comments", path)
        if m:
            key = "github:%s/%s#%s" % m.groups()
            render = lambda e: {"id": e["id"], "body": e["body"], "user": self.github_user(e)}
            if self.command == "GET":
                return self.page_of(config, collection(key), "github", render)
            if self.command == "POST":
                if not self.valid_body(payload, 65536, "github"):
                    return
                entry = {"id": new_id(), "body": payload["body"], "author": me["login"],
                         "type": me["type"]}
                collection(key).append(entry)
                save_state()
                return self.reply(201, render(entry))
        m = re.fullmatch(r"/repos/([^/]+)/([^/]+)/issues/comments/(\d+)", path)
        if m:
            return self.edit_comment(config, payload, "github:%s/%s#" % m.groups()[:2],
                                     int(m.group(3)), "github", 65536)
        m = re.fullmatch(r"/repos/([^/]+)/([^/]+)/pulls/(\d+)/comments", path)
        if m:
            key = "github-review:%s/%s#%s" % m.groups()
            render = lambda e: {"id": e["id"], "body": e["body"], "user": self.github_user(e),
                                "path": e.get("path"), "line": e.get("line")}
            if self.command == "GET":
                return self.page_of(config, collection(key), "github", render)
            if self.command == "POST":
                if not self.valid_body(payload, 65536, "github"):
                    return
                for field in ("commit_id", "path", "line", "side"):
                    if field not in payload:
                        return self.reply(422, {"message": "Validation Failed",
                                                "errors": [{"field": field,
                                                            "code": "missing_field"}]})
                if payload["line"] not in config.get("diff_lines", {}).get(payload["path"], []):
                    return self.reply(422, {"message": "Validation Failed",
                                            "errors": ["pull_request_review_thread.line must be "
                                                       "part of the diff"]})
                entry = {"id": new_id(), "body": payload["body"], "author": me["login"],
                         "type": me["type"], "path": payload["path"], "line": payload["line"],
                         "commit_id": payload["commit_id"]}
                collection(key).append(entry)
                save_state()
                return self.reply(201, render(entry))
        m = re.fullmatch(r"/repos/([^/]+)/([^/]+)/pulls/comments/(\d+)", path)
        if m:
            return self.edit_comment(config, payload, "github-review:%s/%s#" % m.groups()[:2],
                                     int(m.group(3)), "github", 65536)
        return self.reply(404, {"message": "Not Found"})

    def find(self, prefix, comment_id):
        for key, items in STATE["collections"].items():
            if key.startswith(prefix):
                for entry in items:
                    if entry["id"] == comment_id:
                        return key, entry
        return None, None

    def edit_comment(self, config, payload, prefix, comment_id, platform, limit):
        key, entry = self.find(prefix, comment_id)
        if entry is None:
            return self.reply(404, {"message": "Not Found"})
        if self.command in ("PATCH", "PUT"):
            if not self.valid_body(payload, limit, platform):
                return
            entry["body"] = payload["body"]
            entry["edits"] = entry.get("edits", 0) + 1
            save_state()
            return self.reply(200, {"id": entry["id"], "body": entry["body"]})
        if self.command == "DELETE":
            collection(key).remove(entry)
            save_state()
            return self.reply(204)
        return self.reply(405, {"message": "Method Not Allowed"})

    def gitlab(self, config, payload, raw):
        if not self.authorised(config, "gitlab"):
            return
        me = config.get("gitlab_user", {"id": 77, "username": "project_5_bot"})
        if raw == "/user" and self.command == "GET":
            return self.reply(200, me)
        m = re.fullmatch(r"/projects/([^/]+)/merge_requests/(\d+)/(notes|discussions|versions)"
                         r"(?:/([^/]+))?(?:/notes/(\d+))?", raw)
        if not m:
            return self.reply(404, {"message": "404 Not found"})
        project = urllib.parse.unquote(m.group(1))
        if "/" in m.group(1):
            return self.reply(404, {"message": "404 Project Not Found"})
        mr = m.group(2)
        kind, item, sub = m.group(3), m.group(4), m.group(5)
        author = lambda e: {"id": int(e["author"]) if str(e["author"]).isdigit() else 5,
                            "username": str(e["author"])}
        note = lambda e: {"id": e["id"], "body": e["body"], "author": author(e), "system": False}
        if kind == "versions" and self.command == "GET":
            return self.reply(200, config.get("gitlab_versions", []))
        if kind == "notes":
            key = "gitlab:%s!%s" % (project, mr)
            if item is None and self.command == "GET":
                return self.page_of(config, collection(key), "gitlab", note)
            if item is None and self.command == "POST":
                if not self.valid_body(payload, 1000000, "gitlab"):
                    return
                entry = {"id": new_id(), "body": payload["body"], "author": me["id"]}
                collection(key).append(entry)
                save_state()
                return self.reply(201, note(entry))
            if item is not None and item.isdigit():
                return self.edit_comment(config, payload, "gitlab:%s!%s" % (project, mr),
                                         int(item), "gitlab", 1000000)
        if kind == "discussions":
            key = "gitlab-discussions:%s!%s" % (project, mr)
            thread = lambda e: {"id": e["discussion"], "notes": [note(e)]}
            if item is None and self.command == "GET":
                return self.page_of(config, collection(key), "gitlab", thread)
            if item is None and self.command == "POST":
                if not self.valid_body(payload, 1000000, "gitlab"):
                    return
                position = payload.get("position")
                needed = ("position_type", "base_sha", "start_sha", "head_sha", "new_path",
                          "new_line")
                if not isinstance(position, dict) or any(k not in position for k in needed):
                    return self.reply(400, {"error": "position is invalid"})
                if position["new_line"] not in config.get("diff_lines", {}).get(
                        position["new_path"], []):
                    return self.reply(400, {"message": "400 Bad request - Note {:line_code=>"
                                                       "[\"can't be blank\"]}"})
                entry = {"id": new_id(), "body": payload["body"], "author": me["id"],
                         "discussion": "d%d" % STATE["next_id"], "position": position}
                collection(key).append(entry)
                save_state()
                return self.reply(201, thread(entry))
            if item is not None and sub is not None:
                _, entry = self.find("gitlab-discussions:%s!%s" % (project, mr), int(sub))
                if entry is None or entry.get("discussion") != item:
                    return self.reply(404, {"message": "404 Not found"})
                return self.edit_comment(config, payload, "gitlab-discussions:%s!%s"
                                         % (project, mr), int(sub), "gitlab", 1000000)
        return self.reply(405, {"message": "405 Method Not Allowed"})

    def gitea(self, config, payload, path):
        if not self.authorised(config, "gitea"):
            return
        me = config.get("gitea_user", {"login": "ci-bot", "id": 3})
        if path == "/user" and self.command == "GET":
            return self.reply(200, me)
        m = re.fullmatch(r"/repos/([^/]+)/([^/]+)/issues/(\d+)/comments", path)
        render = lambda e: {"id": e["id"], "body": e["body"],
                            "user": {"login": e["author"], "id": 9}}
        if m:
            key = "gitea:%s/%s#%s" % m.groups()
            if self.command == "GET":
                return self.page_of(config, collection(key), "gitea", render)
            if self.command == "POST":
                if not self.valid_body(payload, 65536, "gitea"):
                    return
                entry = {"id": new_id(), "body": payload["body"], "author": me["login"]}
                collection(key).append(entry)
                save_state()
                return self.reply(201, render(entry))
        m = re.fullmatch(r"/repos/([^/]+)/([^/]+)/issues/comments/(\d+)", path)
        if m:
            return self.edit_comment(config, payload, "gitea:%s/%s#" % m.groups()[:2],
                                     int(m.group(3)), "gitea", 65536)
        return self.reply(404, {"message": "not found"})


def main():
    global ARGS
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--config", required=True)
    parser.add_argument("--log", required=True)
    parser.add_argument("--state", required=True)
    parser.add_argument("--port-file", required=True)
    parser.add_argument("--lifetime", type=float, default=300.0)
    parser.add_argument("--tls-cert")
    parser.add_argument("--tls-key")
    ARGS = parser.parse_args()
    seed(load_config())
    server = ThreadingHTTPServer(("127.0.0.1", 0), Handler)
    server.daemon_threads = True
    if ARGS.tls_cert:
        context = ssl.SSLContext(ssl.PROTOCOL_TLS_SERVER)
        context.load_cert_chain(ARGS.tls_cert, ARGS.tls_key)
        server.socket = context.wrap_socket(server.socket, server_side=True)
    tmp = ARGS.port_file + ".tmp"
    with open(tmp, "w", encoding="utf-8") as f:
        f.write(str(server.server_address[1]))
    os.replace(tmp, ARGS.port_file)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    time.sleep(ARGS.lifetime)  # bounded: the server never outlives its test by much
    server.shutdown()


if __name__ == "__main__":
    main()
