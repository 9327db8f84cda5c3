// SPDX-License-Identifier: MIT
// Replays every input the policy-loader fuzzer kept (tests/fuzz/regressions/policy/): each must
// load or throw PolicyError, and a loaded policy must survive describe_policy and load back equal.
#include "gate/policy/policy.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>

using namespace tollgate::policy;

TEST_CASE("load_policy survives the fuzzer's regression inputs", "[policy]") {
    namespace fs = std::filesystem;
    const fs::path folder =
        fs::path(TOLLGATE_SOURCE_DIR) / "tests" / "fuzz" / "regressions" / "policy";
    REQUIRE(fs::is_directory(folder));
    std::size_t replayed = 0;
    for (const auto& entry : fs::directory_iterator(folder)) {
        if (!entry.is_regular_file() || entry.path().filename() == "README.md") {
            continue;
        }
        INFO(entry.path().string());
        const std::string text = tollgate::test::read_text(entry.path().string());
        try {
            const Policy policy = load_policy(text, entry.path().filename().string());
            CHECK(load_policy(describe_policy(policy), "described") == policy);
        } catch (const PolicyError& e) {
            CHECK_FALSE(e.messages().empty());
        }
        ++replayed;
    }
    CHECK(replayed > 0);
}
