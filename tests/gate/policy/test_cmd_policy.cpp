// SPDX-License-Identifier: MIT
// `tollgate policy` end to end: the real binary on policy files in temporary folders, with exit
// codes and error text pinned verbatim.
#include "gate/policy/policy.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>

using tollgate::test::init_repo;
using tollgate::test::run_tollgate;
using tollgate::test::TempDir;

TEST_CASE("tollgate policy validates a policy file", "[policy]") {
    TempDir dir;
    init_repo(dir.path());

    SECTION("a broken policy is exit 2 with every error at file:line:column") {
        dir.write("bad.yaml", "tollgate-policy: 1\nrulez: []\nrules:\n  - id: effort-growth\n"
                              "    kind: growth\n    measure: efort\n    max-increase: 10\n");
        const auto result = run_tollgate("policy bad.yaml", dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.out.empty());
        CHECK(result.err ==
              "tollgate: error: bad.yaml:2:1: unknown key \"rulez\" (did you mean \"rules\"?)\n"
              "tollgate: error: bad.yaml:6:14: unknown measure \"efort\" (did you mean "
              "\"effort\"?)\n");
    }
    SECTION("a YAML syntax error is exit 2 with its position") {
        dir.write("syntax.yaml", "tollgate-policy: 1\nrules: [\n  - id: a\n");
        const auto result = run_tollgate("policy syntax.yaml", dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err ==
              "tollgate: error: syntax.yaml:3:3: invalid YAML: illegal block entry\n");
    }
    SECTION("a valid policy prints its effective values") {
        dir.write("ok.yaml", "tollgate-policy: 1\nrules:\n  - {id: g, kind: growth, measure: "
                             "volume, max-increase-percent: 10}\n");
        const auto result = run_tollgate("policy ok.yaml", dir.path());
        CHECK(result.exit_code == 0);
        CHECK(result.err == "tollgate: ok.yaml is a valid policy\n");
        CHECK(result.out == "# effective policy: ok.yaml\n"
                            "tollgate-policy: 1\njudge-with: base\nnoise-floor: {}\nrules:\n"
                            "  - id: g\n    kind: growth\n    measure: volume\n"
                            "    max-increase-percent: 10\n    level: blocking\n"
                            "paths:\n  include: [\"**\"]\n  exclude: []\n  overrides: []\n"
                            "waivers: []\nbaseline:\n  grandfather: true\n"
                            "inactive-code: judge\nunmeasured-lines: off\n");
    }
    SECTION("without a file, .tollgate.yaml at the repository root is read") {
        dir.write(".tollgate.yaml", "tollgate-policy: 1\njudge-with: head\n");
        dir.write("src/deep/keep.txt", "x\n");
        const auto result = run_tollgate("policy", dir.path() + "/src/deep");
        CHECK(result.exit_code == 0);
        CHECK(result.err == "tollgate: ../../.tollgate.yaml is a valid policy\n");
        CHECK(result.out.find("judge-with: head\n") != std::string::npos);
    }
    SECTION("without any policy file, the built-in default applies") {
        const auto result = run_tollgate("policy", dir.path());
        CHECK(result.exit_code == 0);
        CHECK(result.err == "tollgate: no .tollgate.yaml at the repository root: the built-in "
                            "default policy applies\n");
        CHECK(result.out ==
              "# effective policy: built-in default\n" +
                  tollgate::policy::describe_policy(tollgate::policy::default_policy()));
    }
    SECTION("--default prints the built-in policy with its comments") {
        const auto result = run_tollgate("policy --default", dir.path());
        CHECK(result.exit_code == 0);
        CHECK(result.out == tollgate::policy::default_policy_text());
    }
    SECTION("a missing file is exit 2") {
        const auto result = run_tollgate("policy missing.yaml", dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err == "tollgate: error: cannot read policy file \"missing.yaml\": no such "
                            "file or directory (check the path, or run \"tollgate policy "
                            "--default\" for a start)\n");
    }
}
