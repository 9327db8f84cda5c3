// SPDX-License-Identifier: MIT
// Test support for the annotate command's tests: runs of the real binary against the fake
// platform, with the token in the environment and the CI variables of the machine cleared.
#pragma once

#include "gate/annotate/sample_change.hpp"
#include "support/fake_forge.hpp"
#include "support/temp_repo.hpp"

#include <regex>
#include <string>

namespace tollgate::test {

// The token the fake platform accepts; long and unusual so that any leak is found by search.
inline const char* const k_annotate_token = "tgtok-7f3a9c1e5b2d4086a1c3e5f7";

// Return the flags that point annotate at `forge` as `platform` ("github", "gitlab", "gitea").
inline std::string target_flags(const FakeForge& forge, const std::string& platform) {
    if (platform == "gitlab") {
        return "--platform gitlab --api-url " + forge.origin() +
               "/api/v4 --repository team/sensors --number 7";
    }
    if (platform == "gitea") {
        return "--platform gitea --api-url " + forge.origin() +
               "/api/v1 --repository team/sensors --number 5";
    }
    return "--platform github --api-url " + forge.origin() +
           " --repository octo/gadget --number 12";
}

// Run "tollgate annotate --from check.json" of `change` in `dir` against `forge`, with the
// token in TOLLGATE_ANNOTATE_TOKEN and retries waiting 10 ms instead of seconds.
inline RunResult run_annotate(const FakeForge& forge, const TempDir& dir,
                              const annotate::CheckedChange& change,
                              const std::string& platform = "github",
                              const std::string& extra = "") {
    write_check_json(change, dir.path() + "/check.json");
    ScopedEnvironment environment;
    environment.set("TOLLGATE_ANNOTATE_TOKEN", k_annotate_token);
    environment.set("TOLLGATE_TEST_BACKOFF_MS", "10");
    return run_tollgate("annotate --from check.json " + target_flags(forge, platform) +
                            (extra.empty() ? "" : " " + extra),
                        dir.path());
}

// Return how many times `what` occurs in `text`.
inline std::size_t occurrences(const std::string& text, const std::string& what) {
    std::size_t n = 0;
    for (auto pos = text.find(what); pos != std::string::npos; pos = text.find(what, pos + 1)) {
        ++n;
    }
    return n;
}

} // namespace tollgate::test
