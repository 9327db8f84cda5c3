// SPDX-License-Identifier: MIT
// The marks a report puts beside a function, base identities and unmeasured lines.
#include "gate/report/marks.hpp"

#include <algorithm>

namespace tollgate::report {

std::vector<std::string> mark_words(const FunctionMarks& marks) {
    std::vector<std::string> words;
    if (marks.inactive) {
        words.emplace_back("inactive");
    } else if (marks.lexical) {
        words.emplace_back("lexical");
    }
    if (marks.brace_extent) {
        words.emplace_back("brace-extent");
    }
    return words;
}

std::string mark_suffix(const FunctionMarks& marks) {
    std::string text;
    for (std::string word : mark_words(marks)) {
        for (char& c : word) {
            c = c == '-' ? ' ' : c;
        }
        text += " [" + word + "]";
    }
    return text;
}

FunctionMarks marks_of(const delta::FunctionSide& side) {
    return {side.lexical, side.inactive, side.brace_extent};
}

std::vector<std::string> base_only_marks(const delta::FunctionDelta& f) {
    std::vector<std::string> only;
    if (!f.base || !f.head) {
        return only;
    }
    const auto head_words = mark_words(marks_of(*f.head));
    for (const auto& word : mark_words(marks_of(*f.base))) {
        if (std::find(head_words.begin(), head_words.end(), word) == head_words.end()) {
            only.push_back(word);
        }
    }
    return only;
}

std::string head_identity(const delta::FunctionDelta& f) {
    return f.base_signature ? f.name + "(" + f.signature + ")" : f.name;
}

std::string base_identity(const delta::FunctionDelta& f) {
    if (!f.base_name && !f.base_signature) {
        return {};
    }
    return f.base_name.value_or(f.name) + "(" + f.base_signature.value_or(f.signature) + ")";
}

namespace {

std::string ranges_text(const char* side, const std::vector<std::pair<unsigned, unsigned>>& list) {
    std::size_t lines = 0;
    std::string text;
    for (const auto& [first, last] : list) {
        lines += last - first + 1;
        text += (text.empty() ? "" : ", ") + std::to_string(first) +
                (last > first ? "-" + std::to_string(last) : std::string());
    }
    return std::string(side) + (lines == 1 ? " line " : " lines ") + text;
}

} // namespace

std::string unmeasured_text(const delta::UnmeasuredLines& lines) {
    std::string where;
    if (!lines.head.empty()) {
        where = ranges_text("head", lines.head);
    }
    if (!lines.base.empty()) {
        where += (where.empty() ? "" : "; ") + ranges_text("base", lines.base);
    }
    return std::to_string(lines.count) + " changed line" + (lines.count == 1 ? "" : "s") +
           " outside functions (" + where + ")";
}

} // namespace tollgate::report
