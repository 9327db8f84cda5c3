// SPDX-License-Identifier: MIT
// Every writer of a change report keeps hostile text as data: JSON stays valid, Markdown keeps
// each text in its cell (rendered with cmark-gfm), the terminal gets no control character of the
// repository's, and the Markdown stays under its size limit with a note saying what was cut.
#include "gate/common/text_safety.hpp"
#include "gate/report/change_report.hpp"
#include "hostile_report.hpp"
#include "support/render_markdown.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

using namespace tollgate;

namespace {

// Return the lines of `text`.
std::vector<std::string> lines_of(const std::string& text) {
    std::vector<std::string> lines;
    std::istringstream in(text);
    for (std::string line; std::getline(in, line);) {
        lines.push_back(line);
    }
    return lines;
}

// Return `text` without our own colour sequences (ESC [ digits and semicolons m).
std::string without_colour(const std::string& text) {
    std::string out;
    for (std::size_t i = 0; i < text.size(); ++i) {
        if (text[i] == '\x1b' && i + 1 < text.size() && text[i + 1] == '[') {
            std::size_t end = i + 2;
            while (end < text.size() &&
                   (std::isdigit(static_cast<unsigned char>(text[end])) || text[end] == ';')) {
                ++end;
            }
            if (end < text.size() && text[end] == 'm') {
                i = end;
                continue;
            }
        }
        out += text[i];
    }
    return out;
}

bool has_control_byte(const std::string& text) {
    for (std::size_t i = 0; i < text.size(); ++i) {
        const auto c = static_cast<unsigned char>(text[i]);
        if ((c < 0x20 && c != '\n') || c == 0x7F) {
            return true;
        }
        if (c == 0xC2 && i + 1 < text.size() && static_cast<unsigned char>(text[i + 1]) >= 0x80 &&
            static_cast<unsigned char>(text[i + 1]) <= 0x9F) {
            return true; // a C1 control
        }
    }
    return false;
}

} // namespace

TEST_CASE("write_change_json writes hostile text as valid JSON", "[report]") {
    const auto h = test::hostile_change();
    std::ostringstream out;
    // Before: nlohmann's dump threw type_error 316 at the first invalid byte.
    REQUIRE_NOTHROW(report::write_change_json(out, h.report, h.verdict));
    CHECK(text::is_valid_utf8(out.str()));
    const auto json = nlohmann::json::parse(out.str());
    REQUIRE(json["functions"].size() == h.report.functions.size());
    for (std::size_t i = 0; i < h.report.functions.size(); ++i) {
        const auto& f = h.report.functions[i];
        CHECK(json["functions"][i]["function"] == text::to_valid_utf8(f.name));
        CHECK(json["functions"][i]["head"]["file"] == text::to_valid_utf8(f.head->path));
        CHECK(json["functions"][i]["signature"] == "char \xEF\xBF\xBD*");
    }
    // Control characters survive in JSON as JSON's own escapes: the data stays whole.
    CHECK(json["base"]["label"] == "main\x1b]0;pwned\x07");
    CHECK(out.str().find("\\u001b") != std::string::npos);
    CHECK(json["warnings"][0]["message"] == "message caf\xEF\xBF\xBD <img src=x onerror=y()>");
}

TEST_CASE("write_change_text neutralises control characters from the repository", "[report]") {
    const auto h = test::hostile_change();
    SECTION("fitted to 100 columns, shortening never lets a control character through") {
        std::ostringstream out;
        report::write_change_text(out, h.report, h.verdict, {});
        INFO(out.str());
        CHECK_FALSE(has_control_byte(out.str()));
        CHECK(text::is_valid_utf8(out.str()));
        for (const auto& line : lines_of(out.str())) {
            CHECK(text::display_width(line) <= 100);
        }
    }
    SECTION("without colour no escape sequence and no stray line break reaches the terminal") {
        report::RenderOptions wide;
        wide.fit = report::Fit::wide; // every column and whole names: every text is there
        std::ostringstream out;
        report::write_change_text(out, h.report, h.verdict, wide);
        const std::string table = out.str();
        INFO(table);
        CHECK_FALSE(has_control_byte(table));
        CHECK(text::is_valid_utf8(table));
        CHECK(table.find("\\x1b[2J") != std::string::npos); // shown, not obeyed
        CHECK(table.find("src/a\\x0ab|c `d`.cpp:") != std::string::npos);
        CHECK(table.find("\\u202e") != std::string::npos);
        // One line per function: every row starts with its status word, then its label.
        std::size_t rows = 0;
        for (const auto& line : lines_of(table)) {
            for (const char* status : {"block  ", "warn   "}) {
                for (const char* label : {"changed ", "added "}) {
                    rows += line.rfind(std::string(status) + label, 0) == 0 ? 1 : 0;
                }
            }
        }
        CHECK(rows == h.report.functions.size());
    }
    SECTION("with colour only our own colour sequences are there") {
        report::RenderOptions options;
        options.colour = report::Colour::on;
        std::ostringstream out;
        report::write_change_text(out, h.report, h.verdict, options);
        INFO(out.str());
        CHECK(out.str().find("\x1b[38;5;166m") != std::string::npos); // our vermillion
        CHECK_FALSE(has_control_byte(without_colour(out.str())));
    }
}

TEST_CASE("write_change_markdown keeps hostile text inside its cell", "[report]") {
    const auto h = test::hostile_change();
    report::RenderOptions options;
    options.markdown_rows = 3;
    // A template whose own text holds a space and a pipe (e.g. from a CI variable).
    options.link_template = "https://git.example/my repo|x/blob/{commit}/{path}#L{line}";
    std::ostringstream out;
    report::write_change_markdown(out, h.report, h.verdict, options);
    const std::string markdown = out.str();
    INFO(markdown);
    CHECK(text::is_valid_utf8(markdown));
    CHECK_FALSE(has_control_byte(markdown));
    const auto html = test::render_gfm(markdown);
    if (!html) {
        WARN("cmark-gfm is not installed: the rendering check is skipped");
        return;
    }
    INFO(*html);
    SECTION("one entry per function, its findings listed under it, no table") {
        // Every hostile function breaks a rule, so each has an entry and none is in a table;
        // the budget adds one entry for the whole change.
        CHECK(test::occurrences(*html, "<table>") == 0);
        std::size_t budget = 0;
        std::set<std::string> blocked_functions;
        for (const auto& f : h.verdict.findings) {
            budget += f.function.empty() ? 1 : 0;
            if (f.blocks() && !f.function.empty()) {
                blocked_functions.insert(f.function + "\n" + f.path);
            }
        }
        const std::size_t entries = h.report.functions.size() + budget;
        CHECK(test::occurrences(*html, "<li>\xE2\x9B\x94 ") +
                  test::occurrences(*html, "<li>\xE2\x9A\xA0 ") ==
              entries);
        // Our own list items only: entries, their findings and commands, the policy
        // differences, the diagnostics, and the notes and skipped files.
        CHECK(test::occurrences(*html, "<li>") ==
              entries + h.verdict.findings.size() + blocked_functions.size() +
                  h.verdict.policy_changes.size() + h.report.warnings.size() +
                  h.report.notes.size() + h.report.skipped.size());
    }
    SECTION("no markup of the data's own: no HTML, links, headings or lists from it") {
        for (const char* tag : {"<script", "<img", "<b>", "<i>", "<h1", "<del"}) {
            CHECK(html->find(tag) == std::string::npos);
        }
        // Our own headings only: the verdict, and the two lists.
        CHECK(test::occurrences(*html, "<h3>") == 1);
        CHECK(test::occurrences(*html, "<h4>") == 2);
        // The only links are the template's, one per function, percent-encoded.
        const auto links = test::between(*html, "<a href=\"", "\"");
        CHECK(links.size() == h.report.functions.size());
        for (const auto& link : links) {
            CHECK(link.rfind("https://git.example/my%20repo%7Cx/blob/2222222", 0) == 0);
        }
        CHECK(html->find("src/caf%E9.c#L10") != std::string::npos);
        CHECK(html->find("src/%3Cscript%3Ealert%281%29%3C/script%3E.c#L") != std::string::npos);
    }
    SECTION("each text renders as itself") {
        CHECK(html->find("src/&lt;script&gt;alert(1)&lt;/script&gt;.c:") != std::string::npos);
        CHECK(html->find("<code>evil`name|&lt;b&gt;x&lt;/b&gt;</code>") != std::string::npos);
        CHECK(html->find("# heading \\x1b[2J\\x1b]0;title\\x07.c:") != std::string::npos);
        CHECK(html->find("src/[x](https://evil.example) www.e.x.c:") != std::string::npos);
        CHECK(html->find("<code>docs/\\x1b[31mlogo\\x0a.png</code>") != std::string::npos);
    }
}

TEST_CASE("write_change_markdown stays under its size limit", "[report]") {
    // A generated change of 20,000 touched functions with long names: about 5 MB of table.
    std::vector<delta::FunctionDelta> functions;
    for (int i = 0; i < 20000; ++i) {
        const std::string name = "generated::namespace_with_a_long_name::function_" +
                                 std::to_string(i) + "_" + std::string(120, 'x');
        functions.push_back(test::changed(
            name, "src/gen/file_" + std::to_string(i % 400) + ".c", static_cast<unsigned>(i + 1),
            test::measures_of(8, 8, 20 + i % 7, 12), test::measures_of(8, 8, 40 + i % 11, 24)));
    }
    auto report = test::report_of(functions);
    report.convention = "c-family/1";
    delta::sort_deltas(report.functions);
    delta::compute_totals(report);
    const auto policy = policy::load_policy(
        "tollgate-policy: 1\nrules:\n  - {id: effort-growth, kind: growth, measure: effort, "
        "max-increase-percent: 40}\n",
        "big.yaml");
    policy::JudgeOptions judge_options;
    judge_options.today = "2026-05-01";
    const auto verdict = policy::judge(policy, report, judge_options);
    REQUIRE(verdict.findings.size() == 20000);

    SECTION("at the default limit: under 1,000,000 bytes, saying what was cut") {
        std::ostringstream out;
        report::write_change_markdown(out, report, verdict, {});
        const std::string markdown = out.str();
        CHECK(markdown.size() <= report::k_markdown_byte_limit);
        CHECK(markdown.size() > report::k_markdown_byte_limit - 2000); // filled, not emptied
        // Every function is blocked: entries are cut last, but here they must be cut too.
        CHECK(markdown.find("> [!NOTE]\n> This report is cut to stay under 1,000,000 bytes: it "
                            "leaves out ") != std::string::npos);
        CHECK(markdown.find(" of 20,000 blocked functions (the least important and the last "
                            "listed go first)") != std::string::npos);
        CHECK(markdown.find("The JSON report (`--report json:PATH`) has everything.") !=
              std::string::npos);
        // The entries that stayed are the first ones, in report order.
        CHECK(markdown.find("`" + report.functions.front().name + "`") != std::string::npos);
        CHECK(markdown.find("`" + report.functions.back().name + "`") == std::string::npos);
        // The JSON report keeps every function.
        std::ostringstream json;
        report::write_change_json(json, report, verdict);
        CHECK(nlohmann::json::parse(json.str())["functions"].size() == 20000);
    }
    SECTION("at a smaller limit, rows go first and the rest still renders as a table") {
        const auto no_rules = policy::load_policy("tollgate-policy: 1\nrules: []\n", "none.yaml");
        const auto small_verdict = policy::judge(no_rules, report, judge_options);
        REQUIRE(small_verdict.findings.empty());
        report::RenderOptions options;
        options.markdown_bytes = 100'000;
        std::ostringstream out;
        report::write_change_markdown(out, report, small_verdict, options);
        const std::string markdown = out.str();
        CHECK(markdown.size() <= 100'000);
        CHECK(markdown.find("rows of other functions") != std::string::npos);
        CHECK(markdown.find("blocked functions") == std::string::npos);
        const auto html = test::render_gfm(markdown);
        if (!html) {
            WARN("cmark-gfm is not installed: the rendering check is skipped");
            return;
        }
        const auto rows = test::occurrences(*html, "<tr>");
        CHECK(rows > 200); // header rows included
        CHECK(test::occurrences(*html, "<table>") == 2);
        CHECK(html->find("<details><summary>") != std::string::npos);
    }
    SECTION("a report under the limit is not cut") {
        report::RenderOptions options;
        options.markdown_bytes = 100'000'000;
        std::ostringstream out;
        report::write_change_markdown(out, report, verdict, options);
        CHECK(out.str().find("[!NOTE]") == std::string::npos);
        CHECK(out.str().size() > report::k_markdown_byte_limit);
    }
}

TEST_CASE("make_link percent-encodes the data it fills in", "[report]") {
    CHECK(report::make_link("https://h.example/{commit}/{path}#L{line}", "abc123",
                            "src/my file#1?.c",
                            7) == "https://h.example/abc123/src/my%20file%231%3F.c#L7");
    CHECK(report::make_link("https://h.example/r (x)/{path}", "c", "a|b.c", 1) ==
          "https://h.example/r%20%28x%29/a%7Cb.c");
    CHECK(report::make_link("", "c", "a.c", 1).empty());
}
