// SPDX-License-Identifier: MIT
// The Markdown report's layout as a reviewer sees it: rendered by cmark-gfm (GitHub's cmark
// fork, outside the project) and laid out by headless Chromium, whose DOM a script of the test
// reads: blocked functions come first and stay visible whatever their growth, then warnings,
// then the other functions with the rest folded.
#include "../policy/policy_test_support.hpp"
#include "gate/policy/judge.hpp"
#include "gate/policy/policy.hpp"
#include "gate/report/change_report.hpp"
#include "support/browser.hpp"
#include "support/render_markdown.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

using namespace tollgate;

namespace {

// The facts the browser's layout gives: which entries and rows are visible, which are folded.
constexpr const char* k_probe = R"JS(
(function () {
  const facts = {};
  // Shown: laid out and not hidden by a closed <details> (checkVisibility sees that).
  const shown = el => el.getClientRects().length > 0 &&
      (el.checkVisibility ? el.checkVisibility() : el.closest('details:not([open])') === null);
  const headings = [...document.querySelectorAll('h3, h4')];
  facts.headings = headings.map(h => h.tagName + ' ' + h.textContent);
  const section = prefix => {
    const h = headings.find(x => x.tagName === 'H4' && x.textContent.startsWith(prefix));
    const list = h ? h.nextElementSibling : null;
    return list && list.tagName === 'UL' ? list : null;
  };
  const entries = list => list ? [...list.children].map(li => ({
      name: li.querySelector('code').textContent,
      items: [...li.querySelectorAll(':scope > ul > li')].map(r => r.textContent),
      visible: shown(li),
      folded: li.closest('details') !== null })) : [];
  facts.blocking = entries(section('Blocks the merge'));
  facts.warning = entries(section('Warnings'));
  const fold = document.querySelector('details');
  const blocks = section('Blocks the merge');
  facts.blocking_before_first_fold = !!(blocks && fold &&
      (blocks.compareDocumentPosition(fold) & Node.DOCUMENT_POSITION_FOLLOWING));
  facts.shown_rows = [];
  facts.folded_rows = [];
  for (const row of document.querySelectorAll('tbody tr')) {
    const entry = {name: row.querySelector('code').textContent, visible: shown(row)};
    (row.closest('details') ? facts.folded_rows : facts.shown_rows).push(entry);
  }
  facts.folds = [...document.querySelectorAll('details > summary')].map(s => s.textContent);
  document.getElementById('facts').textContent = JSON.stringify(facts);
})();
)JS";

struct Scenario {
    delta::ChangeReport report;
    policy::Verdict verdict;
    std::string blocked;             // the one blocked function
    std::vector<std::string> warned; // functions with warnings, in report order
};

// Thirty changed functions: twenty-nine grow a lot and stay under the difficulty ceiling; one
// grows least of all but is far above the ceiling, so it alone blocks. The largest growths also
// pass a warning level.
Scenario thirty_functions() {
    Scenario s;
    std::vector<delta::FunctionDelta> functions;
    for (unsigned i = 0; i < 29; ++i) {
        functions.push_back(test::changed(
            "station::filters::grown_" + std::to_string(i), "src/filters/grown.cpp", 10 + 20 * i,
            test::measures_of(10, 10, 30, 30), test::measures_of(10, 10, 60 + 2 * i, 60 + 2 * i)));
    }
    s.blocked = "station::filters::steady_but_dense";
    functions.push_back(test::changed(s.blocked, "src/filters/dense.cpp", 7,
                                      test::measures_of(40, 5, 50, 50),
                                      test::measures_of(40, 5, 51, 51)));
    s.report = test::report_of(functions);
    s.report.base_label = "main (3f2a91c)";
    s.report.head_label = "HEAD (9b1c0de)";
    s.report.convention = "c-family/1";
    delta::sort_deltas(s.report.functions);
    delta::compute_totals(s.report);
    const auto policy = policy::load_policy(R"(tollgate-policy: 1
rules:
  - {id: difficulty-ceiling, kind: ceiling, measure: difficulty, ceiling: 100}
  - {id: effort-watch, kind: growth, measure: effort, max-increase: 45000, level: warning}
)",
                                            "team.yaml");
    policy::JudgeOptions options;
    options.today = "2026-05-01";
    options.policy_origin = ".tollgate.yaml at base 3f2a91c";
    s.verdict = policy::judge(policy, s.report, options);
    for (const auto& f : s.report.functions) {
        for (const auto& finding : s.verdict.findings) {
            if (finding.function == f.name && !finding.blocks()) {
                s.warned.push_back(f.name);
                break;
            }
        }
    }
    return s;
}

std::string markdown_of(const Scenario& s) {
    std::ostringstream out;
    report::write_change_markdown(out, s.report, s.verdict, {});
    return out.str();
}

} // namespace

TEST_CASE("write_change_markdown shows a blocked function first whatever its growth", "[report]") {
    const Scenario s = thirty_functions();
    // The scenario is what it claims: one blocking finding, on the least-grown function.
    REQUIRE(s.report.functions.size() == 30);
    REQUIRE(s.report.functions.back().name == s.blocked);
    REQUIRE(policy::count_blocking(s.verdict) == 1);
    REQUIRE(s.verdict.findings.front().function == s.blocked);
    REQUIRE(s.warned.size() >= 3);
    REQUIRE(s.warned.size() <= 10);
    const std::string markdown = markdown_of(s);
    INFO(markdown);

    SECTION("in the Markdown, before any fold") {
        const auto entry = markdown.find("`" + s.blocked + "`");
        REQUIRE(entry != std::string::npos);
        CHECK(entry < markdown.find("<details>"));
        CHECK(markdown.rfind("### \xE2\x9B\x94 Tollgate blocks this change: 1 function over a "
                             "blocking limit, ",
                             0) == 0);
        // One entry per function: the blocked one appears once as a name, once in its command.
        CHECK(test::occurrences(markdown, s.blocked) == 2);
        CHECK(markdown.find("why: `tollgate explain --change 1111111111..2222222222 "
                            "src/filters/dense.cpp:" +
                            s.blocked + "`") != std::string::npos);
    }
    const auto html = test::render_gfm(markdown);
    if (!html) {
        WARN("cmark-gfm is not installed: the rendering checks are skipped");
        return;
    }
    SECTION("rendered by cmark-gfm: headings in reading order, the blocked entry before the fold") {
        const auto blocks = html->find("<h4>Blocks the merge</h4>");
        const auto warnings = html->find("<h4>Warnings (they do not block)</h4>");
        const auto others = html->find("<h4>Other touched functions</h4>");
        REQUIRE(blocks != std::string::npos);
        CHECK(blocks < warnings);
        CHECK(warnings < others);
        CHECK(html->find("<code>" + s.blocked + "</code>") < html->find("<details>"));
        CHECK(test::occurrences(*html, "<details>") == 1); // the other functions past ten
    }
    if (!test::have_chromium()) {
        WARN("chromium is not installed: the page was not laid out in a browser "
             "(apt-get install chromium)");
        return;
    }
    test::TempDir dir;
    dir.write("report.html", "<!DOCTYPE html><html><head><meta charset=\"utf-8\"></head><body>" +
                                 *html + "<pre id=\"facts\"></pre><script>" + k_probe +
                                 "</script></body></html>");
    const auto dom = test::dump_dom(dir.path() + "/report.html");
    REQUIRE(dom);
    const auto facts_html = test::between(*dom, "<pre id=\"facts\">", "</pre>");
    REQUIRE(facts_html.size() == 1);
    const auto facts = nlohmann::json::parse(test::unescape_html(facts_html.front()));
    INFO(facts.dump(2));

    SECTION("in the browser: the blocked function is laid out, visible, before the first fold") {
        REQUIRE(facts["blocking"].size() == 1);
        const auto& entry = facts["blocking"][0];
        CHECK(entry["name"] == s.blocked);
        CHECK(entry["visible"] == true);
        CHECK(entry["folded"] == false);
        CHECK(facts["blocking_before_first_fold"] == true);
        // Its findings grouped under it: the blocking rule, then the command to learn why.
        REQUIRE(entry["items"].size() == 2);
        CHECK(entry["items"][0].get<std::string>().find("rule \"difficulty-ceiling\", blocking") !=
              std::string::npos);
        CHECK(entry["items"][1].get<std::string>().rfind("why: tollgate explain", 0) == 0);
    }
    SECTION("then the warnings, one entry per function, visible") {
        REQUIRE(facts["warning"].size() == s.warned.size());
        for (std::size_t i = 0; i < s.warned.size(); ++i) {
            CHECK(facts["warning"][i]["name"] == s.warned[i]);
            CHECK(facts["warning"][i]["visible"] == true);
            CHECK(facts["warning"][i]["items"].size() == 1);
        }
    }
    SECTION("then the other functions: ten shown, the rest folded and not laid out") {
        std::set<std::string> listed;
        REQUIRE(facts["shown_rows"].size() == 10);
        for (const auto& row : facts["shown_rows"]) {
            CHECK(row["visible"] == true);
            listed.insert(row["name"].get<std::string>());
        }
        for (const auto& row : facts["folded_rows"]) {
            CHECK(row["visible"] == false);
            listed.insert(row["name"].get<std::string>());
        }
        CHECK(listed.size() == 30 - 1 - s.warned.size());
        CHECK(listed.count(s.blocked) == 0);
        for (const auto& name : s.warned) {
            CHECK(listed.count(name) == 0);
        }
        CHECK(facts["folds"] ==
              nlohmann::json::array({std::to_string(listed.size() - 10) + " more functions"}));
    }
}

TEST_CASE("write_change_markdown cuts blocked entries last", "[report]") {
    const Scenario s = thirty_functions();
    std::ostringstream whole;
    report::write_change_markdown(whole, s.report, s.verdict, {});
    report::RenderOptions options;
    // Room for the heading, the blocked entry and the note, not for the rest.
    options.markdown_bytes = whole.str().find("#### Warnings") + 400;
    std::ostringstream out;
    report::write_change_markdown(out, s.report, s.verdict, options);
    const std::string markdown = out.str();
    INFO(markdown);
    CHECK(markdown.size() <= options.markdown_bytes);
    CHECK(markdown.find("`" + s.blocked + "`") != std::string::npos);
    const std::string others = std::to_string(29 - s.warned.size());
    CHECK(markdown.find("leaves out " + others + " of " + others + " rows of other functions") !=
          std::string::npos);
    CHECK(markdown.find("#### Other touched functions") == std::string::npos);
}
