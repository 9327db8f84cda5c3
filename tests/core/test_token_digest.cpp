// SPDX-License-Identifier: MIT
// The token digest both front ends name functions with: FNV-1a over keys and roles.
#include "tollgate/core/token_digest.hpp"

#include <catch2/catch.hpp>

using namespace tollgate::core;

namespace {

Token token(const std::string& key, Role role, unsigned line = 1) {
    Token t;
    t.key = key;
    t.spelling = key;
    t.role = role;
    t.line = line;
    return t;
}

} // namespace

TEST_CASE("token_digest mixes keys and roles, not lines", "[core]") {
    // No tokens: the start value itself, 1469598103934665603 in hex (token_digest.hpp says why it
    // is not FNV's offset basis).
    CHECK(token_digest({}) == "14650fb0739d0383");

    const TokenList a = {token("return", Role::operator_token), token("x", Role::operand_token)};
    const TokenList moved = {token("return", Role::operator_token, 40),
                             token("x", Role::operand_token, 40)};
    const TokenList other_role = {token("return", Role::operator_token),
                                  token("x", Role::operator_token)};
    const TokenList joined = {token("returnx", Role::operator_token)};
    CHECK(token_digest(a).size() == 16);
    CHECK(token_digest(a) == token_digest(moved)); // lines are left out
    CHECK(token_digest(a) != token_digest(other_role));
    CHECK(token_digest(a) != token_digest(joined)); // key boundaries count
}
