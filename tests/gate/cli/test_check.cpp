// SPDX-License-Identifier: MIT
// `tollgate check` end to end: scripted git histories in temp folders, the real binary, and the
// exact touched set, labels and deltas it reports.
#include "support/temp_repo.hpp"
#include "tollgate/core/measures.hpp"

#include <catch2/catch.hpp>
#include <cmath>
#include <fstream>
#include <nlohmann/json.hpp>

using tollgate::test::commit_all;
using tollgate::test::git;
using tollgate::test::init_repo;
using tollgate::test::run_tollgate;
using tollgate::test::TempDir;

namespace {

// Run check and return its JSON report (failing the test when the command fails).
nlohmann::json check_json(const std::string& dir, const std::string& args) {
    const auto result = run_tollgate("check " + args + " --report json:- --no-pch-cache", dir);
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
    return nlohmann::json::parse(result.out);
}

// Return "label name" for every reported function, sorted, for exact set comparisons.
std::vector<std::string> touched_set(const nlohmann::json& report) {
    std::vector<std::string> set;
    for (const auto& f : report["functions"]) {
        set.push_back(f["label"].get<std::string>() + " " + f["function"].get<std::string>());
    }
    std::sort(set.begin(), set.end());
    return set;
}

const nlohmann::json& find_function(const nlohmann::json& report, const std::string& name) {
    for (const auto& f : report["functions"]) {
        if (f["function"] == name) {
            return f;
        }
    }
    FAIL("no function " << name << " in report");
    throw std::logic_error("unreachable");
}

double measure_of(const nlohmann::json& side, const char* name) {
    return side["measures"][name].get<double>();
}

} // namespace

TEST_CASE("check reports the exact deltas of a hand-counted change", "[check]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("calc.c", "int twice(int x) { return x * 2; }\n\nint keep(int y) { return y; }\n");
    const std::string base = commit_all(dir.path(), "base");
    dir.write("calc.c",
              "int twice(int x) { return x * 2 + 1; }\n\nint keep(int y) { return y; }\n");
    const std::string head = commit_all(dir.path(), "head");

    const auto report = check_json(dir.path(), "--base " + base + " --head " + head);
    REQUIRE(touched_set(report) == std::vector<std::string>{"changed twice"});
    const auto& twice = find_function(report, "twice");
    // Counted by hand under convention c-family/1 (core/README.md):
    // base `int twice(int x) { return x * 2; }`: operators int(2) twice () {} return * ;
    //   n1 = 7, N1 = 8; operands x(2) 2: n2 = 2, N2 = 3.
    // head adds `+ 1`: n1 = 8, N1 = 9, n2 = 3, N2 = 4.
    CHECK(measure_of(twice["base"], "n1") == 7);
    CHECK(measure_of(twice["base"], "N1") == 8);
    CHECK(measure_of(twice["base"], "n2") == 2);
    CHECK(measure_of(twice["base"], "N2") == 3);
    CHECK(measure_of(twice["head"], "n1") == 8);
    CHECK(measure_of(twice["head"], "N1") == 9);
    CHECK(measure_of(twice["head"], "n2") == 3);
    CHECK(measure_of(twice["head"], "N2") == 4);
    // Halstead 1977: V = N log2 n, D = (n1/2)(N2/n2), E = D V.
    const double base_v = 11 * std::log2(9.0), head_v = 13 * std::log2(11.0);
    const double base_e = (7 / 2.0) * (3 / 2.0) * base_v, head_e = (8 / 2.0) * (4 / 3.0) * head_v;
    CHECK(twice["delta"]["volume"]["absolute"].get<double>() == Approx(head_v - base_v));
    CHECK(twice["delta"]["effort"]["absolute"].get<double>() == Approx(head_e - base_e));
    CHECK(twice["delta"]["effort"]["percent"].get<double>() ==
          Approx(100.0 * (head_e - base_e) / base_e));
    CHECK(twice["head"]["line"] == 1);
}

TEST_CASE("check labels added, deleted, renamed and modified files' functions", "[check]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("src/keep.cpp", "int stay(int a) {\n    return a + 1;\n}\n\nint grow(int a) {\n"
                              "    return a;\n}\n");
    dir.write("src/gone.c", "int vanish(void) {\n    return 0;\n}\n");
    dir.write("src/old_name.cpp",
              "int travel(int t) {\n    return t * 3;\n}\n\nint rest(int r) {\n    int q = r;\n"
              "    q = q + r;\n    q = q * r;\n    return q;\n}\n");
    dir.write("README.txt", "notes\n");
    const std::string base = commit_all(dir.path(), "base");

    dir.write("src/keep.cpp", "int stay(int a) {\n    return a + 1;\n}\n\nint grow(int a) {\n"
                              "    if (a > 0) {\n        return a * a;\n    }\n    return a;\n}\n");
    git("rm -q src/gone.c", dir.path());
    git("mv src/old_name.cpp src/new_name.cpp", dir.path());
    dir.write("src/new_name.cpp",
              "int travel(int t) {\n    return t * 4;\n}\n\nint rest(int r) {\n    int q = r;\n"
              "    q = q + r;\n    q = q * r;\n    return q;\n}\n");
    dir.write("src/fresh.c", "int born(int b) {\n    return b - 1;\n}\n");
    dir.write("README.txt", "more notes\n");
    const std::string head = commit_all(dir.path(), "head");

    const auto report = check_json(dir.path(), "--base " + base + " --head " + head);
    CHECK(touched_set(report) == std::vector<std::string>{"added born", "changed grow",
                                                          "changed travel", "removed vanish"});
    const auto& travel = find_function(report, "travel");
    CHECK(travel["base"]["file"] == "src/old_name.cpp");
    CHECK(travel["head"]["file"] == "src/new_name.cpp");
    CHECK(find_function(report, "born")["base"].is_null());
    CHECK(find_function(report, "vanish")["head"].is_null());
    CHECK(find_function(report, "vanish")["delta"]["effort"]["absolute"].get<double>() < 0);
    REQUIRE(report["skipped"].size() == 1);
    CHECK(report["skipped"][0]["file"] == "README.txt");
    // Largest effort growth first.
    CHECK(report["functions"][0]["function"] == "grow");
}

TEST_CASE("check follows functions moved within and across files", "[check]") {
    TempDir dir;
    init_repo(dir.path());
    const std::string alpha = "int alpha(int a) {\n    return a + 1;\n}\n";
    const std::string beta = "int beta(int b) {\n    return b * 2;\n}\n";
    const std::string gamma = "int gamma_fn(int c) {\n    return c - 3;\n}\n";
    dir.write("one.c", alpha + "\n" + beta + "\n" + gamma);
    dir.write("two.c", "int other(void) {\n    return 7;\n}\n");
    const std::string base = commit_all(dir.path(), "base");
    // alpha moves below gamma_fn within one.c; beta moves to two.c.
    dir.write("one.c", gamma + "\n" + alpha);
    dir.write("two.c", "int other(void) {\n    return 7;\n}\n\n" + beta);
    const std::string head = commit_all(dir.path(), "head");

    const auto report = check_json(dir.path(), "--base " + base + " --head " + head);
    const auto set = touched_set(report);
    CHECK(std::count(set.begin(), set.end(), "moved beta") == 1);
    const auto& beta_row = find_function(report, "beta");
    CHECK(beta_row["base"]["file"] == "one.c");
    CHECK(beta_row["head"]["file"] == "two.c");
    CHECK(beta_row["delta"]["effort"]["absolute"].get<double>() == 0.0);
    // git's diff may present either alpha or gamma_fn as the moved block; whichever it is, it is
    // labelled moved with zero deltas and nothing is added or removed.
    for (const auto& f : report["functions"]) {
        CHECK(f["label"] != "added");
        CHECK(f["label"] != "removed");
        CHECK(f["delta"]["effort"]["absolute"].get<double>() == 0.0);
    }
}

TEST_CASE("check keeps overloads apart", "[check]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("scale.cpp", "int scale(int v) {\n    return v * 2;\n}\n\n"
                           "double scale(double v) {\n    return v * 2.0;\n}\n");
    const std::string base = commit_all(dir.path(), "base");
    dir.write("scale.cpp", "int scale(int v) {\n    return v * 2;\n}\n\n"
                           "double scale(double v) {\n    return v * 2.0 + 0.5;\n}\n");
    const std::string head = commit_all(dir.path(), "head");
    const auto report = check_json(dir.path(), "--base " + base + " --head " + head);
    REQUIRE(report["functions"].size() == 1);
    CHECK(report["functions"][0]["signature"] == "double");
    CHECK(report["functions"][0]["label"] == "changed");
}

TEST_CASE("check shows zero deltas for a comment-only edit", "[check]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("note.c", "int answer(void) {\n    return 42;\n}\n");
    const std::string base = commit_all(dir.path(), "base");
    dir.write("note.c", "int answer(void) {\n    /* the reply */\n    return 42;\n}\n");
    const std::string head = commit_all(dir.path(), "head");
    const auto report = check_json(dir.path(), "--base " + base + " --head " + head);
    REQUIRE(report["functions"].size() == 1);
    CHECK(report["functions"][0]["label"] == "unchanged");
    for (const auto& [name, d] : report["functions"][0]["delta"].items()) {
        INFO(name);
        CHECK(d["absolute"].get<double>() == 0.0);
    }
}

TEST_CASE("check measures an inline function in a changed header and its out-of-line members",
          "[check]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("include/gauge.hpp", "#pragma once\nclass Gauge {\npublic:\n    int read() const;\n"
                                   "    int twice() const { return read() * 2; }\n"
                                   "private:\n    int m_value = 0;\n};\n");
    dir.write("src/gauge.cpp", "#include \"gauge.hpp\"\n\nint Gauge::read() const {\n"
                               "    return m_value;\n}\n");
    const std::string base = commit_all(dir.path(), "base");
    dir.write("include/gauge.hpp", "#pragma once\nclass Gauge {\npublic:\n    int read() const;\n"
                                   "    int twice() const { return read() * 2 + m_value; }\n"
                                   "private:\n    int m_value = 0;\n};\n");
    dir.write("src/gauge.cpp", "#include \"gauge.hpp\"\n\nint Gauge::read() const {\n"
                               "    return m_value + 1;\n}\n");
    const std::string head = commit_all(dir.path(), "head");
    const auto report = check_json(dir.path(), "--base " + base + " --head " + head);
    CHECK(touched_set(report) ==
          std::vector<std::string>{"changed Gauge::read", "changed Gauge::twice"});
    // m_value resolves through the header, so it is an operand (a field), not an unknown call.
    const auto& read = find_function(report, "Gauge::read");
    CHECK(read["head"]["extent"] == "syntax-tree");
}

TEST_CASE("check does not touch functions that use a changed macro", "[check]") {
    // Tokens count the macro's name, not its expansion (core/README.md rule 12), so a change to
    // the macro's definition line touches no function.
    TempDir dir;
    init_repo(dir.path());
    dir.write("limit.c",
              "#define LIMIT 10\n\nint clamp(int v) {\n    return v > LIMIT ? LIMIT : v;\n"
              "}\n");
    const std::string base = commit_all(dir.path(), "base");
    dir.write("limit.c",
              "#define LIMIT 20\n\nint clamp(int v) {\n    return v > LIMIT ? LIMIT : v;\n"
              "}\n");
    const std::string head = commit_all(dir.path(), "head");
    const auto report = check_json(dir.path(), "--base " + base + " --head " + head);
    CHECK(report["functions"].empty());
    CHECK(report["measured_files"] == 1);
}

TEST_CASE("check on a change without C, C++ or Java files writes one line and passes", "[check]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("main.c", "int main(void) {\n    return 0;\n}\n");
    dir.write("docs.md", "# docs\n");
    const std::string base = commit_all(dir.path(), "base");
    dir.write("docs.md", "# more docs\n");
    const std::string head = commit_all(dir.path(), "head");
    const auto result =
        run_tollgate("check --no-pch-cache --base " + base + " --head " + head, dir.path());
    CHECK(result.exit_code == 0);
    CHECK(result.out.find("no C, C++ or Java file changed: nothing to measure") !=
          std::string::npos);
    CHECK(result.out.find("label") == std::string::npos);
}

TEST_CASE("check reports usage errors with exit code 2", "[check]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("main.c", "int main(void) {\n    return 0;\n}\n");
    commit_all(dir.path(), "base");
    git("branch feature-login", dir.path());
    SECTION("an unknown revision suggests a branch") {
        const auto result = run_tollgate("check --base feature-logni", dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err.find("did you mean \"feature-login\"?") != std::string::npos);
    }
    SECTION("an unknown report format suggests one") {
        const auto result = run_tollgate("check --report markdwn:out.md", dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err == "tollgate: error: unknown report format \"markdwn\" in "
                            "\"markdwn:out.md\" (did you mean \"markdown\"?)\n");
    }
    SECTION("outside a repository") {
        TempDir plain;
        const auto result = run_tollgate("check", plain.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err.find("not a git repository") != std::string::npos);
    }
}

TEST_CASE("check writes a Markdown table that a GFM renderer renders as a table", "[check]") {
    // Reference renderer outside the project: Debian's cmark-gfm with the table extension.
    TempDir dir;
    init_repo(dir.path());
    std::string base_text, head_text;
    for (int i = 0; i < 14; ++i) {
        base_text += "int f" + std::to_string(i) + "(int v) {\n    return v + " +
                     std::to_string(i) + ";\n}\n\n";
        head_text += "int f" + std::to_string(i) + "(int v) {\n    return v * v + " +
                     std::to_string(i) + ";\n}\n\n";
    }
    // An operator| puts a pipe into a function name: it must stay inside its cell.
    const std::string flags = "struct Flags {\n    int bits;\n};\n\n";
    base_text = flags + base_text +
                "Flags operator|(Flags a, Flags b) {\n    return Flags{a.bits | b.bits};\n}\n";
    head_text = flags + head_text +
                "Flags operator|(Flags a, Flags b) {\n    return Flags{(a.bits | b.bits) & 0xff};\n"
                "}\n";
    dir.write("many.cpp", base_text);
    const std::string base = commit_all(dir.path(), "base");
    dir.write("many.cpp", head_text);
    const std::string head = commit_all(dir.path(), "head");
    const auto result = run_tollgate("check --no-pch-cache --base " + base + " --head " + head +
                                         " --report markdown:delta.md --link-template "
                                         "'https://git.example/r/blob/{commit}/{path}#L{line}'",
                                     dir.path());
    REQUIRE(result.exit_code == 0);
    const std::string markdown = tollgate::test::read_text(dir.path() + "/delta.md");
    CHECK(markdown.rfind("### \xE2\x9C\x93 Tollgate passes this change\n\n", 0) == 0);
    CHECK(markdown.find("15 functions touched in 1 file") != std::string::npos);
    CHECK(markdown.find("<details><summary>5 more functions</summary>") != std::string::npos);
    CHECK(markdown.find("(https://git.example/r/blob/" + head + "/many.cpp#L") !=
          std::string::npos);

    const auto rendered =
        tollgate::test::run_command("cmark-gfm --extension table delta.md", dir.path());
    if (rendered.exit_code == 127) {
        WARN("cmark-gfm is not installed; skipping the rendering check");
        return;
    }
    REQUIRE(rendered.exit_code == 0);
    // Two tables (shown and folded), each with a header and its rows as real table cells.
    std::size_t tables = 0;
    for (auto pos = rendered.out.find("<table>"); pos != std::string::npos;
         pos = rendered.out.find("<table>", pos + 1)) {
        ++tables;
    }
    CHECK(tables == 2);
    std::size_t rows = 0;
    for (auto pos = rendered.out.find("<tr>"); pos != std::string::npos;
         pos = rendered.out.find("<tr>", pos + 1)) {
        ++rows;
    }
    CHECK(rows == 15 + 2); // 15 functions plus two header rows
    CHECK(rendered.out.find("<td align=\"right\">") != std::string::npos);
    CHECK(rendered.out.find("<td><code>operator|</code></td>") != std::string::npos);
}

TEST_CASE("check --worktree compares staged and unstaged edits with HEAD", "[check]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("a.c", "int first(int v) {\n    return v;\n}\n");
    dir.write("b.c", "int second(int v) {\n    return v;\n}\n");
    commit_all(dir.path(), "base");
    dir.write("a.c", "int first(int v) {\n    return v + 1;\n}\n");
    git("add a.c", dir.path());                                      // staged
    dir.write("b.c", "int second(int v) {\n    return v - 1;\n}\n"); // unstaged
    dir.write("c.c", "int third(int v) {\n    return v * 3;\n}\n");  // untracked
    const auto report = check_json(dir.path(), "--worktree");
    CHECK(touched_set(report) ==
          std::vector<std::string>{"added third", "changed first", "changed second"});
    CHECK(report["head"]["commit"].is_null());
    CHECK(report["head"]["label"] == "working tree");
}

TEST_CASE("check gives the same report on one thread and on all cores", "[check]") {
    TempDir dir;
    init_repo(dir.path());
    for (int i = 0; i < 6; ++i) {
        dir.write("f" + std::to_string(i) + ".cpp", "int work" + std::to_string(i) +
                                                        "(int v) {\n    return v + " +
                                                        std::to_string(i) + ";\n}\n");
    }
    const std::string base = commit_all(dir.path(), "base");
    for (int i = 0; i < 6; ++i) {
        dir.write("f" + std::to_string(i) + ".cpp", "int work" + std::to_string(i) +
                                                        "(int v) {\n    return v * v - " +
                                                        std::to_string(i) + ";\n}\n");
    }
    const std::string head = commit_all(dir.path(), "head");
    const std::string range = "--base " + base + " --head " + head + " --report json:-";
    const auto one = run_tollgate("check -j 1 --no-pch-cache " + range, dir.path());
    const auto many = run_tollgate("check -j 4 --no-pch-cache " + range, dir.path());
    REQUIRE(one.exit_code == 0);
    REQUIRE(many.exit_code == 0);
    CHECK(nlohmann::json::parse(one.out)["functions"].size() == 6);
    CHECK(one.out == many.out);
}

TEST_CASE("check in a shallow clone compares present commits directly or names the remedy",
          "[check]") {
    TempDir dir;
    const std::string origin = dir.path() + "/origin";
    init_repo(origin);
    for (int i = 0; i < 4; ++i) {
        const std::string path = origin + "/main.c";
        std::ofstream(path) << "int step(int v) {\n    return v + " << i << ";\n}\n";
        commit_all(origin, "commit " + std::to_string(i));
    }
    git("branch feature", origin);
    git("checkout -q feature", origin);
    std::ofstream(origin + "/main.c") << "int step(int v) {\n    return v * 9;\n}\n";
    commit_all(origin, "feature change");
    git("checkout -q main", origin);

    SECTION("depth 1 of the feature branch lacks the base: exit 2 with the remedy") {
        git("clone -q --depth 1 --branch feature file://" + origin + " shallow1", dir.path());
        const auto result =
            run_tollgate("check --base main~3 --no-pch-cache", dir.path() + "/shallow1");
        CHECK(result.exit_code == 2);
        CHECK(result.err.find("shallow") != std::string::npos);
        CHECK(result.err.find("git fetch --unshallow") != std::string::npos);
    }
    SECTION("depth 2 holds base and head: they are compared directly") {
        git("clone -q --depth 2 --branch feature file://" + origin + " shallow2", dir.path());
        const auto report = check_json(dir.path() + "/shallow2", "--base HEAD~1 --head HEAD");
        CHECK(touched_set(report) == std::vector<std::string>{"changed step"});
    }
}

namespace {

const char* const k_strict_policy = "tollgate-policy: 1\n"
                                    "rules:\n"
                                    "  - id: effort-growth\n"
                                    "    kind: growth\n"
                                    "    measure: effort\n"
                                    "    max-increase-percent: 20\n"
                                    "    level: blocking\n";

const char* const k_loose_policy = "tollgate-policy: 1\n"
                                   "rules:\n"
                                   "  - id: effort-growth\n"
                                   "    kind: growth\n"
                                   "    measure: effort\n"
                                   "    max-increase-percent: 900\n"
                                   "    level: blocking\n";

// A repository whose head commit more than doubles the effort of `grow`.
std::pair<std::string, std::string> growing_history(const TempDir& dir,
                                                    const std::string& base_policy,
                                                    const std::string& head_policy) {
    init_repo(dir.path());
    dir.write("grow.c", "int grow(int a) {\n    return a + 1;\n}\n");
    if (!base_policy.empty()) {
        dir.write(".tollgate.yaml", base_policy);
    }
    const std::string base = commit_all(dir.path(), "base");
    dir.write("grow.c", "int grow(int a) {\n    if (a > 10) {\n        return a * a - 3;\n    }\n"
                        "    return a + 1;\n}\n");
    if (!head_policy.empty()) {
        dir.write(".tollgate.yaml", head_policy);
    }
    return {base, commit_all(dir.path(), "head")};
}

} // namespace

TEST_CASE("check blocks a change that breaks the base commit's policy", "[check][policy]") {
    TempDir dir;
    const auto [base, head] = growing_history(dir, k_strict_policy, "");
    const auto result = run_tollgate(
        "check --no-pch-cache --no-color --base " + base + " --head " + head, dir.path());
    CHECK(result.exit_code == 1);
    CHECK(result.out.find("verdict: BLOCKED by 1 blocking finding (policy: .tollgate.yaml at "
                          "base " +
                          base.substr(0, 7) + ")") != std::string::npos);
    // The finding under its function, then the command that explains it.
    CHECK(result.out.find("  block  grow  grow.c:1\n           effort +") != std::string::npos);
    CHECK(result.out.find("exceeds the limit +20% by") != std::string::npos);
    // The command compares the two sides of the change (explain --change BASE..HEAD).
    CHECK(result.out.find("           why: tollgate explain --change " + base.substr(0, 10) + ".." +
                          head.substr(0, 10) + " grow.c:grow\n") != std::string::npos);
}

TEST_CASE("check judges with the base's policy when the change loosens it", "[check][policy]") {
    TempDir dir;
    const auto [base, head] = growing_history(dir, k_strict_policy, k_loose_policy);
    const auto result = run_tollgate(
        "check --no-pch-cache --no-color --base " + base + " --head " + head, dir.path());
    CHECK(result.exit_code == 1);
    CHECK(result.out.find("policy: this change edits .tollgate.yaml; the base's policy judges it "
                          "until the change is merged") != std::string::npos);
    CHECK(result.out.find("rules[\"effort-growth\"].max-increase-percent: 20 in base, 900 in "
                          "head") != std::string::npos);
}

TEST_CASE("check judges with the head's policy when the base's policy says so", "[check][policy]") {
    TempDir dir;
    const std::string base_policy = std::string(k_strict_policy) + "judge-with: head\n";
    const std::string head_policy = std::string(k_loose_policy) + "judge-with: head\n";
    const auto [base, head] = growing_history(dir, base_policy, head_policy);
    const auto result = run_tollgate(
        "check --no-pch-cache --no-color --base " + base + " --head " + head, dir.path());
    CHECK(result.exit_code == 0);
    CHECK(result.out.find("the head's policy judges it") != std::string::npos);
}

TEST_CASE("check uses --policy over the repository's policy", "[check][policy]") {
    TempDir dir;
    const auto [base, head] = growing_history(dir, k_strict_policy, "");
    TempDir elsewhere;
    elsewhere.write("loose.yaml", k_loose_policy);
    const auto result = run_tollgate("check --no-pch-cache --policy " + elsewhere.path() +
                                         "/loose.yaml --base " + base + " --head " + head,
                                     dir.path());
    CHECK(result.exit_code == 0);
}

TEST_CASE("check judges nothing with a broken policy", "[check][policy]") {
    TempDir dir;
    const auto [base, head] =
        growing_history(dir,
                        "tollgate-policy: 1\nrules:\n  - id: x\n    kind: growth\n"
                        "    measure: efort\n    max-increase: 5\n",
                        "");
    const auto result = run_tollgate("check --no-pch-cache --base " + base + " --head " + head +
                                         " --report json:out.json",
                                     dir.path());
    CHECK(result.exit_code == 2);
    CHECK(result.err.find(":5:14: unknown measure \"efort\" (did you mean \"effort\"?)") !=
          std::string::npos);
    CHECK(result.out.empty());
    CHECK(tollgate::test::read_text(dir.path() + "/out.json").empty());
}

TEST_CASE("check writes SARIF that validates against the OASIS schema", "[check][sarif]") {
    // OASIS SARIF 2.1.0 schema (tests/fixtures/standards), validated by Debian's
    // python3-jsonschema, a general-purpose validator outside the project.
    TempDir dir;
    const auto [base, head] = growing_history(dir, k_strict_policy, "");
    const auto result = run_tollgate("check --no-pch-cache --base " + base + " --head " + head +
                                         " --report sarif:out.sarif",
                                     dir.path());
    REQUIRE(result.exit_code == 1);
    const auto sarif = nlohmann::json::parse(tollgate::test::read_text(dir.path() + "/out.sarif"));
    REQUIRE(sarif["runs"][0]["results"].size() == 1);
    CHECK(sarif["runs"][0]["results"][0]["ruleId"] == "effort-growth");
    CHECK(sarif["runs"][0]["results"][0]["level"] == "error");
    const std::string schema =
        std::string(TOLLGATE_FIXTURES_DIR) + "/standards/sarif-schema-2.1.0.json";
    const auto validated =
        tollgate::test::run_command("python3 -c 'import json,sys,jsonschema; "
                                    "jsonschema.Draft4Validator(json.load(open(sys.argv[1])))."
                                    "validate(json.load(open(sys.argv[2])))' " +
                                        tollgate::test::shell_quote(schema) + " out.sarif",
                                    dir.path());
    if (validated.err.find("No module named") != std::string::npos) {
        WARN("python3-jsonschema is not installed; skipping the schema validation");
        return;
    }
    INFO(validated.err);
    CHECK(validated.exit_code == 0);
}
