// SPDX-License-Identifier: MIT
// Test support: temporary folders, real git repositories built with the git command, and runs of
// the real tollgate binary.
#pragma once

#include <string>

namespace tollgate::test {

// A temporary folder removed at destruction unless the test failed (then its path is printed).
class TempDir {
public:
    TempDir();
    ~TempDir();
    TempDir(const TempDir&) = delete;
    TempDir& operator=(const TempDir&) = delete;
    const std::string& path() const { return m_path; }
    // Write `content` to `relative` (creating folders).
    void write(const std::string& relative, const std::string& content) const;

private:
    std::string m_path;
};

// The result of a command run through the shell.
struct RunResult {
    int exit_code = -1; // the command's exit status
    std::string out;    // its standard output
    std::string err;    // its standard error
};

// Run `command` with /bin/sh in folder `cwd`, capturing stdout and stderr.
RunResult run_command(const std::string& command, const std::string& cwd);

// Run git with `args` in `cwd`; throw std::runtime_error when it fails.
std::string git(const std::string& args, const std::string& cwd);

// Make an empty repository at `dir` with a fixed identity and `main` as the initial branch.
void init_repo(const std::string& dir);

// Stage everything in `dir` and commit with `message`; return the new commit id.
std::string commit_all(const std::string& dir, const std::string& message);

// Return the tollgate binary the integration tests run: the one built with them, or
// $TOLLGATE_TEST_BINARY when set.
std::string tollgate_binary();

// Run tollgate_binary() with `args` in `cwd`.
RunResult run_tollgate(const std::string& args, const std::string& cwd);

// Return the content of the file at `path`.
std::string read_text(const std::string& path);

// Quote `text` for /bin/sh.
std::string shell_quote(const std::string& text);

} // namespace tollgate::test
