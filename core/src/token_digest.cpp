// SPDX-License-Identifier: MIT
// The digest of a function's counted tokens.
#include "tollgate/core/token_digest.hpp"

#include <cstdint>
#include <cstdio>

namespace tollgate::core {

std::string token_digest(const TokenList& tokens) {
    std::uint64_t hash = 1469598103934665603ULL;
    auto mix = [&hash](unsigned char c) {
        hash ^= c;
        hash *= 1099511628211ULL;
    };
    for (const Token& token : tokens) {
        for (const unsigned char c : token.key) {
            mix(c);
        }
        mix(0x1f);
        mix(token.role == Role::operator_token ? 'o' : 'd');
        mix(0x1e);
    }
    char text[17];
    std::snprintf(text, sizeof text, "%016llx", static_cast<unsigned long long>(hash));
    return text;
}

} // namespace tollgate::core
