// SPDX-License-Identifier: MIT
// Test support: starting, reading and stopping the fake platform.
#include "support/fake_forge.hpp"

#include <chrono>
#include <csignal>
#include <cstdlib>
#include <fcntl.h>
#include <fstream>
#include <regex>
#include <sstream>
#include <stdexcept>
#include <sys/wait.h>
#include <thread>
#include <unistd.h>

namespace tollgate::test {

namespace {

const std::string k_script =
    std::string(TOLLGATE_SOURCE_DIR) + "/tests/gate/annotate/fake_forge.py";

void write_file(const std::string& path, const std::string& content) {
    const std::string temporary = path + ".tmp";
    {
        std::ofstream out(temporary, std::ios::binary | std::ios::trunc);
        out << content;
    }
    std::rename(temporary.c_str(), path.c_str());
}

} // namespace

FakeForge::FakeForge(const nlohmann::json& config, const std::string& tls_cert,
                     const std::string& tls_key)
    : m_tls(!tls_cert.empty()) {
    configure(config);
    const std::string log = m_dir.path() + "/requests.jsonl";
    write_file(log, "");
    std::vector<std::string> argv = {"python3",     k_script,
                                     "--config",    m_dir.path() + "/config.json",
                                     "--log",       log,
                                     "--state",     m_dir.path() + "/state.json",
                                     "--port-file", m_dir.path() + "/port",
                                     "--lifetime",  "300"};
    if (m_tls) {
        argv.insert(argv.end(), {"--tls-cert", tls_cert, "--tls-key", tls_key});
    }
    std::vector<char*> args;
    for (auto& arg : argv) {
        args.push_back(arg.data());
    }
    args.push_back(nullptr);
    const std::string errors = m_dir.path() + "/server.err";
    m_pid = ::fork();
    if (m_pid == 0) {
        const int fd = ::open(errors.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0600);
        if (fd >= 0) {
            ::dup2(fd, STDOUT_FILENO);
            ::dup2(fd, STDERR_FILENO);
        }
        ::execvp(args[0], args.data());
        _exit(127);
    }
    if (m_pid < 0) {
        throw std::runtime_error("cannot start the fake platform");
    }
    const auto deadline = std::chrono::steady_clock::now() + std::chrono::seconds(10);
    while (std::chrono::steady_clock::now() < deadline) {
        const std::string port = read_text(m_dir.path() + "/port");
        if (!port.empty()) {
            m_port = std::stoi(port);
            return;
        }
        int status = 0;
        if (::waitpid(m_pid, &status, WNOHANG) == m_pid) {
            m_pid = -1;
            throw std::runtime_error("the fake platform stopped: " + read_text(errors));
        }
        std::this_thread::sleep_for(std::chrono::milliseconds(20));
    }
    throw std::runtime_error("the fake platform did not start within 10 seconds");
}

FakeForge::~FakeForge() {
    if (m_pid > 0) {
        ::kill(m_pid, SIGTERM);
        int status = 0;
        ::waitpid(m_pid, &status, 0);
    }
}

std::string FakeForge::origin() const {
    return std::string(m_tls ? "https" : "http") + "://127.0.0.1:" + std::to_string(m_port);
}

void FakeForge::configure(const nlohmann::json& config) {
    write_file(m_dir.path() + "/config.json", config.dump());
}

std::vector<nlohmann::json> FakeForge::requests() const {
    std::vector<nlohmann::json> out;
    std::istringstream in(read_text(m_dir.path() + "/requests.jsonl"));
    for (std::string line; std::getline(in, line);) {
        if (!line.empty()) {
            out.push_back(nlohmann::json::parse(line));
        }
    }
    return out;
}

std::vector<nlohmann::json> FakeForge::requests(const std::string& method,
                                                const std::string& path_pattern) const {
    const std::regex pattern(path_pattern);
    std::vector<nlohmann::json> out;
    for (const auto& request : requests()) {
        if (request["method"] == method &&
            std::regex_match(request["path"].get<std::string>(), pattern)) {
            out.push_back(request);
        }
    }
    return out;
}

nlohmann::json FakeForge::comments(const std::string& key) const {
    const std::string text = read_text(m_dir.path() + "/state.json");
    if (text.empty()) {
        return nlohmann::json::array();
    }
    const auto state = nlohmann::json::parse(text);
    return state.contains(key) ? state[key] : nlohmann::json::array();
}

bool python_available() {
    return std::system("python3 -c 'import http.server' >/dev/null 2>&1") == 0;
}

ScopedEnvironment::ScopedEnvironment() {
    for (const char* name : {"GITHUB_ACTIONS",
                             "GITHUB_API_URL",
                             "GITHUB_SERVER_URL",
                             "GITHUB_REPOSITORY",
                             "GITHUB_REF",
                             "GITHUB_EVENT_PATH",
                             "GITHUB_RUN_ID",
                             "GITEA_ACTIONS",
                             "FORGEJO_ACTIONS",
                             "GITLAB_CI",
                             "CI_API_V4_URL",
                             "CI_PROJECT_ID",
                             "CI_MERGE_REQUEST_IID",
                             "CI_PROJECT_URL",
                             "CI_JOB_URL",
                             "CI",
                             "CI_FORGE_TYPE",
                             "CI_FORGE_URL",
                             "CI_REPO",
                             "CI_COMMIT_PULL_REQUEST",
                             "JENKINS_URL",
                             "CHANGE_ID",
                             "CHANGE_URL",
                             "BUILD_URL",
                             "TOLLGATE_ANNOTATE_TOKEN",
                             "TOLLGATE_TEST_BACKOFF_MS"}) {
        save(name);
        ::unsetenv(name);
    }
}

ScopedEnvironment::~ScopedEnvironment() {
    for (auto it = m_saved.rbegin(); it != m_saved.rend(); ++it) {
        if (it->second) {
            ::setenv(it->first.c_str(), it->second->c_str(), 1);
        } else {
            ::unsetenv(it->first.c_str());
        }
    }
}

void ScopedEnvironment::save(const std::string& name) {
    const char* value = std::getenv(name.c_str());
    m_saved.emplace_back(name, value == nullptr ? std::nullopt : std::optional<std::string>(value));
}

void ScopedEnvironment::set(const std::string& name, const std::string& value) {
    save(name);
    ::setenv(name.c_str(), value.c_str(), 1);
}

} // namespace tollgate::test
