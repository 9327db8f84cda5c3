// SPDX-License-Identifier: MIT
// "tollgate annotate" against a fake GitHub: one comment created, found again by its marker,
// edited in place, collapsed when nothing is touched; pagination; failures are warnings.
// Request shapes: GitHub REST API docs, "REST API endpoints for issue comments" ("List issue
// comments", "Create an issue comment", "Update an issue comment") (`from memory`; see
// fake_forge.py).
#include "gate/annotate/annotate_run.hpp"

#include <catch2/catch.hpp>

using namespace tollgate::test;
using nlohmann::json;

namespace {

const std::string k_comments = "github:octo/gadget#12";
const std::string k_marker = "<!-- tollgate:annotate slot=gate -->";

json config_with(const json& extra = json::object()) {
    json config = {{"token", k_annotate_token}};
    config.update(extra);
    return config;
}

tollgate::annotate::CheckedChange blocked_change() {
    return sample_change({{"Kalman::update", "src/filter.cpp", 120, 1000, 18400},
                          {"crc16", "src/crc.c", 7, 900, 950}},
                         true);
}

tollgate::annotate::CheckedChange passing_change() {
    return sample_change({{"Kalman::update", "src/filter.cpp", 120, 1000, 1100},
                          {"crc16", "src/crc.c", 7, 900, 950}},
                         false, "5c4b3a2910fedcba9876543210fedcba98765432");
}

} // namespace

TEST_CASE("annotate keeps one comment on a GitHub pull request", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    const json seed = json::array(
        {{{"collection", k_comments}, {"author", "reviewer"}, {"body", "Looks fine to me."}}});
    FakeForge forge(config_with({{"seed", seed}}));

    // First run: the comment is created.
    const auto first = run_annotate(forge, dir, blocked_change());
    CHECK(first.exit_code == 0);
    CHECK(first.out.empty());
    CHECK(first.err == "tollgate: comment 1002 created on pull request octo/gadget#12 (github)\n");
    auto comments = forge.comments(k_comments);
    REQUIRE(comments.size() == 2);
    const std::string created = comments[1]["body"];
    CHECK(
        created.rfind(
            k_marker +
                "\n### \xE2\x9B\x94 Tollgate blocks this change: 1 function over a blocking limit",
            0) == 0);
    CHECK(forge.requests("POST", ".*/comments").size() == 1);
    const auto post = forge.requests("POST", ".*/comments").front();
    CHECK(post["path"] == "/repos/octo/gadget/issues/12/comments");
    CHECK(json::parse(post["body"].get<std::string>()) == json{{"body", created}});
    CHECK(post["headers"]["Content-Type"] == "application/json");
    CHECK(post["headers"]["Accept"] == "application/vnd.github+json");
    CHECK(post["headers"]["X-GitHub-Api-Version"] == "2022-11-28");
    CHECK(post["headers"]["User-Agent"].get<std::string>().rfind("tollgate/", 0) == 0);

    SECTION("the same report again sends nothing") {
        const auto again = run_annotate(forge, dir, blocked_change());
        CHECK(again.err ==
              "tollgate: comment 1002 on pull request octo/gadget#12 (github) is up to date\n");
        CHECK(forge.requests("POST", ".*").size() == 1);
        CHECK(forge.requests("PATCH", ".*").empty());
    }
    SECTION("a passing run after the blocked one edits the same comment") {
        const auto second = run_annotate(forge, dir, passing_change());
        CHECK(second.exit_code == 0);
        CHECK(second.err ==
              "tollgate: comment 1002 updated on pull request octo/gadget#12 (github)\n");
        const auto patches = forge.requests("PATCH", ".*");
        REQUIRE(patches.size() == 1);
        CHECK(patches[0]["path"] == "/repos/octo/gadget/issues/comments/1002");
        comments = forge.comments(k_comments);
        REQUIRE(comments.size() == 2);
        CHECK(comments[1]["id"] == 1002);
        CHECK(comments[1]["body"].get<std::string>().rfind(
                  k_marker + "\n### \xE2\x9C\x93 Tollgate passes this change", 0) == 0);
        CHECK(comments[0]["body"] == "Looks fine to me.");

        // Nothing touched any more: the comment collapses to one line, and stays so.
        const auto clean = sample_change({}, false, "0123456789abcdef0123456789abcdef01234567");
        const auto third = run_annotate(forge, dir, clean);
        CHECK(third.err ==
              "tollgate: comment 1002 collapsed on pull request octo/gadget#12 (github)\n");
        comments = forge.comments(k_comments);
        CHECK(comments[1]["body"] == k_marker + "\n**Tollgate: now passes**: the change no "
                                                "longer touches a C/C++ function (head "
                                                "`0123456`).\n");
        const auto fourth = run_annotate(forge, dir, clean);
        CHECK(fourth.err.find("is up to date") != std::string::npos);
        CHECK(forge.requests("PATCH", ".*").size() == 2);
        CHECK(forge.requests("POST", ".*").size() == 1);
    }
}

TEST_CASE("annotate posts nothing when nothing is touched and no comment exists",
          "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    FakeForge forge(config_with());
    const auto run = run_annotate(forge, dir, sample_change({}, false));
    CHECK(run.exit_code == 0);
    CHECK(run.err == "tollgate: no comment posted: the change touches no C/C++ function\n");
    CHECK(forge.requests("POST", ".*").empty());
}

TEST_CASE("annotate finds its comment on the third page", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    json seed = json::array();
    for (int i = 0; i < 25; ++i) {
        seed.push_back({{"collection", k_comments},
                        {"author", "reviewer"},
                        {"body", "comment " + std::to_string(i)}});
    }
    seed.push_back({{"collection", k_comments},
                    {"author", "github-actions[bot]"},
                    {"type", "Bot"},
                    {"body", k_marker + "\nan older table"}});
    FakeForge forge(config_with({{"seed", seed}, {"per_page_max", 10}}));
    const auto run = run_annotate(forge, dir, blocked_change());
    CHECK(run.exit_code == 0);
    CHECK(run.err == "tollgate: comment 1026 updated on pull request octo/gadget#12 (github)\n");
    const auto pages = forge.requests("GET", "/repos/octo/gadget/issues/12/comments");
    REQUIRE(pages.size() == 3);
    CHECK(pages[0]["query"] == "per_page=100");
    CHECK(pages[2]["query"].get<std::string>().find("page=3") != std::string::npos);
    CHECK(forge.requests("POST", ".*").empty());
    CHECK(forge.comments(k_comments).size() == 26);
}

TEST_CASE("annotate edits the oldest of two comments with its marker", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    // Two runs that raced each other may both have created a comment.
    json seed = json::array();
    for (const char* body : {"first", "second"}) {
        seed.push_back({{"collection", k_comments},
                        {"author", "github-actions[bot]"},
                        {"type", "Bot"},
                        {"body", k_marker + "\n" + body}});
    }
    FakeForge forge(config_with({{"seed", seed}}));
    const auto run = run_annotate(forge, dir, blocked_change());
    CHECK(run.err == "tollgate: comment 1001 updated on pull request octo/gadget#12 (github); 1 "
                     "later comment(s) with the same marker were left as they are\n");
    CHECK(forge.comments(k_comments)[1]["body"] == k_marker + "\nsecond");
}

TEST_CASE("annotate turns refusals into warnings and keeps the exit code", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    const auto refused = [&dir](const json& fault) {
        FakeForge forge(config_with({{"faults", {fault}}}));
        const auto run = run_annotate(forge, dir, blocked_change());
        CHECK(run.exit_code == 0);
        CHECK(forge.comments(k_comments).empty());
        return run.err;
    };
    SECTION("401: the token is not accepted") {
        CHECK(refused({{"path", "/user$"},
                       {"status", 401},
                       {"body", {{"message", "Bad credentials"}}}}) ==
              "tollgate: warning: no comment posted: asking who the token belongs to: HTTP 401 "
              "\"Bad credentials\" (the token is missing, expired or not accepted)\n");
    }
    SECTION("404: no such pull request") {
        CHECK(refused({{"path", "/comments$"},
                       {"method", "GET"},
                       {"status", 404},
                       {"body", {{"message", "Not Found"}}}}) ==
              "tollgate: warning: no comment posted: listing the comments: HTTP 404 \"Not "
              "Found\" (no such repository or pull/merge request, or the token cannot see it)\n");
    }
    SECTION("422: the platform rejects the comment") {
        CHECK(refused(json::parse(R"({"method": "POST", "status": 422, "body":
                   {"message": "Validation Failed", "errors": [{"message": "body is too long"}]}})")) ==
              "tollgate: warning: no comment posted: creating the comment: HTTP 422 "
              "\"Validation Failed: body is too long\"\n");
    }
    SECTION("500 on every try: the retries stop after four attempts") {
        FakeForge forge(config_with({{"faults", {{{"method", "POST"}, {"status", 500}}}}}));
        const auto run = run_annotate(forge, dir, blocked_change());
        CHECK(run.exit_code == 0);
        CHECK(run.err == "tollgate: warning: no comment posted: creating the comment: HTTP 500 "
                         "\"injected fault\"\n");
        CHECK(forge.requests("POST", ".*").size() == 4);
    }
    SECTION("429 with Retry-After: waited for, then posted") {
        FakeForge forge(config_with(
            {{"faults",
              {{{"method", "POST"}, {"status", 429}, {"retry_after", "1"}, {"times", 1}}}}}));
        const auto run = run_annotate(forge, dir, blocked_change());
        CHECK(run.err.find("created") != std::string::npos);
        const auto posts = forge.requests("POST", ".*");
        REQUIRE(posts.size() == 2);
        CHECK(posts[1]["time"].get<double>() - posts[0]["time"].get<double>() >= 0.9);
        CHECK(forge.comments(k_comments).size() == 1);
    }
    SECTION("no token: nothing is sent") {
        FakeForge forge(config_with());
        write_check_json(blocked_change(), dir.path() + "/check.json");
        ScopedEnvironment environment;
        const auto run =
            run_tollgate("annotate --from check.json " + target_flags(forge, "github"), dir.path());
        CHECK(run.exit_code == 0);
        CHECK(run.err == "tollgate: warning: no comment posted: the environment variable "
                         "TOLLGATE_ANNOTATE_TOKEN holds no token\n");
        CHECK(forge.requests().empty());
    }
    SECTION("no pull request to comment on: a warning naming the flag") {
        write_check_json(blocked_change(), dir.path() + "/check.json");
        ScopedEnvironment environment;
        environment.set("TOLLGATE_ANNOTATE_TOKEN", k_annotate_token);
        environment.set("GITHUB_ACTIONS", "true");
        environment.set("GITHUB_REPOSITORY", "octo/gadget");
        environment.set("GITHUB_REF", "refs/heads/main");
        const auto run = run_tollgate("annotate --from check.json", dir.path());
        CHECK(run.exit_code == 0);
        CHECK(run.err == "tollgate: warning: no comment posted: the pull/merge request number is "
                         "unknown in GitHub Actions (is this a pull/merge request pipeline? give "
                         "--number)\n");
    }
}

TEST_CASE("annotate usage errors", "[annotate][cli]") {
    TempDir dir;
    write_check_json(blocked_change(), dir.path() + "/check.json");
    const auto usage = [&dir](const std::string& args) {
        const auto run = run_tollgate("annotate " + args, dir.path());
        CHECK(run.exit_code == 2);
        return run.err;
    };
    CHECK(usage("--from check.json --platform bitbucket") ==
          "tollgate: error: unknown platform \"bitbucket\" (expected github, gitlab, gitea or "
          "forgejo)\n");
    CHECK(usage("--from check.json --slot 'a b'") ==
          "tollgate: error: slot \"a b\" should be 1 to 64 letters, digits, dots, dashes or "
          "underscores\n");
    CHECK(usage("--from check.json --token-env ghp_abc123-not-a-name") ==
          "tollgate: error: --token-env takes the name of an environment variable (letters, "
          "digits and underscores); the token itself never goes on the command line\n");
    CHECK(usage("--from check.json -- --base main") ==
          "tollgate: error: give either --from REPORT or check's options after \"--\", not "
          "both\n");
    CHECK(usage("--from check.json --body-limit 200") ==
          "tollgate: error: --body-limit should be 0 (the platform's limit) or at least 1000 "
          "bytes\n");
    CHECK(usage("--from missing.json") == "tollgate: error: cannot read report \"missing.json\" "
                                          "(run \"tollgate check --report json:missing.json\" "
                                          "first)\n");
}
