// SPDX-License-Identifier: MIT
// The confinement decision (check_path) in a forked child, so the test process itself stays
// unconfined, and the system include roots against clang's own include search list.
#include "gate/isolate/path_guard.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <cerrno>
#include <filesystem>
#include <functional>
#include <sstream>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

using namespace tollgate;
using isolate::check_path;
using isolate::PathUse;

namespace {

namespace fs = std::filesystem;

// Confine a forked child to `policy`, run check_path on each of `paths` for `use`, and return
// the results (0 or an errno value) in order.
std::vector<int> checks_in_child(const isolate::PathPolicy& policy,
                                 const std::vector<std::string>& paths, PathUse use) {
    int channel[2];
    REQUIRE(::pipe(channel) == 0);
    const pid_t child = ::fork();
    REQUIRE(child >= 0);
    if (child == 0) {
        ::close(channel[0]);
        isolate::confine_paths(policy);
        for (const auto& path : paths) {
            const int result = check_path(path.c_str(), use, nullptr);
            if (::write(channel[1], &result, sizeof result) != sizeof result) {
                _exit(2);
            }
        }
        _exit(0);
    }
    ::close(channel[1]);
    std::vector<int> results;
    int result = 0;
    while (::read(channel[0], &result, sizeof result) == sizeof result) {
        results.push_back(result);
    }
    ::close(channel[0]);
    int status = 0;
    ::waitpid(child, &status, 0);
    REQUIRE(WIFEXITED(status));
    REQUIRE(WEXITSTATUS(status) == 0);
    REQUIRE(results.size() == paths.size());
    return results;
}

// The folders of clang's "#include <...> search starts here:" list for `language`.
std::vector<std::string> clang_search_list(const std::string& language) {
    // clang prints the list on standard error.
    const auto run = test::run_command("/usr/bin/clang-14 -E -x " + language + " - -v", ".");
    std::vector<std::string> folders;
    std::istringstream in(run.err);
    bool inside = false;
    for (std::string line; std::getline(in, line);) {
        if (line == "#include <...> search starts here:") {
            inside = true;
        } else if (line == "End of search list.") {
            inside = false;
        } else if (inside && line.size() > 1 && line[0] == ' ') {
            folders.push_back(line.substr(1));
        }
    }
    return folders;
}

} // namespace

TEST_CASE("system_include_roots", "[isolate]") {
    SECTION("every folder clang-14 searches for <...> includes may be read") {
        // Reference tool: clang's own include search list, `clang-14 -E -x c++ - -v </dev/null`
        // (and -x c), which is what libclang 14 searches on this machine.
        if (test::run_command("/usr/bin/clang-14 --version", ".").exit_code != 0) {
            WARN("clang-14 is missing (install clang-14): search list comparison skipped");
            return;
        }
        for (const std::string language : {"c++", "c"}) {
            const auto folders = clang_search_list(language);
            INFO(language);
            REQUIRE(folders.size() >= 3);
            const auto results =
                checks_in_child({isolate::system_include_roots(), {}}, folders, PathUse::read);
            for (std::size_t i = 0; i < folders.size(); ++i) {
                INFO(folders[i]);
                CHECK(results[i] == 0);
            }
        }
    }
    SECTION("host files outside them may not") {
        const auto results = checks_in_child(
            {isolate::system_include_roots(), {}},
            {"/etc/passwd", "/proc/self/environ", "/dev/zero", "/usr/include/../../etc/passwd"},
            PathUse::read);
        CHECK(results == std::vector<int>{ENOENT, ENOENT, ENOENT, ENOENT});
    }
}

TEST_CASE("check_path", "[isolate]") {
    test::TempDir dir;
    const std::string root = dir.path() + "/root";
    const std::string outside = dir.path() + "/outside";
    dir.write("root/inc/a.h", "int a;\n");
    dir.write("outside/secret.h", "int secret;\n");
    fs::create_symlink(outside + "/secret.h", root + "/inc/link.h");
    fs::create_symlink(outside, root + "/linked");
    REQUIRE(::mkfifo((root + "/inc/fifo.h").c_str(), 0600) == 0);
    const isolate::PathPolicy policy{{root}, {root + "/inc"}};

    SECTION("a file under a root may be read, by its own path or a relative-looking one") {
        const auto results = checks_in_child(
            policy, {root + "/inc/a.h", root + "/inc/../inc/a.h", root}, PathUse::read);
        CHECK(results == std::vector<int>{0, 0, 0});
    }
    SECTION("a path that leaves the root, by .., a symlink or an absolute name, is refused") {
        const auto results =
            checks_in_child(policy,
                            {root + "/inc/../../outside/secret.h", root + "/inc/link.h",
                             root + "/linked/secret.h", outside + "/secret.h"},
                            PathUse::read);
        CHECK(results == std::vector<int>{ENOENT, ENOENT, ENOENT, ENOENT});
    }
    SECTION("a FIFO or device is refused even under a root") {
        const auto fifo = checks_in_child(policy, {root + "/inc/fifo.h"}, PathUse::read);
        CHECK(fifo == std::vector<int>{ENOENT});
        const auto device =
            checks_in_child({{"/dev"}, {}}, {"/dev/zero", "/dev/null"}, PathUse::read);
        CHECK(device == std::vector<int>{ENOENT, ENOENT});
    }
    SECTION("the folders above a root may be inspected but not read") {
        CHECK(checks_in_child(policy, {dir.path(), "/"}, PathUse::inspect) ==
              std::vector<int>{0, 0});
        CHECK(checks_in_child(policy, {dir.path()}, PathUse::read) == std::vector<int>{ENOENT});
        CHECK(checks_in_child(policy, {outside}, PathUse::inspect) == std::vector<int>{ENOENT});
    }
    SECTION("writes are allowed in a write root only, never through a symlink") {
        const auto results = checks_in_child(
            policy,
            {root + "/inc/new.pch", root + "/new.pch", outside + "/new.pch", root + "/inc/link.h"},
            PathUse::write);
        CHECK(results == std::vector<int>{0, EACCES, EACCES, EACCES});
    }
    SECTION("an unconfined process may use every path") {
        CHECK(check_path("/etc/passwd", PathUse::read, nullptr) == 0);
        CHECK_FALSE(isolate::paths_confined());
    }
}

TEST_CASE("interposer_bound", "[isolate]") {
    SECTION("the test program does not carry the wrappers, so it reports them unbound") {
        // The tollgate executable does; its parser processes refuse to start otherwise.
        CHECK_FALSE(isolate::interposer_bound());
    }
}
