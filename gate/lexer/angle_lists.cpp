// SPDX-License-Identifier: MIT
// Angle-bracket matching for a whole range at once, from the last `<` to the first, so each
// scan steps over the lists nested in it instead of walking them again.
#include "gate/lexer/angle_lists.hpp"

namespace tollgate::lexer {

namespace {

bool opens(const SourceToken& token) {
    return is_punct(token, "(") || is_punct(token, "[") || is_punct(token, "{");
}

bool closes(const SourceToken& token) {
    return is_punct(token, ")") || is_punct(token, "]") || is_punct(token, "}");
}

bool rules_out_list(const SourceToken& t) {
    return is_punct(t, "&&") || is_punct(t, "||") || is_punct(t, "=") || is_punct(t, "?") ||
           is_punct(t, "<=") || is_punct(t, ">=");
}

// Return, for each token of `tokens[begin..begin + size)`, the index (relative to `begin`) of the
// bracket that closes it when it opens one; ( [ { match any of ) ] }, as match_bracket counts them.
std::vector<std::size_t> bracket_closes(const std::vector<SourceToken>& tokens, std::size_t begin,
                                        std::size_t size, std::size_t none) {
    std::vector<std::size_t> close(size, none);
    std::vector<std::size_t> stack;
    for (std::size_t k = 0; k < size; ++k) {
        if (opens(tokens[begin + k])) {
            stack.push_back(k);
        } else if (closes(tokens[begin + k]) && !stack.empty()) {
            close[stack.back()] = k;
            stack.pop_back();
        }
    }
    return close;
}

} // namespace

AngleLists::AngleLists(const std::vector<SourceToken>& tokens, std::size_t begin, std::size_t end)
    : m_begin(begin) {
    if (end < begin || end >= tokens.size()) {
        return;
    }
    const std::size_t size = end - begin + 1;
    m_close.assign(size, k_none);
    m_disqualify.assign(size + 1, 0);
    for (std::size_t k = 0; k < size; ++k) {
        m_disqualify[k + 1] = m_disqualify[k] + (rules_out_list(tokens[begin + k]) ? 1 : 0);
    }
    const std::vector<std::size_t> bracket_close = bracket_closes(tokens, begin, size, k_none);
    // The depth a nested list's scan ended at (0, or -1 after a closing `>>`).
    std::vector<int> end_depth(size, 0);
    for (std::size_t open = size; open-- > 0;) {
        if (!is_punct(tokens[begin + open], "<")) {
            continue;
        }
        int depth = 1;
        std::size_t k = open + 1;
        while (k < size) {
            const SourceToken& token = tokens[begin + k];
            if (is_punct(token, "<")) {
                if (m_close[k] == k_none) {
                    break; // the nested attempt failed, so does this one, at the same token
                }
                depth += end_depth[k]; // the nested list opened and closed (or closed one more)
                k = m_close[k];
            } else if (is_punct(token, ">")) {
                --depth;
            } else if (is_punct(token, ">>")) {
                depth -= 2;
            } else if (is_punct(token, ";") || is_punct(token, "{") || is_punct(token, "}")) {
                break;
            } else if (is_punct(token, "(")) {
                if (bracket_close[k] == k_none) {
                    break;
                }
                k = bracket_close[k] + 1;
                continue;
            }
            if (depth <= 0) {
                m_close[open] = k;
                end_depth[open] = depth;
                break;
            }
            ++k;
        }
    }
}

bool AngleLists::looks_like_template_list(std::size_t open) const {
    if (open < m_begin || open - m_begin >= m_close.size()) {
        return false;
    }
    const std::size_t k = open - m_begin;
    const std::size_t close = m_close[k];
    if (close == k_none) {
        return false;
    }
    return m_disqualify[close] - m_disqualify[k + 1] == 0;
}

} // namespace tollgate::lexer
