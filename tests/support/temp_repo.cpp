// SPDX-License-Identifier: MIT
// Test support: temporary folders, git repositories and binary runs.
#include "support/temp_repo.hpp"

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <sys/wait.h>

namespace fs = std::filesystem;

namespace tollgate::test {

TempDir::TempDir() {
    std::string pattern = (fs::temp_directory_path() / "tollgate-test-XXXXXX").string();
    if (mkdtemp(pattern.data()) == nullptr) {
        throw std::runtime_error("cannot create a temporary folder");
    }
    m_path = pattern;
}

TempDir::~TempDir() {
    // TOLLGATE_KEEP_TEMP=1 keeps every temporary folder for a post-mortem and prints its path.
    if (std::getenv("TOLLGATE_KEEP_TEMP") != nullptr) {
        std::fprintf(stderr, "kept temporary folder %s\n", m_path.c_str());
        return;
    }
    std::error_code ec;
    fs::remove_all(m_path, ec);
}

void TempDir::write(const std::string& relative, const std::string& content) const {
    const fs::path target = fs::path(m_path) / relative;
    fs::create_directories(target.parent_path());
    std::ofstream out(target, std::ios::binary);
    out << content;
}

std::string shell_quote(const std::string& text) {
    std::string quoted = "'";
    for (char c : text) {
        if (c == '\'') {
            quoted += "'\\''";
        } else {
            quoted += c;
        }
    }
    return quoted + "'";
}

std::string read_text(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    std::ostringstream buffer;
    buffer << in.rdbuf();
    return buffer.str();
}

RunResult run_command(const std::string& command, const std::string& cwd) {
    TempDir capture;
    const std::string out_path = capture.path() + "/out";
    const std::string err_path = capture.path() + "/err";
    const std::string full = "cd " + shell_quote(cwd) + " && " + command + " >" +
                             shell_quote(out_path) + " 2>" + shell_quote(err_path) + " </dev/null";
    const int status = std::system(full.c_str());
    RunResult result;
    result.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    result.out = read_text(out_path);
    result.err = read_text(err_path);
    return result;
}

std::string git(const std::string& args, const std::string& cwd) {
    const RunResult result = run_command("git " + args, cwd);
    if (result.exit_code != 0) {
        throw std::runtime_error("git " + args + " failed in " + cwd + ": " + result.err);
    }
    return result.out;
}

void init_repo(const std::string& dir) {
    fs::create_directories(dir);
    git("init -q -b main", dir);
    git("config user.name 'Test Author'", dir);
    git("config user.email test@example.invalid", dir);
    git("config commit.gpgsign false", dir);
}

std::string commit_all(const std::string& dir, const std::string& message) {
    git("add -A", dir);
    git("commit -q --allow-empty -m " + shell_quote(message), dir);
    std::string id = git("rev-parse HEAD", dir);
    while (!id.empty() && (id.back() == '\n' || id.back() == '\r')) {
        id.pop_back();
    }
    return id;
}

std::string tollgate_binary() {
    // TOLLGATE_TEST_BINARY runs the integration tests against another build (an older binary,
    // to see a regression test fail there).
    const char* other = std::getenv("TOLLGATE_TEST_BINARY");
    return other != nullptr && *other != '\0' ? other : TOLLGATE_BINARY;
}

RunResult run_tollgate(const std::string& args, const std::string& cwd) {
    return run_command(shell_quote(tollgate_binary()) + " " + args, cwd);
}

} // namespace tollgate::test
