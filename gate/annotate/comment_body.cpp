// SPDX-License-Identifier: MIT
// Composing comment bodies: marker line first, the report through its own renderer, size cuts.
#include "gate/annotate/comment_body.hpp"

#include "gate/common/fnv_digest.hpp"

#include <algorithm>
#include <cctype>
#include <cstdint>
#include <fmt/format.h>
#include <sstream>

namespace tollgate::annotate {

namespace {

const char* const k_marker_head = "<!-- tollgate:annotate slot=";

std::string render_markdown(const delta::ChangeReport& report, const policy::Verdict& verdict,
                            const report::RenderOptions& options) {
    std::ostringstream out;
    report::write_change_markdown(out, report, verdict, options);
    return out.str();
}

bool is_hex(const std::string& text) {
    return !text.empty() && text.find_first_not_of("0123456789abcdef") == std::string::npos;
}

// Return " (head `abc1234`)" for a commit id, or empty when there is none (or it is not hex).
std::string head_mention(const std::string& commit) {
    return is_hex(commit) ? " (head `" + commit.substr(0, 7) + "`)" : std::string();
}

// Return `url` fit for a Markdown link destination: http(s) only, and every byte that could end
// or alter the destination percent-encoded. Empty when `url` is not http(s).
std::string link_destination(const std::string& url) {
    if (url.rfind("https://", 0) != 0 && url.rfind("http://", 0) != 0) {
        return {};
    }
    std::string out;
    for (const unsigned char c : url) {
        if (c <= 0x20 || c >= 0x7f || c == '(' || c == ')' || c == '<' || c == '>' || c == '"' ||
            c == '\\' || c == '`' || c == '[' || c == ']' || c == '\'' || c == '{' || c == '}' ||
            c == '|' || c == '^') {
            out += fmt::format("%{:02X}", static_cast<unsigned>(c));
        } else {
            out += static_cast<char>(c);
        }
    }
    return out;
}

std::string cut_note(std::size_t shown, std::size_t total, std::size_t limit,
                     const std::string& artifact_url) {
    const std::string destination = link_destination(artifact_url);
    std::string note = fmt::format("\n**Cut to fit the platform's comment size limit** ({} "
                                   "characters): {} of {} touched function{} shown; ",
                                   report::group_thousands(static_cast<double>(limit)), shown,
                                   total, total == 1 ? "" : "s");
    note += destination.empty()
                ? std::string("the full report is kept with the pipeline's "
                              "artifacts.\n")
                : "[the full report](" + destination + ") is kept with the pipeline's artifacts.\n";
    return note;
}

std::size_t count_of(const std::string& text, const std::string& what) {
    std::size_t n = 0;
    for (auto pos = text.find(what); pos != std::string::npos; pos = text.find(what, pos + 1)) {
        ++n;
    }
    return n;
}

// Return the lines of `text` that fit in `budget` bytes, with any <details> left open closed.
std::string cut_at_line(const std::string& text, std::size_t budget) {
    const std::string closing = "\n</details>\n";
    std::string kept;
    std::size_t end = std::min(text.size(), budget);
    for (;;) {
        const auto newline = end == 0 ? std::string::npos : text.rfind('\n', end - 1);
        kept = newline == std::string::npos ? std::string() : text.substr(0, newline + 1);
        const std::size_t open = count_of(kept, "<details>") - count_of(kept, "</details>");
        const std::size_t needed = kept.size() + open * closing.size();
        if (needed <= budget || kept.empty()) {
            for (std::size_t i = 0; i < open; ++i) {
                kept += closing;
            }
            return kept;
        }
        end = newline;
    }
}

} // namespace

bool valid_slot(const std::string& slot) {
    return !slot.empty() && slot.size() <= 64 &&
           std::all_of(slot.begin(), slot.end(), [](unsigned char c) {
               return std::isalnum(c) != 0 || c == '.' || c == '_' || c == '-';
           });
}

std::string comment_marker(const std::string& slot) {
    return k_marker_head + slot + " -->";
}

std::string note_marker(const std::string& slot, const std::string& key) {
    return k_marker_head + slot + " note=" + key + " -->";
}

bool starts_with_marker(const std::string& body, const std::string& marker) {
    if (body.compare(0, marker.size(), marker) != 0) {
        return false;
    }
    const std::string rest = body.substr(marker.size(), 2);
    return rest.empty() || rest[0] == '\n' || rest == "\r\n";
}

std::string normalise_newlines(const std::string& body) {
    std::string out;
    out.reserve(body.size());
    for (std::size_t i = 0; i < body.size(); ++i) {
        if (body[i] == '\r' && i + 1 < body.size() && body[i + 1] == '\n') {
            continue;
        }
        out += body[i];
    }
    return out;
}

CommentBody compose_comment(const delta::ChangeReport& report, const policy::Verdict& verdict,
                            const report::RenderOptions& options, const std::string& slot,
                            std::size_t limit, const std::string& artifact_url) {
    const std::string head = comment_marker(slot) + "\n";
    const std::size_t total = report.functions.size();
    CommentBody body;
    body.shown_functions = total;
    body.text = head + render_markdown(report, verdict, options);
    if (body.text.size() <= limit) {
        return body;
    }
    body.cut = true;
    // Keep the largest number of rows (the report's order: largest growth first) that fits.
    delta::ChangeReport trimmed = report;
    const auto render_rows = [&](std::size_t rows) {
        trimmed.functions.assign(report.functions.begin(),
                                 report.functions.begin() + static_cast<std::ptrdiff_t>(rows));
        report::RenderOptions fewer = options;
        fewer.markdown_rows = std::min(options.markdown_rows, rows);
        return render_markdown(trimmed, verdict, fewer);
    };
    const auto render_first = [&](std::size_t rows) {
        return head + render_rows(rows) + cut_note(rows, total, limit, artifact_url);
    };
    std::size_t low = 0;      // largest count known to fit (0: none known)
    std::size_t high = total; // smallest count known not to fit
    std::string best;
    while (high - low > 1) {
        const std::size_t middle = low + (high - low) / 2;
        std::string candidate = render_first(middle);
        if (candidate.size() <= limit) {
            low = middle;
            best = std::move(candidate);
        } else {
            high = middle;
        }
    }
    if (low > 0) {
        body.text = std::move(best);
        body.shown_functions = low;
        return body;
    }
    // Even one row is too many (a very long list of findings or notes): cut the text itself.
    const std::string text = total > 0 ? render_rows(1) : body.text.substr(head.size());
    const std::string note = cut_note(0, total, limit, artifact_url);
    const std::size_t reserve = head.size() + note.size() + 1;
    body.text =
        head + (limit > reserve ? cut_at_line(text, limit - reserve) : std::string()) + "\n" + note;
    body.shown_functions = 0;
    if (body.text.size() > limit) {
        body.text = head.substr(0, std::min(head.size(), limit)); // a limit below any sense
    }
    return body;
}

std::string compose_now_passes(const delta::ChangeReport& report, const std::string& slot) {
    return comment_marker(slot) + "\n**Tollgate: now passes**: the change no longer touches a " +
           "C/C++ function" + head_mention(report.head_commit) + ".\n";
}

std::string finding_key(const policy::Finding& finding) {
    FnvDigest digest;
    const auto mix = [&digest](const std::string& text) { digest.add_field(text); };
    mix(finding.rule_id);
    mix(finding.function);
    mix(finding.signature);
    return fmt::format("{:016x}", digest.value());
}

std::string compose_line_note(const policy::Finding& finding, const std::string& slot) {
    return note_marker(slot, finding_key(finding)) +
           "\n**Tollgate: blocking**: " + escape_inline(finding.message) + "\n";
}

std::string compose_resolved_note(const std::string& key, const std::string& slot,
                                  const std::string& head_commit) {
    return note_marker(slot, key) + "\n**Tollgate**: this finding no longer blocks the change" +
           head_mention(head_commit) + ".\n";
}

std::string escape_inline(const std::string& text) {
    std::string out;
    for (const char c : text) {
        const auto u = static_cast<unsigned char>(c);
        if (c == '\n' || c == '\r' || c == '\t') {
            out += ' ';
        } else if (u < 0x20 || u == 0x7f) {
            continue; // control characters carry nothing a reviewer reads
        } else if (std::ispunct(u) != 0) {
            out += '\\';
            out += c;
        } else {
            out += c;
        }
    }
    return out;
}

} // namespace tollgate::annotate
