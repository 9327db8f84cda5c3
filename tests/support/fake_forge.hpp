// SPDX-License-Identifier: MIT
// Test support: the fake platform (fake_forge.py, Python's http.server on 127.0.0.1) started
// and stopped by a test, with its request log and comment state readable as JSON.
#pragma once

#include "support/temp_repo.hpp"

#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <sys/types.h>
#include <vector>

namespace tollgate::test {

// A running fake platform; stopped (SIGTERM) at destruction.
class FakeForge {
public:
    // Start the server with `config` (see fake_forge.py: token, seed, faults, slow, per_page_max,
    // diff_lines, ...). With `tls_cert` and `tls_key` it speaks HTTPS. Throws when it does not
    // come up within 10 seconds.
    explicit FakeForge(const nlohmann::json& config, const std::string& tls_cert = {},
                       const std::string& tls_key = {});
    ~FakeForge();
    FakeForge(const FakeForge&) = delete;
    FakeForge& operator=(const FakeForge&) = delete;

    // Return the port it listens on.
    int port() const { return m_port; }
    // Return "http://127.0.0.1:PORT" (or https).
    std::string origin() const;
    // Replace the configuration (read again by the server on its next request).
    void configure(const nlohmann::json& config);
    // Return every request received so far, oldest first.
    std::vector<nlohmann::json> requests() const;
    // Return the requests whose method is `method` and whose path matches `path_pattern`.
    std::vector<nlohmann::json> requests(const std::string& method,
                                         const std::string& path_pattern) const;
    // Return the comments kept under `key` (e.g. "github:octo/gadget#12").
    nlohmann::json comments(const std::string& key) const;
    // Return the folder holding the log, state and configuration.
    const std::string& folder() const { return m_dir.path(); }

private:
    TempDir m_dir;
    pid_t m_pid = -1;
    int m_port = 0;
    bool m_tls = false;
};

// Return true when python3 can be run (the fake platform needs it).
bool python_available();

// Sets environment variables for the scope of a test and restores them after; the CI detection
// variables of every supported CI system are cleared so that a test never reads the
// environment of the machine it runs on.
class ScopedEnvironment {
public:
    ScopedEnvironment();
    ~ScopedEnvironment();
    ScopedEnvironment(const ScopedEnvironment&) = delete;
    ScopedEnvironment& operator=(const ScopedEnvironment&) = delete;
    // Set `name` to `value` until the end of the scope.
    void set(const std::string& name, const std::string& value);

private:
    std::vector<std::pair<std::string, std::optional<std::string>>> m_saved;
    void save(const std::string& name);
};

} // namespace tollgate::test
