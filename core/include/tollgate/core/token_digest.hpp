// SPDX-License-Identifier: MIT
// A digest of a function's counted tokens: equal for functions whose tokens are equal.
#pragma once

#include "tollgate/core/token.hpp"

#include <string>

namespace tollgate::core {

// Return a 64-bit digest of `tokens`' keys and roles, in order (lines and spellings left out), as
// 16 lowercase hex digits. Every front end (C/C++ and Java) names a function's tokens with it, so
// that pairing across a move or rename compares like with like. The mixing step is FNV-1a's (xor,
// then multiply by the 64-bit FNV prime 1099511628211), but the start value is 1469598103934665603,
// not FNV's offset basis 14695981039346656037 (a digit short since the first version); it stays,
// because committed snapshots carry these digests and a change would make every one stale.
std::string token_digest(const TokenList& tokens);

} // namespace tollgate::core
