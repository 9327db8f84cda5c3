// SPDX-License-Identifier: MIT
// Test support: render Markdown with a reference renderer outside the project (Debian's
// cmark-gfm, GitHub's own cmark fork, with GitHub's extensions) and read the HTML it gives.
#pragma once

#include "support/temp_repo.hpp"

#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

namespace tollgate::test {

// Return the HTML cmark-gfm renders from `markdown` with the table, autolink, strikethrough and
// tagfilter extensions; `--unsafe` keeps raw HTML (so that a test sees whether data's HTML gets
// through, beside our own <details> and <sub>). Empty when cmark-gfm is not installed.
inline std::optional<std::string> render_gfm(const std::string& markdown) {
    TempDir dir;
    dir.write("in.md", markdown);
    const auto result = run_command("cmark-gfm --unsafe --extension table --extension autolink "
                                    "--extension strikethrough --extension tagfilter in.md",
                                    dir.path());
    if (result.exit_code == 127) {
        return std::nullopt;
    }
    if (result.exit_code != 0) {
        throw std::runtime_error("cmark-gfm failed: " + result.err);
    }
    return result.out;
}

// Return every text between `open` and the next `close` in `html`, in order.
inline std::vector<std::string> between(const std::string& html, const std::string& open,
                                        const std::string& close) {
    std::vector<std::string> found;
    for (auto pos = html.find(open); pos != std::string::npos; pos = html.find(open, pos + 1)) {
        const auto start = pos + open.size();
        const auto end = html.find(close, start);
        if (end == std::string::npos) {
            break;
        }
        found.push_back(html.substr(start, end - start));
    }
    return found;
}

// Return how often `needle` occurs in `text`.
inline std::size_t occurrences(const std::string& text, const std::string& needle) {
    std::size_t count = 0;
    for (auto pos = text.find(needle); pos != std::string::npos; pos = text.find(needle, pos + 1)) {
        ++count;
    }
    return count;
}

// Return `text` escaped as cmark-gfm's HTML writer escapes text: &, <, > and ".
inline std::string cmark_escaped(const std::string& text) {
    std::string out;
    for (const char c : text) {
        switch (c) {
        case '&':
            out += "&amp;";
            break;
        case '<':
            out += "&lt;";
            break;
        case '>':
            out += "&gt;";
            break;
        case '"':
            out += "&quot;";
            break;
        default:
            out += c;
        }
    }
    return out;
}

} // namespace tollgate::test
