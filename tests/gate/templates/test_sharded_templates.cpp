// SPDX-License-Identifier: MIT
// The sharded pipeline templates: their matrix is wired the way each platform expects, and their
// own shard and merge commands, run here as separate processes, give what one whole run gives.
#include "../calibrate/calibrate_test_support.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <fmt/format.h>
#include <nlohmann/json.hpp>
#include <regex>
#include <string>

using tollgate::test::commit_all;
using tollgate::test::make_scripted_history;
using tollgate::test::read_text;
using tollgate::test::run_command;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

const std::string k_templates = std::string(TOLLGATE_SOURCE_DIR) + "/ci-templates";

// Load `file` with PyYAML, run `checks` (asserts; `doc` is the document) and write the shard
// and merge scripts that `extract` (Python that sets `shard_script` and `merge_script`) finds
// into `out_dir`/shard.sh and merge.sh.
tollgate::test::RunResult extract_scripts(const std::string& file, const std::string& checks,
                                          const std::string& extract, const std::string& out_dir) {
    TempDir dir;
    dir.write("extract.py", "import sys, yaml\n"
                            "doc = yaml.safe_load(open(sys.argv[1]))\n" +
                                checks + "\n" + extract +
                                "\nopen(sys.argv[2] + '/shard.sh', 'w').write('set -e\\n' + "
                                "shard_script + '\\n')\n"
                                "open(sys.argv[2] + '/merge.sh', 'w').write('set -e\\n' + "
                                "merge_script + '\\n')\n"
                                "print('ok')\n");
    return run_command("python3 " + shell_quote(dir.path() + "/extract.py") + " " +
                           shell_quote(k_templates + "/" + file) + " " + shell_quote(out_dir),
                       dir.path());
}

std::string without_time(const std::string& text) {
    static const std::regex created("\"created\": \"[0-9TZ:-]+\"");
    return std::regex_replace(text, created, "\"created\": \"\"");
}

nlohmann::json measured_part(nlohmann::json doc) {
    doc.erase("seconds");
    doc.erase("threads");
    doc.erase("cache");
    return doc;
}

// Run the extracted scripts: `shards` shard jobs as separate processes (each in its own copy of
// the workspace, with its own cache, as on separate runners; `index_variable` and
// `count_variable` as the platform sets them), then the merge job in a workspace holding only
// the parts. Compare the results with one whole run.
void run_like_the_platform(const std::string& scripts, unsigned shards,
                           const std::string& index_variable, const std::string& count_variable,
                           const std::string& commit_variable) {
    TempDir repo, bin, merge_dir, whole_cache;
    const std::string dir = repo.path() + "/r";
    make_scripted_history(dir);
    repo.write("r/src/c.c", "int k(int a) {\n    return a * 3 - 1;\n}\n");
    const std::string head = commit_all(dir, "add k");
    std::filesystem::create_symlink(tollgate::test::tollgate_binary(), bin.path() + "/tollgate");
    const std::string path = "PATH=" + shell_quote(bin.path()) + ":\"$PATH\" ";

    std::filesystem::create_directories(merge_dir.path() + "/tollgate-parts");
    for (unsigned k = 1; k <= shards; ++k) {
        TempDir workspace;
        REQUIRE(run_command(
                    "cp -a " + shell_quote(dir) + " " + shell_quote(workspace.path() + "/w"), ".")
                    .exit_code == 0);
        const auto shard = run_command(
            path + fmt::format("{}={} {}={} {}={} TOLLGATE_CACHE_DIR={} sh {}", index_variable, k,
                               count_variable, shards, commit_variable, head,
                               shell_quote(workspace.path() + "/cache"),
                               shell_quote(scripts + "/shard.sh")),
            workspace.path() + "/w");
        INFO(shard.err);
        REQUIRE(shard.exit_code == 0);
        // What the platform's artifacts do: every job's tollgate-parts/ in one folder.
        REQUIRE(
            run_command("cp tollgate-parts/* " + shell_quote(merge_dir.path() + "/tollgate-parts/"),
                        workspace.path() + "/w")
                .exit_code == 0);
    }
    const auto merged = run_command(path + "GITHUB_STEP_SUMMARY=summary.md sh " +
                                        shell_quote(scripts + "/merge.sh"),
                                    merge_dir.path());
    INFO(merged.err);
    REQUIRE(merged.exit_code == 0);

    const std::string cache = " TOLLGATE_CACHE_DIR=" + shell_quote(whole_cache.path()) + " ";
    const auto calibrate =
        run_command(path + cache + "tollgate calibrate --format json --range=" + head, dir);
    REQUIRE(calibrate.exit_code == 0);
    const auto whole = nlohmann::json::parse(calibrate.out);
    REQUIRE(whole["commits"].size() == 5);
    CHECK(measured_part(nlohmann::json::parse(read_text(
              merge_dir.path() + "/tollgate-report/calibrate.json"))) == measured_part(whole));
    REQUIRE(run_command(path + cache + "tollgate snapshot --rev=" + head + " --out whole.json", dir)
                .exit_code == 0);
    CHECK(without_time(read_text(merge_dir.path() + "/baselines/snapshot.json")) ==
          without_time(read_text(dir + "/whole.json")));
    CHECK(std::filesystem::exists(merge_dir.path() + "/tollgate-report/calibrate.html"));
}

} // namespace

TEST_CASE("github-actions-sharded.yml shards with a job matrix and merges in a last job",
          "[templates]") {
    TempDir scripts;
    const auto result = extract_scripts(
        "github-actions-sharded.yml",
        "jobs = doc['jobs']\n"
        "shard, merge = jobs['shard'], jobs['merge']\n"
        "assert shard['strategy']['matrix']['shard'] == [1, 2, 3, 4], shard['strategy']\n"
        "assert shard['env']['SHARD_INDEX'] == '${{ matrix.shard }}'\n"
        "assert shard['env']['SHARD_COUNT'] == '${{ strategy.job-total }}'\n"
        "assert merge['needs'] == 'shard'\n"
        "checkout = [s for s in shard['steps'] if s.get('uses', "
        "'').startswith('actions/checkout')]\n"
        "assert checkout[0]['with']['fetch-depth'] == 0\n"
        "caches = [s for s in shard['steps'] if s.get('uses', '').startswith('actions/cache')]\n"
        "assert caches[0]['with']['path'] == '.tollgate-cache/', caches\n"
        "assert '${{ matrix.shard }}' in caches[0]['with']['key']\n"
        "up = [s for s in shard['steps'] if s.get('uses', "
        "'').startswith('actions/upload-artifact')]\n"
        "down = [s for s in merge['steps'] if s.get('uses', '').startswith("
        "'actions/download-artifact')]\n"
        "assert down[0]['with']['merge-multiple'] is True and down[0]['with']['path'] == "
        "up[0]['with']['path'] == 'tollgate-parts/'\n"
        "assert all('${{' not in s.get('run', '') for j in jobs.values() for s in j['steps'])\n",
        "shard_script = [s['run'] for s in shard['steps'] if '--shard' in s.get('run', '')][0]\n"
        "merge_script = [s['run'] for s in merge['steps'] if '--merge' in s.get('run', '')][0]\n",
        scripts.path());
    INFO(result.err);
    REQUIRE(result.out == "ok\n");
    run_like_the_platform(scripts.path(), 4, "SHARD_INDEX", "SHARD_COUNT", "COMMIT_SHA");
}

TEST_CASE("gitlab-ci-sharded.yml shards with parallel: and merges in a last job", "[templates]") {
    TempDir scripts;
    const auto result = extract_scripts(
        "gitlab-ci-sharded.yml",
        "shard, merge = doc['tollgate-shard'], doc['tollgate-merge']\n"
        "assert shard['parallel'] == 4 and shard['stage'] == 'measure'\n"
        "assert merge['needs'] == ['tollgate-shard'] and merge['stage'] == 'merge'\n"
        "assert doc['variables']['GIT_DEPTH'] == '0'\n"
        "assert shard['artifacts']['paths'] == ['tollgate-parts/']\n"
        "assert shard['cache']['paths'] == ['.tollgate-cache/']\n"
        "assert '$CI_NODE_INDEX' in shard['cache']['key']\n",
        "shard_script = '\\n'.join(shard['script'])\n"
        "merge_script = '\\n'.join(merge['script'])\n",
        scripts.path());
    INFO(result.err);
    REQUIRE(result.out == "ok\n");
    run_like_the_platform(scripts.path(), 4, "CI_NODE_INDEX", "CI_NODE_TOTAL", "CI_COMMIT_SHA");
}
