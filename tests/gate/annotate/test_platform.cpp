// SPDX-License-Identifier: MIT
// Detecting the platform and the pull/merge request from CI environment variables. The variable
// names and value shapes are the CI systems' documented ones, recalled (`from memory`): GitHub
// Actions "Variables reference", GitLab "Predefined CI/CD variables reference", Woodpecker
// "Environment variables", Jenkins branch-source CHANGE_* variables.
#include "gate/annotate/http_client.hpp"
#include "gate/annotate/platform.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <map>

using namespace tollgate::annotate;

namespace {

EnvironmentReader environment(const std::map<std::string, std::string>& values) {
    return [values](const std::string& name) {
        const auto it = values.find(name);
        return it == values.end() ? std::string() : it->second;
    };
}

} // namespace

TEST_CASE("detect_target", "[annotate]") {
    SECTION("GitHub Actions: the number from refs/pull/N/merge, the run page for artifacts") {
        const Target t =
            detect_target({}, environment({{"GITHUB_ACTIONS", "true"},
                                           {"GITHUB_API_URL", "https://api.github.com"},
                                           {"GITHUB_SERVER_URL", "https://github.com"},
                                           {"GITHUB_REPOSITORY", "octo/gadget"},
                                           {"GITHUB_REF", "refs/pull/12/merge"},
                                           {"GITHUB_RUN_ID", "9001"}}));
        CHECK(*t.platform == Platform::github);
        CHECK(t.api_url == "https://api.github.com");
        CHECK(t.repository == "octo/gadget");
        CHECK(t.number == "12");
        CHECK(t.web_url == "https://github.com/octo/gadget");
        CHECK(t.artifact_url == "https://github.com/octo/gadget/actions/runs/9001");
        CHECK(t.ci == "GitHub Actions");
    }
    SECTION("GitHub Actions: without a pull ref the event file gives the number") {
        tollgate::test::TempDir dir;
        dir.write("event.json", R"({"action": "synchronize", "pull_request": {"number": 34}})");
        const Target t =
            detect_target({}, environment({{"GITHUB_ACTIONS", "true"},
                                           {"GITHUB_REPOSITORY", "octo/gadget"},
                                           {"GITHUB_REF", "refs/heads/main"},
                                           {"GITHUB_EVENT_PATH", dir.path() + "/event.json"}}));
        CHECK(t.number == "34");
        CHECK(t.api_url == "https://api.github.com");
    }
    SECTION("Gitea and Forgejo Actions speak the GITHUB_* names but the Gitea API") {
        const Target t =
            detect_target({}, environment({{"GITHUB_ACTIONS", "true"},
                                           {"FORGEJO_ACTIONS", "true"},
                                           {"GITHUB_SERVER_URL", "https://code.example"},
                                           {"GITHUB_REPOSITORY", "team/sensors"},
                                           {"GITHUB_REF", "refs/pull/5/head"}}));
        CHECK(*t.platform == Platform::gitea);
        CHECK(t.api_url == "https://code.example/api/v1");
        CHECK(t.number == "5");
        CHECK(t.ci == "Forgejo Actions");
    }
    SECTION("GitLab CI: project id and merge request iid, the job's artifacts page") {
        const Target t = detect_target(
            {}, environment({{"GITLAB_CI", "true"},
                             {"CI_API_V4_URL", "https://gitlab.example/api/v4"},
                             {"CI_PROJECT_ID", "42"},
                             {"CI_MERGE_REQUEST_IID", "7"},
                             {"CI_PROJECT_URL", "https://gitlab.example/team/sensors"},
                             {"CI_JOB_URL", "https://gitlab.example/team/sensors/-/jobs/55"}}));
        CHECK(*t.platform == Platform::gitlab);
        CHECK(t.repository == "42");
        CHECK(t.number == "7");
        CHECK(t.artifact_url == "https://gitlab.example/team/sensors/-/jobs/55/artifacts/browse");
    }
    SECTION("Jenkins: CHANGE_URL's shape names the platform") {
        const auto jenkins = [](const std::string& change_url) {
            return detect_target({}, environment({{"JENKINS_URL", "https://ci.example/"},
                                                  {"CHANGE_ID", "8"},
                                                  {"CHANGE_URL", change_url},
                                                  {"BUILD_URL", "https://ci.example/job/x/3/"}}));
        };
        const Target github = jenkins("https://github.com/octo/gadget/pull/8");
        CHECK(*github.platform == Platform::github);
        CHECK(github.api_url == "https://api.github.com");
        CHECK(github.repository == "octo/gadget");
        CHECK(github.artifact_url == "https://ci.example/job/x/3/artifact/");
        const Target enterprise = jenkins("https://ghe.example/octo/gadget/pull/8");
        CHECK(enterprise.api_url == "https://ghe.example/api/v3");
        const Target gitlab = jenkins("https://gitlab.example/team/fw/sensors/-/merge_requests/8");
        CHECK(*gitlab.platform == Platform::gitlab);
        CHECK(gitlab.api_url == "https://gitlab.example/api/v4");
        CHECK(gitlab.repository == "team/fw/sensors");
        const Target gitea = jenkins("https://code.example/team/sensors/pulls/8");
        CHECK(*gitea.platform == Platform::gitea);
        CHECK(gitea.api_url == "https://code.example/api/v1");
        CHECK(gitea.web_url == "https://code.example/team/sensors");
    }
    SECTION("Woodpecker with a Forgejo forge") {
        const Target t = detect_target({}, environment({{"CI", "woodpecker"},
                                                        {"CI_FORGE_TYPE", "forgejo"},
                                                        {"CI_FORGE_URL", "https://code.example"},
                                                        {"CI_REPO", "team/sensors"},
                                                        {"CI_COMMIT_PULL_REQUEST", "3"}}));
        CHECK(*t.platform == Platform::gitea);
        CHECK(t.api_url == "https://code.example/api/v1");
        CHECK(t.number == "3");
    }
    SECTION("flags win over the environment") {
        Target given;
        given.number = "99";
        given.api_url = "https://mirror.example/api/v4/";
        const Target t = detect_target(given, environment({{"GITLAB_CI", "true"},
                                                           {"CI_API_V4_URL", "https://x/api/v4"},
                                                           {"CI_PROJECT_ID", "42"},
                                                           {"CI_MERGE_REQUEST_IID", "7"}}));
        CHECK(t.number == "99");
        CHECK(t.api_url == "https://mirror.example/api/v4");
    }
    SECTION("what is missing is named with the flag that gives it") {
        CHECK_THROWS_WITH(detect_target({}, environment({})),
                          "cannot tell which platform hosts the change: no CI environment was "
                          "recognised (give --platform, --api-url, --repository and --number)");
        CHECK_THROWS_WITH(
            detect_target({}, environment({{"GITLAB_CI", "true"},
                                           {"CI_API_V4_URL", "https://gitlab.example/api/v4"},
                                           {"CI_PROJECT_ID", "42"}})),
            "the pull/merge request number is unknown in GitLab CI (is this a pull/merge request "
            "pipeline? give --number)");
        Target given;
        given.platform = Platform::gitea;
        given.repository = "a/b";
        given.number = "1";
        CHECK_THROWS_WITH(detect_target(given, environment({})),
                          "the platform's API address is unknown (give --api-url)");
        given.api_url = "https://code.example/api/v1";
        given.number = "1; rm";
        CHECK_THROWS_WITH(detect_target(given, environment({})),
                          "the pull/merge request number \"1; rm\" is not a number");
    }
}

TEST_CASE("url_allowed", "[annotate]") {
    SECTION("https goes anywhere") {
        CHECK(url_allowed("https://api.github.com/repos/o/r"));
        CHECK(url_allowed("HTTPS://gitlab.example:8443/api/v4"));
    }
    SECTION("plain http only to loopback") {
        CHECK(url_allowed("http://127.0.0.1:8080/x"));
        CHECK(url_allowed("http://127.5.4.3/x"));
        CHECK(url_allowed("http://localhost:9/x"));
        CHECK(url_allowed("http://[::1]:9/x"));
        CHECK_FALSE(url_allowed("http://gitlab.example/api/v4"));
        CHECK_FALSE(url_allowed("http://10.0.0.1/x"));
        CHECK_FALSE(url_allowed("http://127.0.0.1.evil.example/x"));
        CHECK_FALSE(url_allowed("http://localhost.evil.example/x"));
        CHECK_FALSE(url_allowed("http://127.0.0.1@evil.example/x"));
    }
    SECTION("other schemes and credentials in the URL never") {
        CHECK_FALSE(url_allowed("ftp://127.0.0.1/x"));
        CHECK_FALSE(url_allowed("file:///etc/passwd"));
        CHECK_FALSE(url_allowed("https://user:pw@gitlab.example/"));
        CHECK_FALSE(url_allowed("gitlab.example/api"));
    }
    SECTION("origins compare scheme, host and port, default ports folded") {
        CHECK(url_origin("https://API.github.com:443/repos?page=2") == "https://api.github.com");
        CHECK(url_origin("http://127.0.0.1:8080/a") == "http://127.0.0.1:8080");
        CHECK(url_origin("https://evil.example/x") != url_origin("https://api.github.com/x"));
    }
}

TEST_CASE("retry_after_seconds", "[annotate]") {
    // RFC 9110 "HTTP Semantics" (Fielding, Nottingham, Reschke, 2022), section 10.2.3
    // Retry-After: delay-seconds or an HTTP-date; the date form is section 5.6.7's IMF-fixdate,
    // whose example is "Sun, 06 Nov 1994 08:49:37 GMT" (`from memory`).
    const auto now = std::chrono::system_clock::from_time_t(784111717); // 1994-11-06 08:48:37
    CHECK(retry_after_seconds("120", now) == 120);
    CHECK(retry_after_seconds(" 0 ", now) == 0);
    CHECK(retry_after_seconds("Sun, 06 Nov 1994 08:49:37 GMT", now) == 60);
    CHECK(retry_after_seconds("Sun, 06 Nov 1994 08:40:00 GMT", now) == 0);
    CHECK(retry_after_seconds("soon", now) == -1);
    CHECK(retry_after_seconds("", now) == -1);
    CHECK(retry_after_seconds("-5", now) == -1);
}

TEST_CASE("redact", "[annotate]") {
    CHECK(redact("Bearer s3cr3t and s3cr3t again", "s3cr3t") == "Bearer [token] and [token] again");
    CHECK(redact("nothing here", "") == "nothing here");
}
