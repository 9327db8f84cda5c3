// SPDX-License-Identifier: MIT
// "tollgate annotate" on GitLab and Gitea/Forgejo, line notes, the CI environment, running
// check itself, and HTTPS with a certificate made by openssl. Request shapes: GitLab docs
// "Notes API", "Discussions API", "Merge requests API" ("Get merge request diff versions");
// GitHub "REST API endpoints for pull request review comments"; Gitea API "issue" comments
// (all `from memory`; see fake_forge.py).
#include "gate/annotate/annotate_run.hpp"

#include <catch2/catch.hpp>

using namespace tollgate::test;
using nlohmann::json;

namespace {

const std::string k_marker = "<!-- tollgate:annotate slot=gate -->";

tollgate::annotate::CheckedChange blocked_change() {
    return sample_change({{"Kalman::update", "src/filter.cpp", 120, 1000, 18400},
                          {"crc16", "src/crc.c", 7, 900, 950}},
                         true);
}

} // namespace

TEST_CASE("annotate keeps one note on a GitLab merge request", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    const std::string notes = "gitlab:team/sensors!7";
    json seed = json::array();
    for (int i = 0; i < 45; ++i) {
        seed.push_back(
            {{"collection", notes}, {"author", "5"}, {"body", "note " + std::to_string(i)}});
    }
    // GitLab paginates with X-Next-Page too; here the Link header is left out to use it.
    FakeForge forge(json{{"token", k_annotate_token},
                         {"seed", seed},
                         {"per_page_max", 20},
                         {"omit_link_header", true}});
    const auto first = run_annotate(forge, dir, blocked_change(), "gitlab");
    CHECK(first.exit_code == 0);
    CHECK(first.err == "tollgate: comment 1046 created on merge request team/sensors!7 (gitlab)\n");
    const auto posts = forge.requests("POST", ".*");
    REQUIRE(posts.size() == 1);
    // The project's path is one URL-encoded segment.
    CHECK(posts[0]["path"] == "/api/v4/projects/team%2Fsensors/merge_requests/7/notes");
    CHECK(posts[0]["headers"]["Authorization"] == std::string("Bearer ") + k_annotate_token);
    CHECK(forge.requests("GET", "/api/v4/projects/.*/notes").size() == 3);

    const auto second = run_annotate(
        forge, dir, sample_change({{"Kalman::update", "src/filter.cpp", 120, 1000, 1010}}, false),
        "gitlab");
    CHECK(second.err ==
          "tollgate: comment 1046 updated on merge request team/sensors!7 (gitlab)\n");
    const auto puts = forge.requests("PUT", ".*");
    REQUIRE(puts.size() == 1);
    CHECK(puts[0]["path"] == "/api/v4/projects/team%2Fsensors/merge_requests/7/notes/1046");
    const auto kept = forge.comments(notes);
    REQUIRE(kept.size() == 46);
    CHECK(kept[45]["body"].get<std::string>().rfind(
              k_marker + "\n### \xE2\x9C\x93 Tollgate passes this change", 0) == 0);
}

TEST_CASE("annotate keeps one comment on a Gitea or Forgejo pull request", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    const std::string comments = "gitea:team/sensors#5";
    // Someone else's comment carrying our marker is not ours: the token's account is "ci-bot".
    FakeForge forge(
        {{"token", k_annotate_token},
         {"seed",
          {{{"collection", comments}, {"author", "mallory"}, {"body", k_marker + "\nplanted"}}}}});
    const auto first = run_annotate(forge, dir, blocked_change(), "gitea");
    CHECK(first.err == "tollgate: comment 1002 created on pull request team/sensors#5 (gitea)\n");
    const auto post = forge.requests("POST", ".*").at(0);
    CHECK(post["path"] == "/api/v1/repos/team/sensors/issues/5/comments");
    CHECK(post["headers"]["Authorization"] == std::string("token ") + k_annotate_token);
    const auto second =
        run_annotate(forge, dir, sample_change({{"crc16", "src/crc.c", 7, 900, 950}}, false),
                     "gitea", "--line-notes");
    CHECK(second.err == "tollgate: comment 1002 updated on pull request team/sensors#5 (gitea); "
                        "line notes: 0 created, 0 updated\n"
                        "tollgate: warning: line notes are not supported on Gitea/Forgejo; only "
                        "the comment was posted\n");
    CHECK(forge.requests("PATCH", ".*").at(0)["path"] ==
          "/api/v1/repos/team/sensors/issues/comments/1002");
    CHECK(forge.comments(comments)[0]["body"] == k_marker + "\nplanted");
}

TEST_CASE("annotate --line-notes on GitHub: one review comment per blocking finding",
          "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    const std::string reviews = "github-review:octo/gadget#12";
    FakeForge forge(
        {{"token", k_annotate_token}, {"diff_lines", {{"src/filter.cpp", {118, 119, 120, 121}}}}});
    auto change = blocked_change();
    // A second blocking finding on a line outside the diff: the platform refuses that note.
    auto outside = change.verdict.findings[0];
    outside.function = "crc16";
    outside.path = "src/crc.c";
    outside.start_line = 7;
    outside.message = "src/crc.c:7: crc16(int): effort grew";
    change.verdict.findings.push_back(outside);
    const auto first = run_annotate(forge, dir, change, "github", "--line-notes");
    CHECK(first.exit_code == 0);
    CHECK(first.err.find("created on pull request octo/gadget#12 (github); line notes: 1 "
                         "created, 0 updated\n") != std::string::npos);
    CHECK(first.err.find("tollgate: warning: line note on src/crc.c:7: creating a line note on "
                         "src/crc.c: HTTP 422 \"Validation Failed: pull_request_review_thread."
                         "line must be part of the diff\"\n") != std::string::npos);
    const auto posts = forge.requests("POST", "/repos/octo/gadget/pulls/12/comments");
    REQUIRE(posts.size() == 2);
    // Notes go out in the order of their keys; pick the one on the function in the diff.
    auto sent = json::parse(posts[0]["body"].get<std::string>());
    if (sent["path"] != "src/filter.cpp") {
        sent = json::parse(posts[1]["body"].get<std::string>());
    }
    CHECK(sent["commit_id"] == change.report.head_commit);
    CHECK(sent["path"] == "src/filter.cpp");
    CHECK(sent["line"] == 120);
    CHECK(sent["side"] == "RIGHT");
    auto notes = forge.comments(reviews);
    REQUIRE(notes.size() == 1);
    const std::string note = notes[0]["body"];
    CHECK(note.rfind("<!-- tollgate:annotate slot=gate note=", 0) == 0);

    SECTION("the next run finds the note by its key and posts no second one") {
        const auto again = run_annotate(forge, dir, change, "github", "--line-notes");
        CHECK(forge.comments(reviews).size() == 1);
        CHECK(forge.requests("POST", "/repos/octo/gadget/pulls/12/comments").size() == 3);
        CHECK(forge.requests("PATCH", "/repos/octo/gadget/pulls/comments/.*").empty());
        CHECK(again.err.find("line notes: 0 created, 0 updated") != std::string::npos);
    }
    SECTION("a finding that no longer blocks has its note resolved in place") {
        const auto fixed =
            run_annotate(forge, dir,
                         sample_change({{"Kalman::update", "src/filter.cpp", 120, 1000, 1010}},
                                       false, "5c4b3a2910fedcba9876543210fedcba98765432"),
                         "github", "--line-notes");
        CHECK(fixed.err.find("line notes: 0 created, 1 updated") != std::string::npos);
        notes = forge.comments(reviews);
        REQUIRE(notes.size() == 1);
        CHECK(notes[0]["body"].get<std::string>().find(
                  "\n**Tollgate**: this finding no longer blocks the change (head `5c4b3a2`).") !=
              std::string::npos);
    }
}

TEST_CASE("annotate --line-notes on GitLab: a diff thread per blocking finding",
          "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    const auto change = blocked_change();
    FakeForge forge(json{{"token", k_annotate_token},
                         {"diff_lines", {{"src/filter.cpp", {120}}}},
                         {"gitlab_versions",
                          {{{"id", 3},
                            {"head_commit_sha", change.report.head_commit},
                            {"base_commit_sha", change.report.base_commit},
                            {"start_commit_sha", "aaaabbbbccccddddeeeeffff0000111122223333"}}}}});
    const auto first = run_annotate(forge, dir, change, "gitlab", "--line-notes");
    CHECK(first.err.find("line notes: 1 created, 0 updated") != std::string::npos);
    const auto posts = forge.requests("POST", ".*/discussions");
    REQUIRE(posts.size() == 1);
    const auto sent = json::parse(posts[0]["body"].get<std::string>());
    CHECK(sent["position"] == json{{"position_type", "text"},
                                   {"base_sha", change.report.base_commit},
                                   {"start_sha", "aaaabbbbccccddddeeeeffff0000111122223333"},
                                   {"head_sha", change.report.head_commit},
                                   {"old_path", "src/filter.cpp"},
                                   {"new_path", "src/filter.cpp"},
                                   {"new_line", 120}});
    const auto again = run_annotate(forge, dir, change, "gitlab", "--line-notes");
    CHECK(again.err.find("line notes: 0 created, 0 updated") != std::string::npos);
    CHECK(forge.requests("POST", ".*/discussions").size() == 1);
}

TEST_CASE("annotate reads the pull request from GitHub Actions' environment", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    FakeForge forge(json{{"token", k_annotate_token}});
    write_check_json(blocked_change(), dir.path() + "/check.json");
    dir.write("event.json", R"({"pull_request": {"number": 12}})");
    ScopedEnvironment environment;
    environment.set("GITHUB_ACTIONS", "true");
    environment.set("GITHUB_API_URL", forge.origin());
    environment.set("GITHUB_SERVER_URL", "https://github.example");
    environment.set("GITHUB_REPOSITORY", "octo/gadget");
    environment.set("GITHUB_REF", "refs/heads/feature");
    environment.set("GITHUB_EVENT_PATH", dir.path() + "/event.json");
    environment.set("GITHUB_RUN_ID", "4242");
    environment.set("CI_TOKEN_FOR_TEST", k_annotate_token);
    const auto run =
        run_tollgate("annotate --from check.json --token-env CI_TOKEN_FOR_TEST", dir.path());
    CHECK(run.err == "tollgate: comment 1001 created on pull request octo/gadget#12 (github)\n");
    const std::string body = forge.comments("github:octo/gadget#12")[0]["body"];
    // File links point at the platform's file view of the head commit.
    CHECK(body.find("](https://github.example/octo/gadget/blob/9b1c0de2f4a6b8c0d2e4f6a8b0c2d4e6f8"
                    "a0b2c4/src/filter.cpp#L120)") != std::string::npos);
}

TEST_CASE("annotate runs check itself and keeps its exit code", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    init_repo(dir.path());
    dir.write("filter.c", "int update(int v) {\n    return v;\n}\n");
    const std::string base = commit_all(dir.path(), "base");
    dir.write("filter.c", "int update(int v) {\n    int s = 0;\n    for (int i = 0; i < v; ++i) "
                          "{\n        if (i % 3 == 0) { s += i * v; } else { s -= i / 2; }\n    "
                          "}\n    return s > 100 ? s - 100 : s + v;\n}\n");
    const std::string head = commit_all(dir.path(), "head");
    const std::string check =
        " -- --no-pch-cache --base " + base + " --head " + head + " --report markdown:delta.md";
    ScopedEnvironment environment;
    environment.set("TOLLGATE_ANNOTATE_TOKEN", k_annotate_token);
    environment.set("TOLLGATE_TEST_BACKOFF_MS", "10");
    SECTION("blocked: exit 1, the comment posted, check's table on stdout") {
        FakeForge forge(json{{"token", k_annotate_token}});
        const auto run =
            run_tollgate("annotate " + target_flags(forge, "github") + check, dir.path());
        CHECK(run.exit_code == 1);
        CHECK(run.out.find("verdict: BLOCKED") != std::string::npos);
        CHECK(run.err.find("created on pull request octo/gadget#12 (github)") != std::string::npos);
        const std::string body = forge.comments("github:octo/gadget#12")[0]["body"];
        CHECK(body.find("`update`") != std::string::npos);
        CHECK(read_text(dir.path() + "/delta.md").find(k_annotate_token) == std::string::npos);
    }
    SECTION("the platform failing changes nothing: still exit 1") {
        FakeForge forge(json{{"token", k_annotate_token}, {"faults", {{{"status", 503}}}}});
        const auto run =
            run_tollgate("annotate " + target_flags(forge, "github") + check, dir.path());
        CHECK(run.exit_code == 1);
        CHECK(run.err.find("tollgate: warning: no comment posted: asking who the token belongs "
                           "to: HTTP 503") != std::string::npos);
        CHECK(forge.requests().size() == 4);
    }
    SECTION("a check that judged nothing posts nothing and keeps its code") {
        FakeForge forge(json{{"token", k_annotate_token}});
        const auto run = run_tollgate("annotate " + target_flags(forge, "github") +
                                          " -- --base no-such-revision",
                                      dir.path());
        CHECK(run.exit_code == 2);
        CHECK(run.err.find("tollgate: warning: no comment posted: check judged nothing (exit "
                           "2)") != std::string::npos);
        CHECK(forge.requests().empty());
    }
}

TEST_CASE("annotate over HTTPS verifies the platform's certificate", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir certs;
    const auto made = run_command("openssl req -x509 -newkey rsa:2048 -nodes -days 2 -subj "
                                  "'/CN=tollgate test' -addext 'subjectAltName=IP:127.0.0.1' "
                                  "-keyout server.key -out server.pem",
                                  certs.path());
    if (made.exit_code != 0) {
        WARN("openssl is not installed; skipping the HTTPS test");
        return;
    }
    TempDir dir;
    FakeForge forge(json{{"token", k_annotate_token}}, certs.path() + "/server.pem",
                    certs.path() + "/server.key");
    const auto untrusted = run_annotate(forge, dir, blocked_change());
    CHECK(untrusted.exit_code == 0);
    CHECK(untrusted.err.find("tollgate: warning: no comment posted: GET " + forge.origin() +
                             "/user failed after 1 attempt: ") == 0);
    CHECK(untrusted.err.find("certificate") != std::string::npos);
    CHECK(forge.requests().empty());
    const auto trusted = run_annotate(forge, dir, blocked_change(), "github",
                                      "--ca-file " + certs.path() + "/server.pem");
    CHECK(trusted.err == "tollgate: comment 1001 created on pull request octo/gadget#12 "
                         "(github)\n");
}
