// SPDX-License-Identifier: MIT
// Pairing passes that survive signature edits and namespace or class renames.
#include "gate/delta/pairing.hpp"

#include <algorithm>
#include <unordered_map>

namespace tollgate::delta {

namespace {

// Return the unpaired candidates of `list` grouped by `key`.
template <typename KeyFn>
std::map<std::string, std::vector<Candidate*>> unpaired_by(const std::vector<Candidate*>& list,
                                                           KeyFn key) {
    std::map<std::string, std::vector<Candidate*>> groups;
    for (Candidate* c : list) {
        if (!c->paired) {
            groups[key(*c->span)].push_back(c);
        }
    }
    return groups;
}

// The most token comparisons made for one unqualified name.
constexpr std::size_t k_max_similarity_pairs = 4096;

void take(Candidate* base, Candidate* head, CandidatePairs& pairs) {
    base->paired = true;
    head->paired = true;
    pairs.emplace_back(base, head);
}

} // namespace

std::string unqualified_name(const std::string& qualified) {
    int depth = 0;
    std::size_t start = 0;
    for (std::size_t i = 0; i < qualified.size(); ++i) {
        const char c = qualified[i];
        if (c == '(' || c == '<') {
            ++depth;
        } else if ((c == ')' || c == '>') && depth > 0) {
            --depth;
        } else if (depth == 0 && c == ':' && i + 1 < qualified.size() && qualified[i + 1] == ':') {
            start = i + 2;
            ++i;
        }
    }
    return qualified.substr(start);
}

double token_similarity(const SideFunction& base, const SideFunction& head) {
    if (base.span == nullptr || head.span == nullptr || base.span->tokens.empty() ||
        head.span->tokens.empty()) {
        return 0.0;
    }
    std::unordered_map<std::string, long> counts;
    const auto key_of = [](const core::Token& token) {
        return token.key + (token.role == core::Role::operator_token ? "\x1f"
                                                                       "o"
                                                                     : "\x1f"
                                                                       "d");
    };
    for (const core::Token& token : base.span->tokens) {
        ++counts[key_of(token)];
    }
    std::size_t shared = 0;
    for (const core::Token& token : head.span->tokens) {
        auto it = counts.find(key_of(token));
        if (it != counts.end() && it->second > 0) {
            --it->second;
            ++shared;
        }
    }
    return 2.0 * static_cast<double>(shared) /
           static_cast<double>(base.span->tokens.size() + head.span->tokens.size());
}

void pair_by_name(std::vector<Candidate*>& base, std::vector<Candidate*>& head,
                  CandidatePairs& pairs) {
    const auto name = [](const SideFunction& f) { return f.qualified_name(); };
    auto base_groups = unpaired_by(base, name);
    auto head_groups = unpaired_by(head, name);
    for (auto& [key, base_list] : base_groups) {
        const auto it = head_groups.find(key);
        if (it != head_groups.end() && base_list.size() == 1 && it->second.size() == 1) {
            take(base_list.front(), it->second.front(), pairs);
        }
    }
}

void pair_renamed_scopes(std::vector<Candidate*>& base, std::vector<Candidate*>& head,
                         CandidatePairs& pairs) {
    // Identical tokens first: the function moved under another name as it was.
    const auto name_and_tokens = [](const SideFunction& f) {
        return unqualified_name(f.qualified_name()) + "\n" + f.token_hash();
    };
    pair_by(base, head, name_and_tokens, pairs);

    // Then similar tokens: the scope's name appears in the function's own tokens (an
    // out-of-line member's qualifier, a parameter type) or a token was edited too.
    const auto name = [](const SideFunction& f) { return unqualified_name(f.qualified_name()); };
    auto base_groups = unpaired_by(base, name);
    auto head_groups = unpaired_by(head, name);
    for (auto& [key, base_list] : base_groups) {
        const auto it = head_groups.find(key);
        if (it == head_groups.end()) {
            continue;
        }
        const std::vector<Candidate*>& head_list = it->second;
        if (base_list.size() * head_list.size() > k_max_similarity_pairs) {
            continue; // too common a name to tell apart by tokens
        }
        std::vector<std::vector<double>> score(base_list.size(),
                                               std::vector<double>(head_list.size(), 0.0));
        for (std::size_t b = 0; b < base_list.size(); ++b) {
            for (std::size_t h = 0; h < head_list.size(); ++h) {
                score[b][h] = token_similarity(*base_list[b]->span, *head_list[h]->span);
            }
        }
        // Return the index of the unique best score of `row` at or above the threshold.
        const auto unique_best = [](const std::vector<double>& row) -> std::size_t {
            std::size_t best = row.size();
            for (std::size_t i = 0; i < row.size(); ++i) {
                if (row[i] < k_rename_similarity) {
                    continue;
                }
                if (best == row.size() || row[i] > row[best]) {
                    best = i;
                } else if (row[i] == row[best]) {
                    return row.size(); // a tie: ambiguous
                }
            }
            return best;
        };
        for (std::size_t b = 0; b < base_list.size(); ++b) {
            const std::size_t h = unique_best(score[b]);
            if (h == head_list.size()) {
                continue;
            }
            std::vector<double> column;
            for (std::size_t other = 0; other < base_list.size(); ++other) {
                column.push_back(score[other][h]);
            }
            if (unique_best(column) == b && !base_list[b]->paired && !head_list[h]->paired) {
                take(base_list[b], head_list[h], pairs);
            }
        }
    }
}

} // namespace tollgate::delta
