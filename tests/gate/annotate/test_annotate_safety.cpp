// SPDX-License-Identifier: MIT
// "tollgate annotate": the token stays in the Authorization header, the body renders as GFM
// (Debian's cmark-gfm, the reference renderer outside the project), hostile names cannot forge
// or move the marker, and a report over the size limit is cut with a link.
#include "gate/annotate/annotate_run.hpp"

#include <catch2/catch.hpp>

using namespace tollgate::test;
using nlohmann::json;

namespace {

const std::string k_comments = "github:octo/gadget#12";
const std::string k_marker = "<!-- tollgate:annotate slot=gate -->";

// Render `markdown` with cmark-gfm (tables on, raw HTML passed through so that any HTML that
// escaped our escaping shows); exit code 127 when cmark-gfm is missing.
RunResult render_gfm(const TempDir& dir, const std::string& markdown) {
    dir.write("body.md", markdown);
    return run_command("cmark-gfm --extension table --unsafe body.md", dir.path());
}

} // namespace

TEST_CASE("annotate never shows the token outside the Authorization header", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    // The platform echoes the token in an error message: it must not reach our output either.
    FakeForge forge(
        json{{"token", k_annotate_token},
             {"faults",
              {{{"method", "PATCH"},
                {"status", 422},
                {"body", {{"message", std::string("bad token ") + k_annotate_token}}}}}}});
    const auto blocked =
        sample_change({{"Kalman::update", "src/filter.cpp", 120, 1000, 18400}}, true);
    const auto first = run_annotate(forge, dir, blocked, "github", "--line-notes");
    const auto second =
        run_annotate(forge, dir, sample_change({{"f", "a.c", 1, 10, 40}}, true), "github");
    // Run with --verbose too, through a failing edit (the 422 above).
    write_check_json(blocked, dir.path() + "/check.json");
    ScopedEnvironment environment;
    environment.set("TOLLGATE_ANNOTATE_TOKEN", k_annotate_token);
    const auto verbose = run_tollgate(
        "--verbose annotate --from check.json " + target_flags(forge, "github"), dir.path());
    CHECK(second.err.find("HTTP 422 \"bad token [token]\"") != std::string::npos);
    for (const auto* run : {&first, &second, &verbose}) {
        CHECK(run->out.find(k_annotate_token) == std::string::npos);
        CHECK(run->err.find(k_annotate_token) == std::string::npos);
    }
    CHECK(verbose.err.find("tollgate: debug: annotate:") != std::string::npos);
    CHECK(read_text(dir.path() + "/check.json").find(k_annotate_token) == std::string::npos);
    const auto requests = forge.requests();
    REQUIRE(requests.size() >= 6);
    for (const auto& request : requests) {
        CHECK(request["headers"]["Authorization"] == std::string("Bearer ") + k_annotate_token);
        json rest = request;
        rest["headers"].erase("Authorization");
        CHECK(rest.dump().find(k_annotate_token) == std::string::npos);
    }
    CHECK(forge.comments(k_comments).dump().find(k_annotate_token) == std::string::npos);
}

TEST_CASE("annotate posts a body that renders as GitHub-flavoured Markdown", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    FakeForge forge(json{{"token", k_annotate_token}});
    std::vector<SampleFunction> functions;
    for (int i = 0; i < 14; ++i) {
        functions.push_back({"ring_step_" + std::to_string(i), "src/ring.c",
                             static_cast<unsigned>(10 * i + 1), 100, 100 + 10.0 * i});
    }
    functions.push_back({"operator|", "src/flags.cpp", 3, 50, 90});
    REQUIRE(run_annotate(forge, dir, sample_change(functions, true)).exit_code == 0);
    const auto comments = forge.comments(k_comments);
    REQUIRE(comments.size() == 1);
    const auto rendered = render_gfm(dir, comments[0]["body"].get<std::string>());
    if (rendered.exit_code == 127) {
        WARN("cmark-gfm is not installed; skipping the rendering check");
        return;
    }
    REQUIRE(rendered.exit_code == 0);
    // The marker is an HTML comment of its own (hidden on the page), before everything else.
    CHECK(rendered.out.rfind(k_marker + "\n<h3>\xE2\x9B\x94 Tollgate blocks this change", 0) == 0);
    CHECK(occurrences(rendered.out, "<!--") == 1);
    CHECK(occurrences(rendered.out, "<table>") == 2); // shown rows and the folded rest
    // The blocked function has its entry above the table: 14 rows and 2 header rows.
    CHECK(occurrences(rendered.out, "<tr>") == 14 + 2);
    CHECK(occurrences(rendered.out, "<h4>Blocks the merge</h4>") == 1);
    CHECK(rendered.out.find("<td><code>operator|</code></td>") != std::string::npos);
    CHECK(rendered.out.find("href=\"http://127.0.0.1") == std::string::npos);
}

TEST_CASE("annotate keeps its marker whatever the report's text says", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    // Someone writes a comment that starts with our marker before the first run: it is not ours
    // (a person, not the bot) and must never be edited.
    FakeForge forge(
        {{"token", k_annotate_token},
         {"seed",
          {{{"collection", k_comments}, {"author", "mallory"}, {"body", k_marker + "\nplanted"}},
           {{"collection", k_comments},
            {"author", "github-actions[bot]"},
            {"type", "Bot"},
            {"body", "<!-- tollgate:annotate slot=other -->\nanother gate"}}}}});
    const std::string forged = k_marker + " --> <!-- x";
    auto change = sample_change({{"operator<" + forged, "src/" + forged + ".cpp", 9, 10, 900},
                                 {"ring_push", "src/ring.c", 31, 10, 20}},
                                true);
    change.verdict.findings[0].message = forged + " grew";
    change.report.notes.push_back(forged);
    change.report.skipped.push_back({forged + ".png", "binary"});
    const auto first = run_annotate(forge, dir, change);
    CHECK(first.err == "tollgate: comment 1003 created on pull request octo/gadget#12 (github)\n");
    auto comments = forge.comments(k_comments);
    REQUIRE(comments.size() == 3);
    CHECK(comments[0]["body"] == k_marker + "\nplanted");
    const std::string body = comments[2]["body"];
    CHECK(body.rfind(k_marker + "\n### \xE2\x9B\x94 Tollgate blocks this change", 0) == 0);

    // The next run finds the comment it wrote, not the planted one nor the other slot's.
    change.report.functions[1].head->measures.effort = 30;
    const auto second = run_annotate(forge, dir, change);
    CHECK(second.err == "tollgate: comment 1003 updated on pull request octo/gadget#12 (github)\n");
    const auto patches = forge.requests("PATCH", ".*");
    REQUIRE(patches.size() == 1);
    CHECK(patches[0]["path"] == "/repos/octo/gadget/issues/comments/1003");

    const auto rendered = render_gfm(dir, body);
    if (rendered.exit_code == 127) {
        WARN("cmark-gfm is not installed; skipping the rendering check");
        return;
    }
    // Only our marker is an HTML comment on the page; every forged copy shows as text.
    CHECK(rendered.out.rfind(k_marker + "\n", 0) == 0);
    CHECK(occurrences(rendered.out, "<!--") == 1);
    CHECK(occurrences(rendered.out, "-->") == 1);
}

TEST_CASE("annotate cuts a report over GitHub's size limit and links the full one",
          "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    // The fake platform refuses bodies over 65,536 characters with 422, as GitHub does.
    FakeForge forge(json{{"token", k_annotate_token}});
    std::vector<SampleFunction> functions;
    for (int i = 0; i < 900; ++i) {
        functions.push_back({"telemetry::frame_decoder_stage_" + std::to_string(i),
                             "src/telemetry/decoder.cpp", static_cast<unsigned>(5 * i + 1), 1000,
                             1000 + 3.0 * i});
    }
    const auto run = run_annotate(forge, dir, sample_change(functions, true), "github",
                                  "--artifact-url https://ci.example/runs/77");
    CHECK(run.err == "tollgate: comment 1001 created on pull request octo/gadget#12 (github); "
                     "the report was cut to fit the platform's size limit\n");
    const auto comments = forge.comments(k_comments);
    REQUIRE(comments.size() == 1);
    const std::string body = comments[0]["body"];
    CHECK(body.size() <= 65536);
    CHECK(body.size() > 60000);
    CHECK(body.find("of 900 touched functions shown; [the full report]"
                    "(https://ci.example/runs/77) is kept with the pipeline's artifacts.") !=
          std::string::npos);
    CHECK(forge.requests("POST", ".*").size() == 1);
}

// Hostile text in function names, paths and messages must render as text in the posted comment
// (a backtick must not end a code span, a newline start a block, a path end a link).
TEST_CASE("annotate posts hostile names and paths as text", "[annotate][cli]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    FakeForge forge(json{{"token", k_annotate_token}});
    const std::string name = "evil`<script>alert(1)</script>`|x\n| a | b |\n"
                             "[x](javascript:alert(1)) @team";
    const std::string path = "src/`<img src=x onerror=alert(1)>`|) (x).c";
    auto change = sample_change({{name, path, 9, 10, 900}}, true);
    change.verdict.findings[0].message = "grew `<script>bad()</script>`\n\n# heading";
    change.report.skipped.push_back({"docs/`<script>s()</script>`.md", "not C/C++"});
    change.report.warnings.push_back({"head", "w`<b>bold</b>`.c", 3, "unknown type"});
    const auto run = run_annotate(forge, dir, change, "github",
                                  "--link-template 'https://git.example/r/blob/{commit}/{path}'");
    REQUIRE(run.exit_code == 0);
    const auto comments = forge.comments(k_comments);
    REQUIRE(comments.size() == 1);
    const auto rendered = render_gfm(dir, comments[0]["body"].get<std::string>());
    if (rendered.exit_code == 127) {
        WARN("cmark-gfm is not installed; skipping the rendering check");
        return;
    }
    const std::string& html = rendered.out;
    INFO(html);
    CHECK(html.rfind(k_marker + "\n", 0) == 0);
    CHECK(occurrences(html, "<!--") == 1);
    for (const char* tag : {"<script", "<img", "<b>", "<h1>", "href=\"javascript:"}) {
        CHECK(html.find(tag) == std::string::npos);
    }
    // The one function blocks: one entry, no table of other functions.
    CHECK(occurrences(html, "<table>") == 0);
    CHECK(occurrences(html, "<li>\xE2\x9B\x94 <code>") == 1);
    CHECK(occurrences(html, "<a href=\"") == occurrences(html, "<a href=\"https://git.example/"));
}
