// SPDX-License-Identifier: MIT
// FNV-1a, 64 bits: the one non-cryptographic digest Tollgate keys files, shards and findings by.
#pragma once

#include <cstdint>
#include <string_view>

namespace tollgate {

// Fowler-Noll-Vo FNV-1a, 64 bits: offset basis 0xcbf29ce484222325, prime 0x100000001b3 (the
// published parameters, from memory).
class FnvDigest {
public:
    // Mix the bytes of `text`.
    FnvDigest& add(std::string_view text) {
        for (const unsigned char c : text) {
            m_value = (m_value ^ c) * k_prime;
        }
        return *this;
    }

    // Mix `text` and then a byte no UTF-8 text contains, so that ("ab", "c") and ("a", "bc")
    // differ.
    FnvDigest& add_field(std::string_view text) {
        add(text);
        m_value = (m_value ^ 0xffu) * k_prime;
        return *this;
    }

    std::uint64_t value() const { return m_value; }

private:
    static constexpr std::uint64_t k_prime = 0x100000001b3ULL;
    std::uint64_t m_value = 0xcbf29ce484222325ULL;
};

// Return the FNV-1a digest of `text`.
inline std::uint64_t fnv_digest(std::string_view text) {
    return FnvDigest().add(text).value();
}

} // namespace tollgate
