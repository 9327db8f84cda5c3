// SPDX-License-Identifier: MIT
// The real binary on a repository whose file names, sources and commit subjects are hostile
// (Latin-1 bytes, terminal escape sequences, newlines, markup): every command writes valid
// output and no control character of the repository's reaches the terminal.
#include "gate/common/text_safety.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <nlohmann/json.hpp>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_command;
using tollgate::test::run_tollgate;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

const std::string k_fffd = "\xEF\xBF\xBD";
const std::string k_latin1 = "caf\xE9.c";              // "café.c" in Latin-1
const std::string k_escapes = "e\x1b[31mvil|x\n<b>.c"; // colour, newline, pipe, markup

// Return whether `text` holds a C0 control other than the line feed, DEL, or a C1 control.
bool has_control(const std::string& text) {
    for (std::size_t i = 0; i < text.size(); ++i) {
        const auto c = static_cast<unsigned char>(text[i]);
        if ((c < 0x20 && c != '\n') || c == 0x7F ||
            (c == 0xC2 && i + 1 < text.size() &&
             (static_cast<unsigned char>(text[i + 1]) & 0xE0) == 0x80)) {
            return true;
        }
    }
    return false;
}

// A repository: base has the Latin-1 file; head changes it and adds the file full of escapes.
struct Hostile {
    TempDir dir;
    std::string base, head;
    Hostile() {
        init_repo(dir.path());
        dir.write(k_latin1, "int f(int x) {\n    return x;\n}\n");
        base = commit_all(dir.path(), "base");
        dir.write(k_latin1,
                  "const char* f(int x) {\n    return x ? \"caf\xE9\" : \"\x1b[2J\";\n}\n");
        dir.write(k_escapes, "int g(int x) {\n    return x * 2;\n}\n");
        head = commit_all(dir.path(), "grow \x1b]0;pwned\x07 caf\xE9 <script>x</script>");
    }
};

} // namespace

TEST_CASE("check writes every report for a change with hostile file names", "[check]") {
    Hostile h;
    const auto result =
        run_tollgate("check --no-pch-cache --no-color --base " + h.base + " --head " + h.head +
                         " --report json:out.json --report sarif:out.sarif "
                         "--report markdown:out.md --report text:-",
                     h.dir.path());
    INFO(result.err);
    // Before: "json type_error.316", exit 3, and no report written.
    REQUIRE(result.exit_code == 0);
    const auto json = nlohmann::json::parse(read_text(h.dir.path() + "/out.json"));
    REQUIRE(json["functions"].size() == 2);
    std::vector<std::string> files;
    for (const auto& f : json["functions"]) {
        files.push_back(f["head"]["file"]);
    }
    std::sort(files.begin(), files.end());
    CHECK(files == std::vector<std::string>{"caf" + k_fffd + ".c", k_escapes});
    const auto sarif = nlohmann::json::parse(read_text(h.dir.path() + "/out.sarif"));
    CHECK(sarif["version"] == "2.1.0");
    const std::string markdown = read_text(h.dir.path() + "/out.md");
    CHECK(tollgate::text::is_valid_utf8(markdown));
    CHECK_FALSE(has_control(markdown));
    CHECK(markdown.find("<b>") == std::string::npos);
    // The terminal table: valid UTF-8, the escape shown as text, one line per function.
    CHECK(tollgate::text::is_valid_utf8(result.out));
    CHECK_FALSE(has_control(result.out));
    CHECK(result.out.find("e\\x1b[31mvil|x\\x0a<b>.c:1") != std::string::npos);
}

TEST_CASE("measure and explain write hostile sources as valid JSON and safe text", "[check]") {
    Hostile h;
    SECTION("measure --format json") {
        const auto result = run_tollgate("measure --no-pch-cache --format json", h.dir.path());
        INFO(result.err);
        REQUIRE(result.exit_code == 0); // before: exit 3
        CHECK(nlohmann::json::parse(result.out)["functions"].size() == 2);
    }
    SECTION("measure as text") {
        const auto result = run_tollgate("measure --no-pch-cache", h.dir.path());
        REQUIRE(result.exit_code == 0);
        CHECK_FALSE(has_control(result.out));
    }
    SECTION("explain --format json and as text") {
        const auto json = run_tollgate(
            "explain --no-pch-cache --format json " + shell_quote(k_latin1 + ":f"), h.dir.path());
        INFO(json.err);
        REQUIRE(json.exit_code == 0); // before: exit 3
        const auto doc = nlohmann::json::parse(json.out);
        std::vector<std::string> operands;
        for (const auto& entry : doc["operands"]) {
            operands.push_back(entry["token"]);
        }
        CHECK(std::find(operands.begin(), operands.end(), "\"caf" + k_fffd + "\"") !=
              operands.end());
        const auto text =
            run_tollgate("explain --no-pch-cache " + shell_quote(k_latin1 + ":f"), h.dir.path());
        REQUIRE(text.exit_code == 0);
        CHECK_FALSE(has_control(text.out));
        CHECK(text.out.find("\"\\x1b[2J\"") != std::string::npos);
    }
}

TEST_CASE("error messages show the control characters they quote", "[check]") {
    Hostile h;
    const auto result = run_tollgate("explain " + shell_quote("nope\x1b[31m\n.c:f"), h.dir.path());
    CHECK(result.exit_code == 2);
    INFO(result.err);
    CHECK_FALSE(has_control(result.err));
    CHECK(result.err.find("nope\\x1b[31m\\x0a.c") != std::string::npos);
}

TEST_CASE("calibrate reports hostile commit subjects and file names safely", "[check]") {
    Hostile h;
    TempDir cache;
    const std::string page = cache.path() + "/page.html";
    // The functions are tiny: a policy without a noise floor keeps them in the distributions.
    cache.write("all.yaml", "tollgate-policy: 1\nnoise-floor: {}\nrules: []\n");
    const auto json = run_tollgate(
        "calibrate --no-pch-cache --format json --cache-dir " + shell_quote(cache.path() + "/c") +
            " --html " + shell_quote(page) + " --policy " + shell_quote(cache.path() + "/all.yaml"),
        h.dir.path());
    INFO(json.err);
    REQUIRE(json.exit_code == 0); // before: exit 3 at the first Latin-1 byte
    const auto doc = nlohmann::json::parse(json.out);
    // git may store the Latin-1 byte as it is or re-encode it: either way the JSON is valid.
    bool subject_found = false;
    for (const auto& commit : doc["commits"]) {
        const std::string subject = commit["subject"];
        subject_found = subject_found || (subject.rfind("grow \x1b]0;pwned\x07 caf", 0) == 0 &&
                                          subject.find(" <script>x</script>") != std::string::npos);
    }
    CHECK(subject_found);
    const std::string html = read_text(page);
    CHECK(html.find("<script") == std::string::npos);
    CHECK(html.find("grow \\x1b]0;pwned\\x07 caf") != std::string::npos);
    CHECK(html.find(" &lt;script&gt;x&lt;/script&gt;") != std::string::npos);
    CHECK_FALSE(has_control(html));
    // A second run reads the lexed files back from the cache: the same measures.
    const auto again = run_tollgate("calibrate --no-pch-cache --format json --cache-dir " +
                                        shell_quote(cache.path() + "/c") + " --policy " +
                                        shell_quote(cache.path() + "/all.yaml"),
                                    h.dir.path());
    REQUIRE(again.exit_code == 0);
    const auto second = nlohmann::json::parse(again.out);
    CHECK(second["cache"]["hits"].get<int>() > 0);
    CHECK(second["cache"]["damaged"] == 0);
    CHECK(second["measures"] == doc["measures"]);
    const auto text = run_tollgate(
        "calibrate --no-pch-cache --cache-dir " + shell_quote(cache.path() + "/c"), h.dir.path());
    REQUIRE(text.exit_code == 0);
    CHECK_FALSE(has_control(text.out));
}

TEST_CASE("hook run shows ref names with control characters as text", "[hook]") {
    Hostile h;
    const std::string ref = "refs/heads/x\x1b[31m";
    const std::string line = ref + " " + h.head + " " + ref + " " + h.head;
    // run_command gives the command no input: the pipe runs in its own shell.
    const auto result =
        run_command("sh -c " + shell_quote("printf '%s\\n' " + shell_quote(line) + " | " +
                                           shell_quote(TOLLGATE_BINARY) + " hook run -- origin"),
                    h.dir.path());
    CHECK(result.exit_code == 0);
    INFO(result.err);
    CHECK(result.err.find("refs/heads/x\\x1b[31m: nothing to judge") != std::string::npos);
    CHECK_FALSE(has_control(result.err));
}

TEST_CASE("policy prints invisible and control characters as YAML escapes", "[policy]") {
    TempDir dir;
    // A glob with a right-to-left override and a waiver reason with a window-title sequence.
    dir.write(
        "p.yaml",
        "tollgate-policy: 1\n"
        "rules:\n"
        "  - {id: r1, kind: growth, measure: effort, max-increase: 5}\n"
        "paths:\n"
        "  include: [\"src/\\u202e*.c\"]\n"
        "waivers:\n"
        "  - {file: \"a.c\", function: \"f\", rules: [r1], reason: \"x\\e]0;t\\a caf\xC3\xA9\"}\n");
    const auto result = run_tollgate("policy p.yaml", dir.path());
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
    INFO(result.out);
    CHECK_FALSE(has_control(result.out));
    CHECK(result.out.find("\xE2\x80\xAE") == std::string::npos); // before: printed raw
    CHECK(result.out.find("\\u202e") != std::string::npos);
    // What it prints is still the same policy.
    dir.write("printed.yaml", result.out);
    const auto reread = run_tollgate("policy printed.yaml", dir.path());
    REQUIRE(reread.exit_code == 0);
    CHECK(reread.out.substr(reread.out.find('\n')) == result.out.substr(result.out.find('\n')));
}
