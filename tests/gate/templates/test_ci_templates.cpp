// SPDX-License-Identifier: MIT
// The pipeline templates of ci-templates/: each parses and wires the gate the way its platform
// expects, and the generic shell script gates a real repository with the real binary.
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

using tollgate::test::commit_all;
using tollgate::test::git;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_command;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

const std::string k_templates = std::string(TOLLGATE_SOURCE_DIR) + "/ci-templates";

// Run a python3 program that loads `file` with PyYAML as `doc` and then runs `checks` (asserts).
tollgate::test::RunResult check_yaml(const std::string& file, const std::string& checks) {
    TempDir dir;
    dir.write("check.py", "import sys, yaml\n"
                          "doc = yaml.safe_load(open(sys.argv[1]))\n"
                          "def steps_text(steps):\n"
                          "    return '\\n'.join(str(s) for s in steps)\n" +
                              checks + "\nprint('ok')\n");
    return run_command("python3 " + shell_quote(dir.path() + "/check.py") + " " +
                           shell_quote(k_templates + "/" + file),
                       dir.path());
}

// Return the first bracket mismatch of a Groovy text ("" when balanced), skipping comments and
// the four string forms a Jenkinsfile uses ('...', "...", '''...''', """...""").
std::string bracket_mismatch(const std::string& text) {
    std::vector<char> open;
    for (std::size_t i = 0; i < text.size(); ++i) {
        const char c = text[i];
        if (text.compare(i, 2, "//") == 0) {
            i = text.find('\n', i);
            if (i == std::string::npos) {
                break;
            }
            continue;
        }
        if (text.compare(i, 3, "'''") == 0 || text.compare(i, 3, "\"\"\"") == 0) {
            const std::size_t end = text.find(text.substr(i, 3), i + 3);
            if (end == std::string::npos) {
                return "unterminated triple-quoted string";
            }
            i = end + 2;
            continue;
        }
        if (c == '\'' || c == '"') {
            std::size_t end = i + 1;
            while (end < text.size() && text[end] != c && text[end] != '\n') {
                end += text[end] == '\\' ? 2 : 1;
            }
            if (end >= text.size() || text[end] != c) {
                return "unterminated string at offset " + std::to_string(i);
            }
            i = end;
            continue;
        }
        if (c == '{' || c == '(' || c == '[') {
            open.push_back(c);
        } else if (c == '}' || c == ')' || c == ']') {
            const char expected = c == '}' ? '{' : c == ')' ? '(' : '[';
            if (open.empty() || open.back() != expected) {
                return std::string("unmatched '") + c + "' at offset " + std::to_string(i);
            }
            open.pop_back();
        }
    }
    return open.empty() ? std::string() : std::string("unclosed '") + open.back() + "'";
}

} // namespace

TEST_CASE("github-actions.yml parses and wires the gate", "[templates]") {
    // PyYAML reads the bare key `on` as the boolean true (YAML 1.1), hence doc.get(True).
    const auto result = check_yaml(
        "github-actions.yml",
        "triggers = doc.get('on', doc.get(True))\n"
        "assert 'pull_request' in triggers, triggers\n"
        "assert doc['permissions']['security-events'] == 'write'\n"
        "steps = doc['jobs']['gate']['steps']\n"
        "checkout = [s for s in steps if s.get('uses', '').startswith('actions/checkout')]\n"
        "assert checkout and checkout[0]['with']['fetch-depth'] == 0, checkout\n"
        "gate = [s for s in steps if 'tollgate check' in s.get('run', '')]\n"
        "assert len(gate) == 1, gate\n"
        "run = gate[0]['run']\n"
        "env = gate[0]['env']\n"
        "assert env['BASE_SHA'] == '${{ github.event.pull_request.base.sha }}', env\n"
        "assert env['HEAD_SHA'] == '${{ github.event.pull_request.head.sha }}', env\n"
        "assert '--base=\"$BASE_SHA\"' in run and '--head=\"$HEAD_SHA\"' in run\n"
        "# No event value is pasted into a script: each comes through the environment.\n"
        "assert all('${{' not in s.get('run', '') for s in steps), steps_text(steps)\n"
        "assert 'GITHUB_STEP_SUMMARY' in run and 'markdown:' in run and 'sarif:' in run\n"
        "sarif = [s for s in steps if s.get('uses', '').startswith("
        "'github/codeql-action/upload-sarif')]\n"
        "assert sarif and sarif[0]['with']['sarif_file'].endswith('.sarif')\n"
        "caches = [s for s in steps if s.get('uses', '').startswith('actions/cache')]\n"
        "assert all(c['with']['path'] == 'baselines/' for c in caches) and len(caches) == 2\n"
        "assert any('tollgate snapshot' in s.get('run', '') for s in steps)\n"
        "assert doc['permissions']['pull-requests'] == 'write'\n"
        "note = [s for s in steps if 'tollgate annotate' in s.get('run', '')]\n"
        "assert len(note) == 1 and 'always()' in note[0]['if'], note\n"
        "assert note[0]['env']['TOLLGATE_ANNOTATE_TOKEN'] == '${{ secrets.GITHUB_TOKEN }}'\n");
    INFO(result.err);
    CHECK(result.exit_code == 0);
    CHECK(result.out == "ok\n");
}

TEST_CASE("gitlab-ci.yml parses and wires the gate", "[templates]") {
    const auto result = check_yaml(
        "gitlab-ci.yml",
        "assert doc['variables']['GIT_DEPTH'] == '0'\n"
        "job = doc['tollgate-gate']\n"
        "script = '\\n'.join(job['script'])\n"
        "assert 'tollgate check' in script\n"
        "assert '$CI_MERGE_REQUEST_DIFF_BASE_SHA' in script and '$CI_COMMIT_SHA' in script\n"
        "assert 'tollgate annotate --token-env TOLLGATE_NOTE_TOKEN' in script, script\n"
        "assert 'curl' not in script and 'PRIVATE-TOKEN' not in script, script\n"
        "assert job['artifacts']['when'] == 'always'\n"
        "paths = job['artifacts']['paths']\n"
        "assert any(p.endswith('.md') for p in paths) and any(p.endswith('.sarif') for p in "
        "paths)\n"
        "assert job['cache']['paths'] == ['baselines/']\n"
        "snap = doc['tollgate-snapshot']\n"
        "assert snap['cache']['paths'] == ['baselines/'] and snap['cache']['policy'] == 'push'\n"
        "assert 'tollgate snapshot' in '\\n'.join(snap['script'])\n"
        "base = doc['.tollgate-install']\n"
        "assert any('.deb' in line for line in base['before_script'])\n");
    INFO(result.err);
    CHECK(result.exit_code == 0);
    CHECK(result.out == "ok\n");
}

TEST_CASE("Jenkinsfile is a balanced declarative pipeline that gates change requests",
          "[templates]") {
    const std::string text = read_text(k_templates + "/Jenkinsfile");
    REQUIRE_FALSE(text.empty());
    CHECK(bracket_mismatch(text).empty());
    CHECK(text.find("pipeline {") != std::string::npos);
    CHECK(text.find("stages {") != std::string::npos);
    CHECK(text.find("when { changeRequest() }") != std::string::npos);
    CHECK(text.find("tollgate check") != std::string::npos);
    CHECK(text.find("CHANGE_TARGET") != std::string::npos);
    CHECK(text.find("git fetch --unshallow") != std::string::npos);
    CHECK(text.find("archiveArtifacts") != std::string::npos);
    CHECK(text.find("tollgate snapshot") != std::string::npos);
    CHECK(text.find("variable: 'TOLLGATE_ANNOTATE_TOKEN'") != std::string::npos);
    CHECK(text.find("tollgate annotate --from tollgate-report/tollgate.json") != std::string::npos);

    SECTION("the structural check itself catches a missing brace") {
        CHECK(bracket_mismatch("pipeline { stages { stage('x') { steps { sh 'a' } }") ==
              "unclosed '{'");
        CHECK(bracket_mismatch("sh '''${X:-}''' }") == "unmatched '}' at offset 16");
    }
}

TEST_CASE("the shell templates pass bash -n and shellcheck", "[templates]") {
    for (const char* file : {"tollgate-gate.sh", "pre-push"}) {
        const std::string path = shell_quote(k_templates + "/" + file);
        const auto syntax = run_command("bash -n " + path, k_templates);
        INFO(file << ": " << syntax.err);
        CHECK(syntax.exit_code == 0);
        CHECK(std::filesystem::status(k_templates + "/" + file).permissions() ==
              (std::filesystem::status(k_templates + "/" + file).permissions() |
               std::filesystem::perms::owner_exec));
        if (run_command("command -v shellcheck", k_templates).exit_code == 0) {
            const auto lint = run_command("shellcheck " + path, k_templates);
            INFO(lint.out);
            CHECK(lint.exit_code == 0);
        } else {
            WARN("shellcheck is not installed: only bash -n checked " << file);
        }
    }
}

TEST_CASE("tollgate-gate.sh gates a real repository", "[templates]") {
    TempDir dir;
    const std::string repo = dir.path() + "/repo";
    init_repo(repo);
    dir.write("repo/.tollgate.yaml", "tollgate-policy: 1\n"
                                     "noise-floor: {volume: 1}\n"
                                     "rules:\n"
                                     "  - {id: effort-growth, kind: growth, measure: effort,\n"
                                     "     max-increase-percent: 10, level: blocking}\n");
    dir.write("repo/gain.c", "int gain(int x, int k) {\n    return x * k;\n}\n");
    const std::string base = commit_all(repo, "base");
    const std::string script = shell_quote(k_templates + "/tollgate-gate.sh");
    const std::string env = "TOLLGATE=" + shell_quote(TOLLGATE_BINARY) + " TOLLGATE_FETCH=no ";

    SECTION("a change that keeps the measures passes with exit 0 and writes the reports") {
        // A renamed parameter: the same counts, so every measure stays.
        dir.write("repo/gain.c", "int gain(int v, int k) {\n    return v * k;\n}\n");
        commit_all(repo, "rename");
        const auto result =
            run_command(env + "bash " + script + " --base " + base + " --out ../out", repo);
        INFO(result.err);
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("verdict: pass") != std::string::npos);
        const std::string markdown = read_text(dir.path() + "/out/tollgate.md");
        CHECK(markdown.find("gain") != std::string::npos);
        const auto sarif = nlohmann::json::parse(read_text(dir.path() + "/out/tollgate.sarif"));
        CHECK(sarif["version"] == "2.1.0");
        CHECK(sarif["runs"][0]["results"].empty());
    }
    SECTION("a change the policy blocks exits 1 with the finding in every report") {
        dir.write("repo/gain.c", "int gain(int x, int k) {\n"
                                 "    int y = x * k + 3;\n"
                                 "    if (y > 100 || y < -100) {\n"
                                 "        y = y > 0 ? 100 : -100;\n"
                                 "    }\n"
                                 "    return y - x % 5;\n"
                                 "}\n");
        commit_all(repo, "grow");
        // Base from the environment, as a CI job sets it.
        const auto result = run_command(env + "TOLLGATE_BASE=" + base + " TOLLGATE_OUT=" +
                                            shell_quote(dir.path() + "/out") + " bash " + script,
                                        repo);
        INFO(result.err);
        CHECK(result.exit_code == 1);
        CHECK(result.err.find("the policy blocks the change") != std::string::npos);
        CHECK(read_text(dir.path() + "/out/tollgate.md").find("effort-growth") !=
              std::string::npos);
        const auto sarif = nlohmann::json::parse(read_text(dir.path() + "/out/tollgate.sarif"));
        REQUIRE(sarif["runs"][0]["results"].size() == 1);
        CHECK(sarif["runs"][0]["results"][0]["ruleId"] == "effort-growth");
    }
    SECTION("a restored baselines/snapshot.json is passed with --baseline") {
        dir.write("repo/gain.c", "int gain(int v, int k) {\n    return v * k;\n}\n");
        const std::string head = commit_all(repo, "rename");
        // As a job restores the default branch's snapshot from its cache: untracked, and of
        // another commit than the change's base.
        const auto snapshot =
            run_command(shell_quote(TOLLGATE_BINARY) + " snapshot --no-pch-cache --rev " + head +
                            " --out baselines/snapshot.json",
                        repo);
        REQUIRE(snapshot.exit_code == 0);
        const auto result =
            run_command(env + "bash " + script + " --base " + base + " --out ../out", repo);
        INFO(result.err);
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("note: the baseline snapshot baselines/snapshot.json is of commit " +
                              head.substr(0, 7) + ", not the base " + base.substr(0, 7)) !=
              std::string::npos);
    }
    SECTION("--advisory and TOLLGATE_ADVISORY=yes report what would block and pass") {
        dir.write("repo/gain.c", "int gain(int x, int k) {\n"
                                 "    int y = x * k + 3;\n"
                                 "    if (y > 100 || y < -100) {\n"
                                 "        y = y > 0 ? 100 : -100;\n"
                                 "    }\n"
                                 "    return y - x % 5;\n"
                                 "}\n");
        commit_all(repo, "grow");
        for (const std::string& way : {"TOLLGATE_ADVISORY=yes bash " + script + " --base " + base,
                                       "bash " + script + " --advisory --base " + base}) {
            const auto result = run_command(env + way + " --out ../out", repo);
            INFO(way << "\n" << result.err);
            CHECK(result.exit_code == 0);
            CHECK(read_text(dir.path() + "/out/tollgate.md")
                      .find("#### Would block the merge (advisory run: it passes)") !=
                  std::string::npos);
            const auto json = nlohmann::json::parse(read_text(dir.path() + "/out/tollgate.json"));
            CHECK(json["verdict"]["outcome"] == "would-block");
        }
    }
    SECTION("an unknown option is a usage error") {
        const auto result = run_command(env + "bash " + script + " --bogus", repo);
        CHECK(result.exit_code == 2);
        CHECK(result.err == "tollgate-gate: error: unknown option \"--bogus\" (see --help)\n");
    }
}

TEST_CASE("tollgate-gate.sh never lets a revision act as a git option", "[templates]") {
    // git fetch reads "--upload-pack=COMMAND" as the program to run on the remote side (git-fetch
    // manual, OPTIONS); with a local remote it runs on this machine. A base value is outside
    // input (a CI variable, a pull request's branch name).
    TempDir dir;
    const std::string upstream = dir.path() + "/upstream";
    const std::string repo = dir.path() + "/repo";
    init_repo(upstream);
    dir.write("upstream/gain.c", "int gain(int x, int k) {\n    return x * k;\n}\n");
    commit_all(upstream, "base");
    git("clone -q " + shell_quote(upstream) + " " + shell_quote(repo), dir.path());
    const std::string marker = dir.path() + "/ran";
    const std::string script = shell_quote(k_templates + "/tollgate-gate.sh");
    const std::string env = "TOLLGATE=" + shell_quote(TOLLGATE_BINARY) +
                            " TOLLGATE_OUT=" + shell_quote(dir.path() + "/out") + " ";

    SECTION("a base beginning with \"-\" is refused before git sees it") {
        const std::string hostile = "--upload-pack=touch " + marker;
        for (const std::string& way : {"TOLLGATE_BASE=" + shell_quote(hostile) + " bash " + script,
                                       "bash " + script + " --base " + shell_quote(hostile)}) {
            const auto result = run_command(env + way, repo);
            INFO(way << "\n" << result.err);
            CHECK(result.exit_code == 2);
            CHECK(result.err.find("begins with \"-\"") != std::string::npos);
            CHECK_FALSE(std::filesystem::exists(marker));
        }
    }
    SECTION("a head beginning with \"-\" is refused too") {
        const auto result = run_command(
            env + "TOLLGATE_HEAD=" + shell_quote("--output=" + marker) + " bash " + script, repo);
        CHECK(result.exit_code == 2);
        CHECK_FALSE(std::filesystem::exists(marker));
    }
}

TEST_CASE("the templates end git's options before a value from outside", "[templates]") {
    // Every git call of a template that names a revision, ref or URL taken from a variable must
    // end its options first ("--end-of-options" or "--"), or take a value that cannot begin with
    // "-" (a refspec starting with "+").
    for (const char* file :
         {"tollgate-gate.sh", "pre-push", "github-actions.yml", "gitlab-ci.yml", "Jenkinsfile"}) {
        const std::string text = read_text(k_templates + "/" + file);
        std::size_t from = 0;
        while ((from = text.find("git ", from)) != std::string::npos) {
            const std::size_t end = text.find('\n', from);
            const std::string line = text.substr(from, end - from);
            from = end;
            const bool takes_variable = line.find('$') != std::string::npos;
            const bool fetch_or_clone = line.rfind("git fetch", 0) == 0 ||
                                        line.rfind("git clone", 0) == 0 ||
                                        line.rfind("git cat-file", 0) == 0;
            if (!takes_variable || !fetch_or_clone) {
                continue;
            }
            INFO(file << ": " << line);
            CHECK((line.find("--end-of-options") != std::string::npos ||
                   line.find(" -- ") != std::string::npos));
        }
    }
}
