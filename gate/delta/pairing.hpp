// SPDX-License-Identifier: MIT
// Pairing a change's base functions with its head functions: the candidates and the passes that
// survive signature edits and namespace or class renames (see gate/delta/README.md).
#pragma once

#include "gate/delta/compare.hpp"

#include <map>
#include <string>
#include <utility>
#include <vector>

namespace tollgate::delta {

// A candidate function of one side, with where it came from.
struct Candidate {
    const SideFunction* span = nullptr; // the function
    bool touched = false;               // its extent meets a changed line of its side
    bool whole = false;                 // every line of its extent changed (moved candidates)
    bool paired = false;                // already paired
};

// Pairs made by one or more passes, base first.
using CandidatePairs = std::vector<std::pair<Candidate*, Candidate*>>;

// Pair unpaired candidates of `base` and `head` whose `key` is not empty, equal, and unique on
// each side; append them to `pairs`.
template <typename KeyFn>
void pair_by(std::vector<Candidate*>& base, std::vector<Candidate*>& head, KeyFn key,
             CandidatePairs& pairs) {
    std::map<std::string, std::vector<Candidate*>> base_by_key, head_by_key;
    for (auto* c : base) {
        if (!c->paired && !key(*c->span).empty()) {
            base_by_key[key(*c->span)].push_back(c);
        }
    }
    for (auto* c : head) {
        if (!c->paired && !key(*c->span).empty()) {
            head_by_key[key(*c->span)].push_back(c);
        }
    }
    for (auto& [k, base_list] : base_by_key) {
        auto it = head_by_key.find(k);
        if (it == head_by_key.end() || base_list.size() != 1 || it->second.size() != 1) {
            continue;
        }
        base_list.front()->paired = true;
        it->second.front()->paired = true;
        pairs.emplace_back(base_list.front(), it->second.front());
    }
}

// Pair, within one file, unpaired functions whose qualified name is the same and unique among
// the unpaired of each side although the signature differs (a parameter list edited).
void pair_by_name(std::vector<Candidate*>& base, std::vector<Candidate*>& head,
                  CandidatePairs& pairs);

// Pair unpaired functions whose enclosing namespace or class changed: the same unqualified name
// and identical counted tokens (unique on both sides), then the same unqualified name and token
// similarity of at least k_rename_similarity (the best match of each other, without a tie).
void pair_renamed_scopes(std::vector<Candidate*>& base, std::vector<Candidate*>& head,
                         CandidatePairs& pairs);

// The token similarity from which a function under a renamed namespace or class is the same
// function: a Dice coefficient over the counted tokens' keys and roles (common practice, no
// source: one edited token in twenty still pairs).
inline constexpr double k_rename_similarity = 0.8;

// Return the Dice coefficient 2 |A n B| / (|A| + |B|) of the counted tokens of `base` and
// `head` as multisets of key and role: 1 for the same tokens in any order, 0 for none shared or
// when either has no tokens at hand (a function read from a snapshot).
double token_similarity(const SideFunction& base, const SideFunction& head);

// Return the last component of a qualified name: "f" of "a::B::f", "TEST(S, N)" of
// "ns::TEST(S, N)" ("::" inside parentheses or angle brackets does not split).
std::string unqualified_name(const std::string& qualified);

} // namespace tollgate::delta
