// SPDX-License-Identifier: MIT
// The comment body: marker line first, the report through its renderer, cuts to the size limit.
#include "gate/annotate/comment_body.hpp"
#include "gate/annotate/sample_change.hpp"

#include <catch2/catch.hpp>
#include <sstream>

using namespace tollgate::annotate;
using tollgate::test::sample_change;
using tollgate::test::SampleFunction;

namespace {

std::vector<SampleFunction> many_functions(std::size_t count) {
    std::vector<SampleFunction> functions;
    for (std::size_t i = 0; i < count; ++i) {
        functions.push_back({"sensor_fusion_step_" + std::to_string(i), "src/fusion.cpp",
                             static_cast<unsigned>(10 * i + 1), 1000, 1000 + 10.0 * i});
    }
    return functions;
}

std::size_t count_of(const std::string& text, const std::string& what) {
    std::size_t n = 0;
    for (auto pos = text.find(what); pos != std::string::npos; pos = text.find(what, pos + 1)) {
        ++n;
    }
    return n;
}

} // namespace

TEST_CASE("comment_marker and starts_with_marker", "[annotate]") {
    const std::string marker = comment_marker("gate");
    CHECK(marker == "<!-- tollgate:annotate slot=gate -->");
    SECTION("the marker must be the body's whole first line") {
        CHECK(
            starts_with_marker(marker + "\n### \xE2\x9C\x93 Tollgate passes this change", marker));
        CHECK(starts_with_marker(marker + "\r\nrest", marker));
        CHECK(starts_with_marker(marker, marker));
        CHECK_FALSE(starts_with_marker(" " + marker + "\n", marker));
        CHECK_FALSE(starts_with_marker("quoted:\n" + marker + "\n", marker));
        CHECK_FALSE(starts_with_marker(marker + " and more\n", marker));
        CHECK_FALSE(starts_with_marker(comment_marker("gate2") + "\n", marker));
    }
    SECTION("slots are short names without spaces or markup") {
        CHECK(valid_slot("gate"));
        CHECK(valid_slot("firmware.core-2_x"));
        CHECK_FALSE(valid_slot(""));
        CHECK_FALSE(valid_slot("a b"));
        CHECK_FALSE(valid_slot("x-->"));
        CHECK_FALSE(valid_slot(std::string(65, 'a')));
    }
}

TEST_CASE("compose_comment", "[annotate]") {
    tollgate::report::RenderOptions options;
    SECTION("a body within the limit is the marker line and the rendered report, whole") {
        const auto change = sample_change(many_functions(3), true);
        const auto body = compose_comment(change.report, change.verdict, options, "gate", 65536,
                                          "https://ci.example/runs/7");
        CHECK_FALSE(body.cut);
        CHECK(body.shown_functions == 3);
        std::ostringstream rendered;
        tollgate::report::write_change_markdown(rendered, change.report, change.verdict, options);
        CHECK(body.text == "<!-- tollgate:annotate slot=gate -->\n" + rendered.str());
    }
    SECTION("a report over the limit keeps the rows that fit and links the full report") {
        const auto change = sample_change(many_functions(400), true);
        const std::size_t limit = 8000;
        const auto body = compose_comment(change.report, change.verdict, options, "gate", limit,
                                          "https://ci.example/runs/7");
        CHECK(body.cut);
        CHECK(body.text.size() <= limit);
        CHECK(body.shown_functions > 10);
        CHECK(body.shown_functions < 400);
        CHECK(starts_with_marker(body.text, comment_marker("gate")));
        CHECK(body.text.find("of 400 touched functions shown; [the full report]"
                             "(https://ci.example/runs/7) is kept with the pipeline's "
                             "artifacts.") != std::string::npos);
        // The largest growth comes first and is kept; the summary still counts all 400.
        CHECK(body.text.find("`sensor_fusion_step_399`") != std::string::npos);
        CHECK(body.text.find("400 functions touched") != std::string::npos);
        CHECK(count_of(body.text, "<details>") == count_of(body.text, "</details>"));
        // One more row would not have fitted.
        const auto wider = compose_comment(change.report, change.verdict, options, "gate",
                                           body.text.size() - 1, "https://ci.example/runs/7");
        CHECK(wider.shown_functions < body.shown_functions);
    }
    SECTION("when not even one row fits, the text is cut at a line and <details> closed") {
        auto change = sample_change(many_functions(30), true);
        for (int i = 0; i < 200; ++i) {
            change.verdict.notes.push_back("waiver note number " + std::to_string(i) +
                                           " with enough words to take room");
        }
        const auto body = compose_comment(change.report, change.verdict, options, "gate", 3000, "");
        CHECK(body.cut);
        CHECK(body.text.size() <= 3000);
        CHECK(body.shown_functions == 0);
        CHECK(body.text.find("the full report is kept with the pipeline's artifacts.") !=
              std::string::npos);
        CHECK(count_of(body.text, "<details>") == count_of(body.text, "</details>"));
    }
    SECTION("an artifact link that is not http(s) is left out, and odd bytes are encoded") {
        const auto change = sample_change(many_functions(400), false);
        const auto unsafe = compose_comment(change.report, change.verdict, options, "gate", 8000,
                                            "javascript:alert(1)");
        CHECK(unsafe.text.find("javascript") == std::string::npos);
        const auto odd = compose_comment(change.report, change.verdict, options, "gate", 8000,
                                         "https://ci.example/a b)(<x>");
        CHECK(odd.text.find("(https://ci.example/a%20b%29%28%3Cx%3E)") != std::string::npos);
    }
}

TEST_CASE("compose_now_passes", "[annotate]") {
    const auto change = sample_change({}, false);
    CHECK(compose_now_passes(change.report, "gate") ==
          "<!-- tollgate:annotate slot=gate -->\n**Tollgate: now passes**: the change no longer "
          "touches a C/C++ function (head `9b1c0de`).\n");
}

TEST_CASE("finding_key and line notes", "[annotate]") {
    const auto change =
        sample_change({{"Kalman::update", "src/filter.cpp", 120, 1000, 18400}}, true);
    auto finding = change.verdict.findings.front();
    const std::string key = finding_key(finding);
    SECTION("the key is 16 hex digits, stable across lines and messages") {
        CHECK(key.size() == 16);
        CHECK(key.find_first_not_of("0123456789abcdef") == std::string::npos);
        finding.start_line = 300;
        finding.message = "another wording";
        CHECK(finding_key(finding) == key);
        finding.rule_id = "difficulty-ceiling";
        CHECK(finding_key(finding) != key);
    }
    SECTION("a note carries the key in its marker and the message escaped") {
        finding.message = "a.c:1: f<T>() `x` [y](z) *w* | <!-- -->";
        const std::string note = compose_line_note(finding, "gate");
        CHECK(note == "<!-- tollgate:annotate slot=gate note=" + key +
                          " -->\n**Tollgate: blocking**: a\\.c\\:1\\: f\\<T\\>\\(\\) \\`x\\` "
                          "\\[y\\]\\(z\\) \\*w\\* \\| \\<\\!\\-\\- \\-\\-\\>\n");
    }
}

TEST_CASE("escape_inline", "[annotate]") {
    CHECK(escape_inline("plain words 42") == "plain words 42");
    CHECK(escape_inline("two\nlines\r\n") == "two lines  ");
    CHECK(escape_inline("@someone #12") == "\\@someone \\#12");
    CHECK(escape_inline(std::string("bell\x07")) == "bell");
}
