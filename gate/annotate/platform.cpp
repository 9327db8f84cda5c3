// SPDX-License-Identifier: MIT
// Detecting the platform and the pull/merge request from the CI's environment variables.
// The variable names are the CI systems' documented ones, recalled here (`from memory`):
// GitHub Actions "Variables reference" (GITHUB_ACTIONS, GITHUB_API_URL, GITHUB_SERVER_URL,
// GITHUB_REPOSITORY, GITHUB_REF, GITHUB_EVENT_PATH, GITHUB_RUN_ID); Gitea/Forgejo Actions set the
// same GITHUB_* names plus GITEA_ACTIONS / FORGEJO_ACTIONS; GitLab CI "Predefined CI/CD variables
// reference" (GITLAB_CI, CI_API_V4_URL, CI_PROJECT_ID, CI_MERGE_REQUEST_IID, CI_PROJECT_URL,
// CI_JOB_URL); Woodpecker "Environment variables" (CI=woodpecker, CI_FORGE_TYPE, CI_FORGE_URL,
// CI_REPO, CI_COMMIT_PULL_REQUEST, CI_REPO_URL, CI_PIPELINE_URL); Jenkins branch sources
// (JENKINS_URL, CHANGE_ID, CHANGE_URL, BUILD_URL).
#include "gate/annotate/platform.hpp"

#include "gate/annotate/http_client.hpp"

#include <cstdlib>
#include <fstream>
#include <nlohmann/json.hpp>

namespace tollgate::annotate {

namespace {

// Return `url` without trailing slashes.
std::string without_trailing_slash(std::string url) {
    while (!url.empty() && url.back() == '/') {
        url.pop_back();
    }
    return url;
}

// Return the number in "refs/pull/123/merge" (or ".../head"), or empty.
std::string pull_number_from_ref(const std::string& ref) {
    const std::string prefix = "refs/pull/";
    if (ref.rfind(prefix, 0) != 0) {
        return {};
    }
    const auto end = ref.find('/', prefix.size());
    const std::string number = ref.substr(prefix.size(), end - prefix.size());
    return number.find_first_not_of("0123456789") == std::string::npos ? number : std::string();
}

// Return pull_request.number (or number, for issue-comment events) of the event file, or empty.
std::string pull_number_from_event(const std::string& path) {
    if (path.empty()) {
        return {};
    }
    std::ifstream in(path);
    const auto event = nlohmann::json::parse(in, nullptr, false);
    if (event.is_discarded() || !event.is_object()) {
        return {};
    }
    for (const char* key : {"pull_request", "issue"}) {
        const auto it = event.find(key);
        if (it != event.end() && it->is_object() && it->contains("number") &&
            (*it)["number"].is_number_unsigned()) {
            return std::to_string((*it)["number"].get<unsigned long long>());
        }
    }
    return {};
}

void fill(std::string& field, const std::string& value) {
    if (field.empty()) {
        field = value;
    }
}

void from_github_actions(Target& t, const EnvironmentReader& env, Platform platform) {
    const std::string server = without_trailing_slash(env("GITHUB_SERVER_URL"));
    t.platform = t.platform.value_or(platform);
    std::string api = env("GITHUB_API_URL");
    if (api.empty() && platform == Platform::gitea && !server.empty()) {
        api = server + "/api/v1";
    }
    fill(t.api_url, api);
    fill(t.repository, env("GITHUB_REPOSITORY"));
    std::string number = pull_number_from_ref(env("GITHUB_REF"));
    if (number.empty()) {
        number = pull_number_from_event(env("GITHUB_EVENT_PATH"));
    }
    fill(t.number, number);
    if (!server.empty() && !env("GITHUB_REPOSITORY").empty()) {
        fill(t.web_url, server + "/" + env("GITHUB_REPOSITORY"));
        if (platform == Platform::github && !env("GITHUB_RUN_ID").empty()) {
            fill(t.artifact_url,
                 server + "/" + env("GITHUB_REPOSITORY") + "/actions/runs/" + env("GITHUB_RUN_ID"));
        }
    }
}

void from_gitlab_ci(Target& t, const EnvironmentReader& env) {
    t.platform = t.platform.value_or(Platform::gitlab);
    fill(t.api_url, env("CI_API_V4_URL"));
    fill(t.repository, env("CI_PROJECT_ID"));
    fill(t.number, env("CI_MERGE_REQUEST_IID"));
    fill(t.web_url, env("CI_PROJECT_URL"));
    if (!env("CI_JOB_URL").empty()) {
        fill(t.artifact_url, without_trailing_slash(env("CI_JOB_URL")) + "/artifacts/browse");
    }
}

// The API root of a GitHub host: github.com's own API host, or Enterprise Server's /api/v3.
std::string github_api_for(const std::string& origin) {
    return origin == "https://github.com" ? "https://api.github.com" : origin + "/api/v3";
}

void from_woodpecker(Target& t, const EnvironmentReader& env) {
    const std::string forge = env("CI_FORGE_TYPE");
    const std::string origin = without_trailing_slash(env("CI_FORGE_URL"));
    if (forge == "gitea" || forge == "forgejo") {
        t.platform = t.platform.value_or(Platform::gitea);
        fill(t.api_url, origin.empty() ? std::string() : origin + "/api/v1");
    } else if (forge == "github") {
        t.platform = t.platform.value_or(Platform::github);
        fill(t.api_url, origin.empty() ? std::string() : github_api_for(origin));
    } else if (forge == "gitlab") {
        t.platform = t.platform.value_or(Platform::gitlab);
        fill(t.api_url, origin.empty() ? std::string() : origin + "/api/v4");
    }
    fill(t.repository, env("CI_REPO"));
    fill(t.number, env("CI_COMMIT_PULL_REQUEST"));
    fill(t.web_url, env("CI_REPO_URL"));
    fill(t.artifact_url, env("CI_PIPELINE_URL"));
}

// Jenkins only says where the change lives as a web URL (CHANGE_URL); its shape names the
// platform: ".../owner/name/pull/12" GitHub, ".../group/name/-/merge_requests/12" GitLab,
// ".../owner/name/pulls/12" Gitea or Forgejo.
void from_jenkins(Target& t, const EnvironmentReader& env) {
    const std::string change_url = without_trailing_slash(env("CHANGE_URL"));
    const std::string origin = url_origin(change_url);
    fill(t.number, env("CHANGE_ID"));
    if (!env("BUILD_URL").empty()) {
        fill(t.artifact_url, without_trailing_slash(env("BUILD_URL")) + "/artifact/");
    }
    if (origin.empty()) {
        return;
    }
    std::string path = change_url.substr(change_url.find("://") + 3);
    path = path.substr(std::min(path.size(), path.find('/') + 1));
    struct Shape {
        const char* separator;
        Platform platform;
    };
    for (const Shape& shape :
         {Shape{"/-/merge_requests/", Platform::gitlab}, Shape{"/pulls/", Platform::gitea},
          Shape{"/pull/", Platform::github}}) {
        const auto at = path.rfind(shape.separator);
        if (at == std::string::npos || at == 0) {
            continue;
        }
        const std::string repository = path.substr(0, at);
        t.platform = t.platform.value_or(shape.platform);
        fill(t.repository, repository);
        fill(t.web_url, origin + "/" + repository);
        switch (shape.platform) {
        case Platform::github:
            fill(t.api_url, github_api_for(origin));
            break;
        case Platform::gitlab:
            fill(t.api_url, origin + "/api/v4");
            break;
        case Platform::gitea:
            fill(t.api_url, origin + "/api/v1");
            break;
        }
        return;
    }
}

} // namespace

const char* platform_name(Platform platform) {
    switch (platform) {
    case Platform::github:
        return "github";
    case Platform::gitlab:
        return "gitlab";
    case Platform::gitea:
        return "gitea";
    }
    return "github";
}

std::optional<Platform> parse_platform(const std::string& name) {
    if (name == "github") {
        return Platform::github;
    }
    if (name == "gitlab") {
        return Platform::gitlab;
    }
    if (name == "gitea" || name == "forgejo") {
        return Platform::gitea;
    }
    return std::nullopt;
}

EnvironmentReader process_environment() {
    return [](const std::string& name) {
        const char* value = std::getenv(name.c_str());
        return value == nullptr ? std::string() : std::string(value);
    };
}

Target detect_target(const Target& given, const EnvironmentReader& env) {
    Target t = given;
    if (env("GITEA_ACTIONS") == "true" || env("FORGEJO_ACTIONS") == "true") {
        from_github_actions(t, env, Platform::gitea);
        t.ci = env("FORGEJO_ACTIONS") == "true" ? "Forgejo Actions" : "Gitea Actions";
    } else if (env("GITHUB_ACTIONS") == "true") {
        from_github_actions(t, env, Platform::github);
        t.ci = "GitHub Actions";
    } else if (env("GITLAB_CI") == "true") {
        from_gitlab_ci(t, env);
        t.ci = "GitLab CI";
    } else if (env("CI") == "woodpecker") {
        from_woodpecker(t, env);
        t.ci = "Woodpecker";
    } else if (!env("JENKINS_URL").empty()) {
        from_jenkins(t, env);
        t.ci = "Jenkins";
    }
    t.api_url = without_trailing_slash(t.api_url);
    if (!t.platform) {
        throw PostError("cannot tell which platform hosts the change: no CI environment was "
                        "recognised (give --platform, --api-url, --repository and --number)");
    }
    if (t.api_url.empty() && *t.platform == Platform::github) {
        t.api_url = "https://api.github.com";
    }
    const std::string where = t.ci.empty() ? std::string() : " in " + t.ci;
    if (t.api_url.empty()) {
        throw PostError("the platform's API address is unknown" + where + " (give --api-url)");
    }
    if (t.repository.empty()) {
        throw PostError("the repository is unknown" + where + " (give --repository)");
    }
    if (t.number.empty()) {
        throw PostError("the pull/merge request number is unknown" + where +
                        " (is this a pull/merge request pipeline? give --number)");
    }
    if (t.number.find_first_not_of("0123456789") != std::string::npos) {
        throw PostError("the pull/merge request number \"" + t.number + "\" is not a number");
    }
    return t;
}

} // namespace tollgate::annotate
