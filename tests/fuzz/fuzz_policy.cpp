// SPDX-License-Identifier: MIT
// libFuzzer target for the policy loader: any input must load or throw PolicyError, a loaded
// policy must hold only finite numbers of zero or more, and it must describe itself as YAML that
// loads back equal, with no difference reported.
#include "gate/policy/policy.hpp"

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <optional>
#include <string>

namespace {

bool sound(double value) {
    return std::isfinite(value) && value >= 0;
}

bool sound(const std::optional<double>& value) {
    return !value || sound(*value);
}

bool sound(const tollgate::policy::ScopedLimit& limit) {
    return limit.setting != tollgate::policy::LimitSetting::set || sound(limit.value);
}

// Return whether every number of `policy` is finite and not negative (the judge divides and
// compares with them: a NaN would silently pass every comparison).
bool numbers_are_sound(const tollgate::policy::Policy& policy) {
    for (const auto& floor : policy.noise_floor) {
        if (!sound(floor.below)) {
            return false;
        }
    }
    for (const auto& rule : policy.rules) {
        if (!sound(rule.max_increase) || !sound(rule.max_increase_percent) ||
            !sound(rule.ceiling) || !sound(rule.max_total_increase)) {
            return false;
        }
    }
    for (const auto& scope : policy.paths.scopes) {
        for (const auto& change : scope.rules) {
            if (!sound(change.max_increase) || !sound(change.max_increase_percent) ||
                !sound(change.ceiling)) {
                return false;
            }
        }
    }
    return true;
}

} // namespace

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
    if (!numbers_are_sound(policy)) {
        std::abort();
    }
    // A policy that loaded must round-trip; a PolicyError escaping here is a bug too.
    const Policy again = load_policy(describe_policy(policy), "described");
    if (!(again == policy) || !policy_difference(policy, again).empty()) {
        std::abort();
    }
    return 0;
}
