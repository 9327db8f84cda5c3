// SPDX-License-Identifier: MIT
// Read exemptions from commit messages and source comments; apply them as the policy allows.
#include "gate/policy/exemptions.hpp"

#include "gate/policy/glob.hpp"

#include <algorithm>
#include <cctype>
#include <sstream>

namespace tollgate::policy {

namespace {

std::string trim(const std::string& text) {
    const auto first = text.find_first_not_of(" \t\r\n");
    if (first == std::string::npos) {
        return {};
    }
    const auto last = text.find_last_not_of(" \t\r\n");
    return text.substr(first, last - first + 1);
}

bool rule_char(char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '-' || c == '_' || c == '.';
}

// Split "a, b" into rule ids; empty when the list is empty or holds anything but rule ids.
std::vector<std::string> rule_list(const std::string& text) {
    std::vector<std::string> rules;
    std::stringstream parts(text);
    std::string part;
    while (std::getline(parts, part, ',')) {
        part = trim(part);
        if (part.empty() || !std::all_of(part.begin(), part.end(), rule_char)) {
            return {};
        }
        rules.push_back(part);
    }
    return rules;
}

bool starts_with_no_case(const std::string& text, const std::string& prefix) {
    if (text.size() < prefix.size()) {
        return false;
    }
    for (std::size_t i = 0; i < prefix.size(); ++i) {
        if (std::tolower(static_cast<unsigned char>(text[i])) !=
            std::tolower(static_cast<unsigned char>(prefix[i]))) {
            return false;
        }
    }
    return true;
}

void add_claim(ExemptionClaims& found, ClaimedExemption claim) {
    if (found.claims.size() < k_exemption_limit) {
        found.claims.push_back(std::move(claim));
        return;
    }
    if (found.claims.size() == k_exemption_limit && found.notes.empty()) {
        found.notes.push_back("the change claims more than " + std::to_string(k_exemption_limit) +
                              " exemptions; the rest are ignored");
    }
}

std::vector<std::string> split_lines(const std::string& text) {
    std::vector<std::string> lines;
    std::string line;
    std::istringstream in(text);
    while (std::getline(in, line)) {
        lines.push_back(line);
    }
    return lines;
}

// Return whether the marker at `pos` of `line` stands in a comment.
bool in_comment(const std::string& line, std::size_t pos) {
    const std::string before = line.substr(0, pos);
    if (before.find("//") != std::string::npos || before.find("/*") != std::string::npos) {
        return true;
    }
    const std::string lead = trim(before);
    return !lead.empty() && lead[0] == '*';
}

bool comment_line(const std::string& line) {
    const std::string text = trim(line);
    return text.rfind("//", 0) == 0 || text.rfind("/*", 0) == 0 || text.rfind("*", 0) == 0;
}

} // namespace

void read_exemption_trailers(const std::string& message, const std::string& where,
                             ExemptionClaims& found) {
    const std::string key = std::string(k_exemption_trailer) + ":";
    for (const auto& line : split_lines(message)) {
        if (!starts_with_no_case(line, key)) {
            continue;
        }
        const std::string value = trim(line.substr(key.size()));
        // FUNCTION (RULES): REASON. The function may hold parentheses ("operator()"), so the
        // first "(" whose contents are rule ids followed by "):" ends it.
        bool parsed = false;
        for (std::size_t open = value.find('('); open != std::string::npos && !parsed;
             open = value.find('(', open + 1)) {
            const std::size_t close = value.find(')', open + 1);
            if (close == std::string::npos || close + 1 >= value.size() ||
                value[close + 1] != ':') {
                continue;
            }
            const auto rules = rule_list(value.substr(open + 1, close - open - 1));
            const std::string function = trim(value.substr(0, open));
            const std::string reason = trim(value.substr(close + 2));
            if (rules.empty() || function.empty()) {
                continue;
            }
            parsed = true;
            if (reason.empty()) {
                found.notes.push_back("an exemption trailer in commit " + where +
                                      " has no reason and is ignored (write \"" +
                                      k_exemption_trailer + ": FUNCTION (RULES): REASON\")");
                break;
            }
            ClaimedExemption claim;
            claim.source = ExemptionSource::trailer;
            claim.where = where;
            claim.function = function;
            claim.rules = rules;
            claim.reason = reason;
            add_claim(found, std::move(claim));
        }
        if (!parsed) {
            found.notes.push_back("an exemption trailer in commit " + where +
                                  " is not understood and is ignored (write \"" +
                                  k_exemption_trailer + ": FUNCTION (RULES): REASON\")");
        }
    }
}

void read_exemption_comments(const std::string& source, const std::string& path,
                             const std::string& function, unsigned first_line, unsigned last_line,
                             ExemptionClaims& found) {
    if (first_line == 0 || last_line < first_line ||
        source.find(k_exemption_marker) == std::string::npos) {
        return;
    }
    const auto lines = split_lines(source);
    // The comment block right above the definition belongs to it too (bounded: 20 lines).
    unsigned from = first_line;
    while (from > 1 && first_line - from < 20 && from - 2 < lines.size() &&
           comment_line(lines[from - 2])) {
        --from;
    }
    const std::string marker = k_exemption_marker;
    for (unsigned number = from; number <= last_line && number <= lines.size(); ++number) {
        const std::string& line = lines[number - 1];
        const std::size_t pos = line.find(marker);
        if (pos == std::string::npos || !in_comment(line, pos)) {
            continue;
        }
        const std::string where = path + ":" + std::to_string(number);
        const std::size_t close = line.find(')', pos + marker.size());
        std::vector<std::string> rules;
        if (close != std::string::npos && close + 1 < line.size() && line[close + 1] == ':') {
            rules = rule_list(line.substr(pos + marker.size(), close - pos - marker.size()));
        }
        std::string reason = rules.empty() ? std::string() : line.substr(close + 2);
        const std::size_t end_comment = reason.find("*/");
        if (end_comment != std::string::npos) {
            reason.erase(end_comment);
        }
        reason = trim(reason);
        if (rules.empty() || reason.empty()) {
            found.notes.push_back("an exemption comment at " + where +
                                  " is not understood and is ignored (write \"" + marker +
                                  "RULES): REASON\" in a comment)");
            continue;
        }
        ClaimedExemption claim;
        claim.source = ExemptionSource::comment;
        claim.where = where;
        claim.function = function;
        claim.path = path;
        claim.start_line = first_line;
        claim.rules = rules;
        claim.reason = reason;
        add_claim(found, std::move(claim));
    }
}

void apply_exemptions(Verdict& verdict, const ExemptionClaims& claims, ChangeExemptions setting) {
    const ExemptionState state =
        setting == ChangeExemptions::accept ? ExemptionState::accepted : ExemptionState::refused;
    std::vector<ClaimedExemption> applied = claims.claims;
    for (auto& claim : applied) {
        claim.state = state;
        claim.findings = 0;
    }
    for (auto& finding : verdict.findings) {
        for (auto& claim : applied) {
            if (std::find(claim.rules.begin(), claim.rules.end(), finding.rule_id) ==
                claim.rules.end()) {
                continue;
            }
            const bool covers =
                claim.source == ExemptionSource::trailer
                    ? glob_match(claim.function, finding.function, GlobSubject::name)
                    : claim.path == finding.path && claim.start_line == finding.start_line &&
                          claim.function == finding.function;
            if (!covers) {
                continue;
            }
            finding.exemption = state;
            finding.exemption_reason = claim.reason;
            finding.exemption_where = claim.where;
            finding.exemption_source = claim.source;
            ++claim.findings;
            break;
        }
    }
    verdict.exemptions = std::move(applied);
    verdict.notes.insert(verdict.notes.end(), claims.notes.begin(), claims.notes.end());
    const bool blocks = std::any_of(verdict.findings.begin(), verdict.findings.end(),
                                    [](const Finding& f) { return f.blocks(); });
    verdict.outcome = blocks ? Outcome::blocked : Outcome::pass;
}

} // namespace tollgate::policy
