// SPDX-License-Identifier: MIT
// Line starts, line lookup, continuation lines and directive kinds.
#include "gate/lexer/source_lines.hpp"

#include <algorithm>

namespace tollgate::lexer {

std::vector<unsigned> line_starts(const std::string& content) {
    std::vector<unsigned> starts = {0};
    for (std::size_t i = 0; i < content.size(); ++i) {
        if (content[i] == '\n') {
            starts.push_back(static_cast<unsigned>(i + 1));
        }
    }
    return starts;
}

unsigned line_of(const std::vector<unsigned>& starts, unsigned offset) {
    return static_cast<unsigned>(std::upper_bound(starts.begin(), starts.end(), offset) -
                                 starts.begin());
}

bool continues(const std::string& content, const std::vector<unsigned>& starts, unsigned line) {
    if (line >= starts.size()) {
        return false;
    }
    std::size_t end = starts[line] - 1; // the '\n'
    while (end > starts[line - 1] && (content[end - 1] == '\r')) {
        --end;
    }
    return end > starts[line - 1] && content[end - 1] == '\\';
}

DirectiveKind directive_kind(const std::string& word) {
    if (word == "if" || word == "ifdef" || word == "ifndef") {
        return DirectiveKind::open_condition;
    }
    if (word == "elif" || word == "else" || word == "elifdef" || word == "elifndef") {
        return DirectiveKind::alternative;
    }
    if (word == "endif") {
        return DirectiveKind::close_condition;
    }
    return DirectiveKind::other;
}

} // namespace tollgate::lexer
