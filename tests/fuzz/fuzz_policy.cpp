// SPDX-License-Identifier: MIT
// libFuzzer target for the policy loader: any input must load or throw PolicyError, and a loaded
// policy must describe itself as YAML that loads back equal, with no difference reported.
#include "gate/policy/policy.hpp"

#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    using namespace tollgate::policy;
    const std::string text(reinterpret_cast<const char*>(data), size);
    Policy policy;
    try {
        policy = load_policy(text, "fuzz.yaml");
    } catch (const PolicyError& e) {
        if (e.messages().empty()) {
            std::abort(); // a PolicyError must say what is wrong
        }
        return 0;
    }
    // A policy that loaded must round-trip; a PolicyError escaping here is a bug too.
    const Policy again = load_policy(describe_policy(policy), "described");
    if (!(again == policy) || !policy_difference(policy, again).empty()) {
        std::abort();
    }
    return 0;
}
