// SPDX-License-Identifier: MIT
// `tollgate check` on the way in: advisory runs, exemptions a change carries (refused unless the
// base policy accepts them, escaped in every report), the hint for an uncommitted policy draft,
// and the explain command each finding names; real temp repositories and the real binary.
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <string>

using tollgate::test::commit_all;
using tollgate::test::git;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_tollgate;
using tollgate::test::TempDir;

namespace {

std::string policy(const std::string& extra) {
    return "tollgate-policy: 1\n"
           "noise-floor: {volume: 1}\n"
           "rules:\n"
           "  - {id: effort-growth, kind: growth, measure: effort, max-increase-percent: 10}\n" +
           extra;
}

const char* const k_base_source = "int gain(int x, int k) {\n    return x * k;\n}\n";
const char* const k_grown_source = "int gain(int x, int k) {\n"
                                   "    int y = x * k + 3;\n"
                                   "    if (y > 100 || y < -100) {\n"
                                   "        y = y > 0 ? 100 : -100;\n"
                                   "    }\n"
                                   "    return y - x % 5;\n"
                                   "}\n";

// A repository with a base commit under `policy_text` and a head commit that grows gain() with
// `source`, committed with `message`.
struct Change {
    TempDir dir;
    std::string repo = dir.path() + "/repo";
    std::string base;
    std::string head;

    Change(const std::string& policy_text, const std::string& source, const std::string& message) {
        init_repo(repo);
        dir.write("repo/.tollgate.yaml", policy_text);
        dir.write("repo/gain.c", k_base_source);
        base = commit_all(repo, "base");
        dir.write("repo/gain.c", source);
        dir.write("message.txt", message);
        git("add -A", repo);
        git("commit -q -F ../message.txt", repo);
        head = git("rev-parse HEAD", repo);
        while (!head.empty() && head.back() == '\n') {
            head.pop_back();
        }
    }

    tollgate::test::RunResult check(const std::string& extra) const {
        return run_tollgate("check --no-pch-cache --base " + base + " --head " + head +
                                " --report json:../out.json --report sarif:../out.sarif "
                                "--report markdown:../out.md --report text:- --wide " +
                                extra,
                            repo);
    }
    nlohmann::json json() const {
        return nlohmann::json::parse(read_text(dir.path() + "/out.json"));
    }
    nlohmann::json sarif() const {
        return nlohmann::json::parse(read_text(dir.path() + "/out.sarif"));
    }
    std::string markdown() const { return read_text(dir.path() + "/out.md"); }
};

const std::string k_trailer_message = "Unroll the gain table\n\n"
                                      "Tollgate-Exemption: gain (effort-growth): the sensor "
                                      "table is unrolled on purpose\n";

} // namespace

TEST_CASE("check --advisory and the policy's advisory key report what would block and pass",
          "[check][rollout]") {
    SECTION("the flag") {
        Change change(policy(""), k_grown_source, "grow");
        const auto blocked = change.check("");
        CHECK(blocked.exit_code == 1);
        const auto result = change.check("--advisory");
        INFO(result.err);
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("verdict: pass (advisory run: 1 finding would block)") !=
              std::string::npos);
        CHECK(result.out.find("would block: effort") != std::string::npos);
        const auto json = change.json();
        CHECK(json["verdict"]["outcome"] == "would-block");
        CHECK(json["verdict"]["enforcement"] == "advisory");
        REQUIRE(json["verdict"]["findings"].size() == 1);
        CHECK(json["verdict"]["findings"][0]["would_block"] == true);
        const auto sarif = change.sarif();
        const auto& finding = sarif["runs"][0]["results"][0];
        CHECK(finding["level"] == "warning");
        CHECK(finding["properties"]["wouldBlock"] == true);
        CHECK(finding["message"]["text"].get<std::string>().rfind("would block (advisory run): ",
                                                                  0) == 0);
        CHECK(sarif["runs"][0]["properties"]["outcome"] == "would-block");
        CHECK(change.markdown().find("### \xE2\x9A\xA0 Tollgate would block this change "
                                     "(advisory run: it passes)") != std::string::npos);
        CHECK(change.markdown().find("#### Would block the merge (advisory run: it passes)") !=
              std::string::npos);
    }
    SECTION("the base policy's key") {
        Change change(policy("advisory: true\n"), k_grown_source, "grow");
        const auto result = change.check("");
        INFO(result.err);
        CHECK(result.exit_code == 0);
        CHECK(change.json()["verdict"]["outcome"] == "would-block");
    }
}

TEST_CASE("check reports an exemption the change carries and obeys only the base policy",
          "[check][rollout]") {
    SECTION("refused by default: reported everywhere, the change is still blocked") {
        Change change(policy(""), k_grown_source, k_trailer_message);
        const auto result = change.check("");
        INFO(result.err);
        CHECK(result.exit_code == 1);
        const std::string line = "exemption REFUSED by the base policy (change-exemptions: "
                                 "refuse), no effect: trailer in commit " +
                                 change.head.substr(0, 7) +
                                 ": gain (effort-growth): the sensor table is unrolled on "
                                 "purpose; would have covered 1 finding";
        CHECK(result.out.find(line) != std::string::npos);
        const auto json = change.json();
        REQUIRE(json["verdict"]["exemptions"].size() == 1);
        CHECK(json["verdict"]["exemptions"][0]["state"] == "refused");
        CHECK(json["verdict"]["findings"][0]["exemption"]["state"] == "refused");
        const auto sarif = change.sarif();
        const auto& suppression = sarif["runs"][0]["results"][0]["suppressions"][0];
        CHECK(suppression["status"] == "rejected");
        CHECK(suppression["kind"] == "external");
        CHECK(suppression["justification"] == "the sensor table is unrolled on purpose");
        CHECK(sarif["runs"][0]["results"][0]["level"] == "error");
        CHECK(change.markdown().find("exemption REFUSED by the base policy") != std::string::npos);
    }
    SECTION("accepted when the base policy says so: the change passes, the exemption shows") {
        Change change(policy("change-exemptions: accept\n"), k_grown_source, k_trailer_message);
        const auto result = change.check("");
        INFO(result.err);
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("exemption accepted: trailer in commit") != std::string::npos);
        CHECK(change.json()["verdict"]["findings"][0]["exemption"]["state"] == "accepted");
        CHECK(change.sarif()["runs"][0]["results"][0]["suppressions"][0]["status"] == "accepted");
    }
    SECTION("a head policy that accepts exemptions decides nothing") {
        Change change(policy("judge-with: head\n"), k_grown_source, "setup");
        // The change turns exemptions on in its own policy and exempts itself.
        change.dir.write("repo/.tollgate.yaml",
                         policy("judge-with: head\nchange-exemptions: accept\n"));
        change.dir.write("repo/gain.c", std::string(k_grown_source) + "int spare(int a) {\n"
                                                                      "    return a;\n}\n");
        change.dir.write("message.txt", k_trailer_message);
        git("add -A", change.repo);
        git("commit -q -F ../message.txt", change.repo);
        const auto result = run_tollgate("check --no-pch-cache --base " + change.base +
                                             " --head HEAD --report json:-",
                                         change.repo);
        INFO(result.err);
        CHECK(result.exit_code == 1);
        const auto json = nlohmann::json::parse(result.out);
        CHECK(json["verdict"]["exemptions"][0]["state"] == "refused");
    }
    SECTION("a marked comment in the function, accepted") {
        const std::string commented =
            std::string("// tollgate-exemption(effort-growth): clamps the sensor range\n") +
            k_grown_source;
        Change change(policy("change-exemptions: accept\n"), commented, "grow");
        const auto result = change.check("");
        INFO(result.err);
        CHECK(result.exit_code == 0);
        const auto json = change.json();
        REQUIRE(json["verdict"]["exemptions"].size() == 1);
        CHECK(json["verdict"]["exemptions"][0]["source"] == "comment");
        CHECK(json["verdict"]["exemptions"][0]["where"] == "gain.c:1");
        CHECK(change.sarif()["runs"][0]["results"][0]["suppressions"][0]["kind"] == "inSource");
    }
    SECTION("a hostile reason is data: escaped on the terminal and in Markdown") {
        Change change(policy(""), k_grown_source,
                      "grow\n\nTollgate-Exemption: gain (effort-growth): \x1b]0;owned\x07 "
                      "[click](https://evil.example) <img src=x>\n");
        const auto result = change.check("");
        CHECK(result.exit_code == 1);
        CHECK(result.out.find('\x1b') == std::string::npos);
        CHECK(result.out.find("\\x1b]0;owned\\x07") != std::string::npos);
        const std::string markdown = change.markdown();
        CHECK(markdown.find("](https://evil.example)") == std::string::npos);
        CHECK(markdown.find("\\<img src=x\\>") != std::string::npos);
        CHECK(markdown.find(" <img") == std::string::npos);
        // JSON keeps the text as written (its own escaping makes it safe).
        CHECK(change.json()["verdict"]["exemptions"][0]["reason"] ==
              "\x1b]0;owned\x07 [click](https://evil.example) <img src=x>");
    }
}

TEST_CASE("check hints at an uncommitted .tollgate.yaml that differs from the base's",
          "[check][rollout]") {
    Change change(policy(""), k_grown_source, "grow");
    const std::string hint = "tollgate: the working tree's .tollgate.yaml differs from the base's "
                             "and does not judge this change (try it with \"--policy "
                             ".tollgate.yaml\")\n";
    SECTION("no hint while the working tree's policy is the committed one") {
        CHECK(change.check("").err.find("working tree's .tollgate.yaml") == std::string::npos);
    }
    SECTION("an edited, uncommitted policy gets the one-line hint") {
        change.dir.write("repo/.tollgate.yaml", policy("advisory: true\n"));
        const auto result = change.check("");
        CHECK(result.err.find(hint) != std::string::npos);
        CHECK(result.exit_code == 1); // the base's policy still judges
        const auto tried = change.check("--policy .tollgate.yaml");
        CHECK(tried.exit_code == 0);
        CHECK(tried.err.find("working tree's .tollgate.yaml") == std::string::npos);
    }
}

TEST_CASE("a finding names the explain command that compares both sides", "[check][rollout]") {
    Change change(policy(""), k_grown_source, "grow");
    const auto result = change.check("");
    const std::string command = "tollgate explain --change " + change.base.substr(0, 10) + ".." +
                                change.head.substr(0, 10) + " gain.c:gain";
    CHECK(result.out.find("why: " + command) != std::string::npos);
    CHECK(change.markdown().find("why: `" + command + "`") != std::string::npos);

    SECTION("and the command shows the difference per token") {
        const std::string args =
            command.substr(std::string("tollgate ").size()) + " --no-pch-cache";
        const auto explained = run_tollgate(args, change.repo);
        INFO(explained.err);
        REQUIRE(explained.exit_code == 0);
        // Hand count of the two bodies above under c-family/1 (core/README.md): "y" appears 6
        // times in head and never in base, the largest difference; "if" once in head.
        CHECK(explained.out.find("what changed: +6 `y`, ") != std::string::npos);
        CHECK(explained.out.find("base revision " + change.base.substr(0, 7)) != std::string::npos);
        const auto json =
            nlohmann::json::parse(run_tollgate(args + " --format json", change.repo).out);
        CHECK(json["schema"] == "tollgate.explain-change/1");
        bool seen_if = false;
        for (const auto& token : json["tokens"]) {
            if (token["token"] == "if") {
                seen_if = true;
                CHECK(token["base"] == 0);
                CHECK(token["head"] == 1);
                CHECK(token["difference"] == 1);
            }
        }
        CHECK(seen_if);
    }
}
