// SPDX-License-Identifier: MIT
// `cmake --install` of the build the tests run from: the binary, the manual, the ready policies and
// the CI templates land where gate/install.cmake says, and the installed binary runs.
#include "gate/java/java_front_end.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <string>

namespace fs = std::filesystem;
using tollgate::test::read_text;
using tollgate::test::run_command;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

TEST_CASE("cmake --install puts the binary, manual, policies and templates in place", "[install]") {
    // TOLLGATE_BINARY is BUILD/gate/tollgate.
    const std::string build = fs::path(TOLLGATE_BINARY).parent_path().parent_path().string();
    const std::string source = TOLLGATE_SOURCE_DIR;
    TempDir prefix;
    const auto installed = run_command("cmake --install " + shell_quote(build) + " --prefix " +
                                           shell_quote(prefix.path()),
                                       prefix.path());
    INFO(installed.out << installed.err);
    REQUIRE(installed.exit_code == 0);

    const auto version =
        run_command(shell_quote(prefix.path() + "/bin/tollgate") + " --version", prefix.path());
    CHECK(version.exit_code == 0);
    CHECK(version.out == std::string("tollgate ") + TOLLGATE_VERSION + "\n" +
                             tollgate::java::java_status() + "\n");
    CHECK(read_text(prefix.path() + "/share/man/man1/tollgate.1") ==
          read_text(source + "/gate/cli/tollgate.1"));
    for (const char* policy : {"starter.yaml", "strict.yaml", "legacy.yaml", "README.md"}) {
        INFO(policy);
        CHECK(read_text(prefix.path() + "/share/tollgate/policies/" + policy) ==
              read_text(source + "/policies/" + policy));
    }
    std::size_t templates = 0;
    for (const auto& entry : fs::directory_iterator(source + "/ci-templates")) {
        const std::string name = entry.path().filename().string();
        const std::string copy = prefix.path() + "/share/tollgate/ci-templates/" + name;
        INFO(name);
        CHECK(read_text(copy) == read_text(entry.path().string()));
        CHECK(fs::status(copy).permissions() == fs::status(entry.path()).permissions());
        ++templates;
    }
    CHECK(templates >= 5);
}
