// SPDX-License-Identifier: MIT
// The safety net: changed lines of a C/C++ file that no measured function holds.
#include "gate/delta/unmeasured_lines.hpp"

#include <algorithm>
#include <cctype>

namespace tollgate::delta {

namespace {

// Return the inclusive ranges of the lines of `changed` that hold code and lie in no function.
std::vector<std::pair<unsigned, unsigned>> outside(const walker::LineSet* changed,
                                                   const std::vector<SideFunction>& functions,
                                                   const std::string& content) {
    std::vector<std::pair<unsigned, unsigned>> ranges;
    if (changed == nullptr || changed->empty()) {
        return ranges;
    }
    const std::vector<bool> code = code_lines(content);
    std::vector<std::pair<unsigned, unsigned>> extents;
    for (const SideFunction& f : functions) {
        extents.emplace_back(f.start_line(), f.end_line());
    }
    std::sort(extents.begin(), extents.end());
    const auto measured = [&extents](unsigned line) {
        auto it = std::upper_bound(extents.begin(), extents.end(),
                                   std::make_pair(line, static_cast<unsigned>(-1)));
        // Extents may nest (a function recovered inside another's extent): look back over all
        // that start before the line.
        for (; it != extents.begin();) {
            --it;
            if (it->second >= line) {
                return true;
            }
        }
        return false;
    };
    for (const walker::LineRange& range : changed->ranges()) {
        for (unsigned line = range.first; line <= range.last; ++line) {
            if (line >= code.size() || !code[line] || measured(line)) {
                continue;
            }
            if (!ranges.empty() && ranges.back().second + 1 == line) {
                ranges.back().second = line;
            } else {
                ranges.emplace_back(line, line);
            }
        }
    }
    return ranges;
}

unsigned count_of(const std::vector<std::pair<unsigned, unsigned>>& ranges) {
    unsigned count = 0;
    for (const auto& [first, last] : ranges) {
        count += last - first + 1;
    }
    return count;
}

} // namespace

std::vector<bool> code_lines(const std::string& content) {
    std::vector<bool> code(1, false);
    if (content.empty()) {
        return code;
    }
    code.push_back(false); // line 1
    enum class State { plain, line_comment, block_comment, quoted, raw };
    State state = State::plain;
    char quote = 0;
    std::string raw_end; // ")delimiter\"" that ends a raw string
    std::size_t line = 1;
    for (std::size_t i = 0; i < content.size(); ++i) {
        const char c = content[i];
        if (c == '\n') {
            ++line;
            code.push_back(false);
            if (state == State::line_comment && !(i > 0 && content[i - 1] == '\\')) {
                state = State::plain;
            }
            continue;
        }
        switch (state) {
        case State::line_comment:
            break;
        case State::block_comment:
            if (c == '*' && i + 1 < content.size() && content[i + 1] == '/') {
                state = State::plain;
                ++i;
            }
            break;
        case State::quoted:
            code[line] = code[line] || (c != ' ' && c != '\t' && c != '\r');
            if (c == '\\' && i + 1 < content.size() && content[i + 1] != '\n') {
                ++i;
            } else if (c == quote) {
                state = State::plain;
            }
            break;
        case State::raw:
            code[line] = code[line] || (c != ' ' && c != '\t' && c != '\r');
            if (content.compare(i, raw_end.size(), raw_end) == 0) {
                i += raw_end.size() - 1;
                state = State::plain;
            }
            break;
        case State::plain:
            if (c == '/' && i + 1 < content.size() && content[i + 1] == '/') {
                state = State::line_comment;
                ++i;
            } else if (c == '/' && i + 1 < content.size() && content[i + 1] == '*') {
                state = State::block_comment;
                ++i;
            } else if (c == '"' && i > 0 && content[i - 1] == 'R') {
                const std::size_t open = content.find('(', i + 1);
                const std::size_t newline = content.find('\n', i + 1);
                if (open != std::string::npos && open < newline && open - i <= 17) {
                    raw_end = ")" + content.substr(i + 1, open - i - 1) + "\"";
                    state = State::raw;
                    i = open;
                } else {
                    state = State::quoted;
                    quote = c;
                }
                code[line] = true;
            } else if (c == '"' || c == '\'') {
                // A digit separator (1'000, 0xFF'FF) is not a character literal: the word it
                // ends starts with a digit.
                std::size_t word = i;
                while (word > 0 && (std::isalnum(static_cast<unsigned char>(content[word - 1])) ||
                                    content[word - 1] == '\'' || content[word - 1] == '.')) {
                    --word;
                }
                const bool separator = c == '\'' && word < i &&
                                       std::isdigit(static_cast<unsigned char>(content[word]));
                if (!separator) {
                    state = State::quoted;
                    quote = c;
                }
                code[line] = true;
            } else if (c != ' ' && c != '\t' && c != '\r' && c != '\f' && c != '\v' &&
                       !(c == '\\' && i + 1 < content.size() && content[i + 1] == '\n')) {
                code[line] = true;
            }
            break;
        }
    }
    if (content.back() == '\n') {
        code.pop_back(); // no line after the final newline
    }
    return code;
}

UnmeasuredLines unmeasured_lines(const std::string& path, const FileSides& file,
                                 const std::string* base_content, const std::string* head_content) {
    UnmeasuredLines result;
    result.path = path;
    if (base_content != nullptr) {
        result.base = outside(file.base_lines, file.base, *base_content);
    }
    if (head_content != nullptr) {
        result.head = outside(file.head_lines, file.head, *head_content);
    }
    result.count = count_of(result.base) + count_of(result.head);
    return result;
}

} // namespace tollgate::delta
