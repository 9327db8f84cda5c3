// SPDX-License-Identifier: MIT
// Which platform hosts the pull/merge request, and where: read from the CI's own environment
// variables, each value overridable by a flag.
#pragma once

#include <functional>
#include <optional>
#include <string>

namespace tollgate::annotate {

// A code-hosting platform whose REST API tollgate can comment through.
enum class Platform {
    github, // GitHub and GitHub Enterprise Server: issue comments of the pull request
    gitlab, // GitLab: merge request notes (REST v4)
    gitea,  // Gitea and Forgejo: issue comments of the pull request (REST v1)
};

// Return "github", "gitlab" or "gitea".
const char* platform_name(Platform platform);

// Return the platform named `name` ("github", "gitlab", "gitea" or "forgejo"), or nothing.
std::optional<Platform> parse_platform(const std::string& name);

// Where one pull/merge request lives. Every field may come from a flag; empty ones are detected.
struct Target {
    std::optional<Platform> platform; // which API to speak
    std::string api_url;      // API root without a trailing slash, e.g. "https://api.github.com",
                              // "https://gitlab.example/api/v4", "https://gitea.example/api/v1"
    std::string repository;   // "owner/name"; on GitLab the project's numeric id or full path
    std::string number;       // the pull request's number, the merge request's iid
    std::string web_url;      // the repository's web page, for file links; may stay empty
    std::string artifact_url; // where the pipeline keeps the full report; may stay empty
    std::string ci;           // the CI system the values were read from, for messages
};

// Reads one environment variable; empty when unset.
using EnvironmentReader = std::function<std::string(const std::string& name)>;

// Return the process environment as an EnvironmentReader.
EnvironmentReader process_environment();

// Fill the empty fields of `given` from the CI's environment: GitHub Actions, Gitea/Forgejo
// Actions, GitLab CI, Woodpecker and Jenkins (from the change's CHANGE_URL). Fields already set
// are kept. Throws PostError naming what is still missing and the flag that gives it.
Target detect_target(const Target& given, const EnvironmentReader& environment);

} // namespace tollgate::annotate
