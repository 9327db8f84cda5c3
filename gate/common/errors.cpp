// SPDX-License-Identifier: MIT
// Message helpers: "did you mean" suggestions by edit distance, shell words for remedies.
#include "gate/common/errors.hpp"

#include "gate/common/text_safety.hpp"

#include <algorithm>

namespace tollgate {

namespace {

std::size_t edit_distance(const std::string& a, const std::string& b) {
    std::vector<std::size_t> row(b.size() + 1);
    for (std::size_t j = 0; j <= b.size(); ++j) {
        row[j] = j;
    }
    for (std::size_t i = 1; i <= a.size(); ++i) {
        std::size_t diagonal = row[0];
        row[0] = i;
        for (std::size_t j = 1; j <= b.size(); ++j) {
            const std::size_t above = row[j];
            const std::size_t substitute = diagonal + (a[i - 1] == b[j - 1] ? 0 : 1);
            row[j] = std::min({above + 1, row[j - 1] + 1, substitute});
            diagonal = above;
        }
    }
    return row[b.size()];
}

} // namespace

std::string shell_word(const std::string& text) {
    return ::tollgate::text::shell_word(text);
}

std::string closest_match(const std::string& word, const std::vector<std::string>& candidates) {
    const std::size_t limit = std::max<std::size_t>(2, word.size() / 3);
    std::string best;
    std::size_t best_distance = limit + 1;
    for (const auto& candidate : candidates) {
        const std::size_t distance = edit_distance(word, candidate);
        if (distance < best_distance) {
            best_distance = distance;
            best = candidate;
        }
    }
    return best;
}

} // namespace tollgate
