// SPDX-License-Identifier: MIT
// A change under review is hostile: includes that point at host files, devices and FIFOs, files
// that crash or exhaust the parser, symlinks in the working tree. The real binary on real
// repositories: nothing outside the revision reaches a report, and the run ends with a verdict.
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <sys/stat.h>

using namespace tollgate;
using test::commit_all;
using test::init_repo;
using test::read_text;
using test::run_command;
using test::shell_quote;
using test::TempDir;

namespace {

// Every report of one check, and how it ended.
struct Reports {
    int exit_code = -1;
    std::string text, markdown, json, sarif, err;
};

// Run `check ARGS` in `dir` with every report written to `reports_dir`, under a time limit and an
// address-space limit (a hang or a runaway allocation fails the test instead of the machine).
// AddressSanitizer reserves terabytes of shadow address space at start-up, so a sanitized build
// keeps only the time limit (its parser processes drop their own limit the same way).
#if defined(__SANITIZE_ADDRESS__)
constexpr const char* address_space_limit = "";
#else
constexpr const char* address_space_limit = "ulimit -v 4000000; ";
#endif

Reports check_all_reports(const std::string& dir, const std::string& args,
                          const std::string& reports_dir) {
    const std::string md = reports_dir + "/report.md";
    const std::string json = reports_dir + "/report.json";
    const std::string sarif = reports_dir + "/report.sarif";
    const auto run = run_command(
        std::string(address_space_limit) + "timeout 300 " + shell_quote(test::tollgate_binary()) +
            " check " + args +
            " --no-pch-cache --report text:- --report markdown:" + shell_quote(md) +
            " --report json:" + shell_quote(json) + " --report sarif:" + shell_quote(sarif),
        dir);
    Reports reports;
    reports.exit_code = run.exit_code;
    reports.text = run.out;
    reports.err = run.err;
    reports.markdown = read_text(md);
    reports.json = read_text(json);
    reports.sarif = read_text(sarif);
    return reports;
}

bool in_any(const Reports& reports, const std::string& word) {
    for (const std::string* text :
         {&reports.text, &reports.markdown, &reports.json, &reports.sarif, &reports.err}) {
        if (text->find(word) != std::string::npos) {
            return true;
        }
    }
    return false;
}

// Return true when the probe function `leaked`, defined under `#ifdef SECRET_READ` (a macro only
// the host file defines), is reported active: the host file was read. Functions of skipped #if
// branches are measured too, marked inactive, so the probe is judged by its mark.
bool probe_active(const Reports& reports) {
    const auto report = nlohmann::json::parse(reports.json);
    for (const auto& f : report["functions"]) {
        if (f["function"] == "leaked" && !f["head"].is_null() &&
            f["head"]["marks"] != nlohmann::json::array({"inactive"})) {
            return true;
        }
    }
    return false;
}

const nlohmann::json* function_named(const nlohmann::json& report, const std::string& name) {
    for (const auto& f : report["functions"]) {
        if (f["function"] == name) {
            return &f;
        }
    }
    return nullptr;
}

std::string repeat(const std::string& text, int times) {
    std::string out;
    for (int i = 0; i < times; ++i) {
        out += text;
    }
    return out;
}

} // namespace

TEST_CASE("check never copies a host file into a report", "[check][hostile]") {
    TempDir outside; // a folder of the host, not of the repository
    outside.write("secret.h", "#define SECRET_READ 1\nint SECRETTOKEN_1 = 1; SECRETTOKEN_2 here\n");
    const std::string secret = outside.path() + "/secret.h";
    TempDir dir;
    init_repo(dir.path());
    dir.write("src/a.cpp", "int f(int a) { return a; }\n");
    commit_all(dir.path(), "base");
    dir.write("src/a.cpp", "#include \"" + secret + "\"\n#include \"" + repeat("../", 12) +
                               secret.substr(1) + "\"\n#define WHERE \"" + secret +
                               "\"\n#include WHERE\n#ifdef SECRET_READ\n"
                               "int leaked(int a) { return a + 1; }\n#endif\n"
                               "int f(int a) { return a * 2; }\n");
    commit_all(dir.path(), "head");
    TempDir reports_dir;
    const Reports reports = check_all_reports(dir.path(), "--base HEAD~1", reports_dir.path());
    INFO(reports.err);
    REQUIRE((reports.exit_code == 0 || reports.exit_code == 1));

    SECTION("no byte of the host file is in any report") {
        CHECK_FALSE(in_any(reports, "SECRETTOKEN"));
        CHECK_FALSE(probe_active(reports));
        CHECK(reports.text.find("leaked [inactive]") != std::string::npos);
    }
    SECTION("each refused include is named in a warning, in every report") {
        const std::string absolute = "include \"" + secret + "\" not found";
        const std::string relative = "include \"" + repeat("../", 12) + secret.substr(1) + "\"";
        // The terminal counts them in one line; JSON keeps each one; Markdown folds them,
        // grouped by missing header.
        CHECK(reports.text.find("3 parse warnings in 1 file") != std::string::npos);
        CHECK(reports.markdown.find("`" + secret + "` not found") != std::string::npos);
        CHECK(reports.markdown.find("`" + repeat("../", 12) + secret.substr(1) + "` not found") !=
              std::string::npos);
        const auto json = nlohmann::json::parse(reports.json);
        REQUIRE(json["warnings"].size() == 3);
        CHECK(json["warnings"][0]["message"].get<std::string>().find(absolute) == 0);
        CHECK(json["warnings"][1]["message"].get<std::string>().find(relative) == 0);
        const auto sarif = nlohmann::json::parse(reports.sarif);
        CHECK(sarif["runs"][0]["invocations"][0]["toolExecutionNotifications"].size() == 3);
    }
}

TEST_CASE("check reads no host folder a committed compile database names", "[check][hostile]") {
    TempDir outside;
    outside.write("vendor/config.h", "#define SECRET_READ 1\n");
    TempDir dir;
    init_repo(dir.path());
    dir.write("src/a.cpp", "int f(int a) { return a; }\n");
    commit_all(dir.path(), "base");
    // The change brings its own database naming a folder of the host.
    dir.write("compile_commands.json",
              nlohmann::json::array(
                  {{{"directory", dir.path()},
                    {"file", dir.path() + "/src/a.cpp"},
                    {"arguments", {"c++", "-I" + outside.path() + "/vendor", "-c", "src/a.cpp"}}}})
                  .dump());
    dir.write("src/a.cpp",
              "#include \"config.h\"\n#ifdef SECRET_READ\n"
              "int leaked(int a) { return a; }\n#endif\nint f(int a) { return -a; }\n");
    commit_all(dir.path(), "head");
    TempDir reports_dir;
    const Reports reports = check_all_reports(dir.path(), "--base HEAD~1", reports_dir.path());
    INFO(reports.err);
    REQUIRE((reports.exit_code == 0 || reports.exit_code == 1));
    CHECK_FALSE(probe_active(reports));
    const auto json = nlohmann::json::parse(reports.json);
    REQUIRE(json["warnings"].size() == 1);
    CHECK(json["warnings"][0]["message"].get<std::string>().find(
              "include \"config.h\" not found") == 0);
}

TEST_CASE("check never opens a device or a FIFO named by an include", "[check][hostile]") {
    TempDir outside;
    REQUIRE(run_command("mkfifo pipe.h", outside.path()).exit_code == 0);
    TempDir dir;
    init_repo(dir.path());
    dir.write("src/a.cpp", "int f(int a) { return a; }\n");
    commit_all(dir.path(), "base");
    dir.write("src/a.cpp", "#include \"/dev/zero\"\n#include \"/dev/urandom\"\n"
                           "#include \"/dev/stdin\"\n#include \"" +
                               outside.path() + "/pipe.h\"\nint f(int a) { return a * 2; }\n");
    commit_all(dir.path(), "head");
    TempDir reports_dir;
    const Reports reports = check_all_reports(dir.path(), "--base HEAD~1", reports_dir.path());
    INFO(reports.err);
    // Before confinement /dev/zero grew the parser's buffer until memory ran out.
    REQUIRE((reports.exit_code == 0 || reports.exit_code == 1));
    const auto json = nlohmann::json::parse(reports.json);
    CHECK(json["warnings"].size() == 4);
    const auto* f = function_named(json, "f");
    REQUIRE(f != nullptr);
    CHECK((*f)["head"]["extent"] == "syntax-tree");
}

TEST_CASE("check survives files that crash or exhaust the parser", "[check][hostile]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("src/keep.cpp", "int keep(int a) { return a; }\n");
    commit_all(dir.path(), "base");
    dir.write("src/keep.cpp", "int keep(int a) { return a + 1; }\n");
    // Generated here, so the repository holds only small files.
    dir.write("src/deep.cpp", "int deep() { return " + repeat("A<", 20000) + "int" +
                                  repeat(">", 20000) + "::v; }\n");
    dir.write("src/line.cpp", "int line(int a) { return " + repeat("a+", 500000) + "a; }\n");
    dir.write("src/nested.cpp", "#define F(x) x\nint nested() { return " + repeat("F(", 20000) +
                                    "1" + repeat(")", 20000) + "; }\n");
    std::string bomb = "#define A0 x\n";
    for (int i = 1; i < 40; ++i) {
        bomb += "#define A" + std::to_string(i) + " A" + std::to_string(i - 1) + " A" +
                std::to_string(i - 1) + "\n";
    }
    dir.write("src/bomb.cpp", bomb + "int bomb() { int x = 0; return A39; }\n");
    commit_all(dir.path(), "head");
    TempDir reports_dir;
    const Reports reports = check_all_reports(
        dir.path(), "--base HEAD~1 --parse-timeout 5 --parse-memory 2048", reports_dir.path());
    INFO(reports.err);
    REQUIRE((reports.exit_code == 0 || reports.exit_code == 1));
    const auto json = nlohmann::json::parse(reports.json);

    SECTION("each such file is measured lexically and marked in every report") {
        for (const std::string name : {"deep", "line", "nested", "bomb"}) {
            INFO(name);
            const auto* f = function_named(json, name);
            REQUIRE(f != nullptr);
            CHECK((*f)["label"] == "added");
            CHECK((*f)["head"]["extent"] == "parser-stopped");
            CHECK(reports.text.find(name + " [parser stopped]") != std::string::npos);
            CHECK(reports.markdown.find("`" + name + "` (parser stopped)") != std::string::npos);
        }
        std::size_t stops = 0;
        for (const auto& w : json["warnings"]) {
            stops +=
                w["message"].get<std::string>().rfind("the parser stopped on this file (", 0) == 0
                    ? 1
                    : 0;
        }
        CHECK(stops == 4);
        const auto sarif = nlohmann::json::parse(reports.sarif);
        for (const auto& result : sarif["runs"][0]["results"]) {
            const std::string uri =
                result["locations"][0]["physicalLocation"]["artifactLocation"]["uri"];
            // Findings on one function (a budget finding is about the whole change).
            if (uri != "src/keep.cpp" && result.contains("partialFingerprints")) {
                CHECK(result["properties"]["extent"] == "parser-stopped");
            }
        }
    }
    SECTION("the other files of the change are parsed as usual") {
        const auto* keep = function_named(json, "keep");
        REQUIRE(keep != nullptr);
        CHECK((*keep)["label"] == "changed");
        CHECK((*keep)["base"]["extent"] == "syntax-tree");
        CHECK((*keep)["head"]["extent"] == "syntax-tree");
    }
}

TEST_CASE("check measures both sides alike when the parser stops on one", "[check][hostile]") {
    TempDir dir;
    init_repo(dir.path());
    dir.write("src/t.cpp", "int t(int a) { return a * 2; }\n");
    commit_all(dir.path(), "base");
    dir.write("src/t.cpp", "int t(int a) { return a * 3; }\nint deep() { return " +
                               repeat("A<", 20000) + "int" + repeat(">", 20000) + "::v; }\n");
    commit_all(dir.path(), "head");
    auto expect_lexical_base = [](const Reports& reports) {
        INFO(reports.err);
        REQUIRE((reports.exit_code == 0 || reports.exit_code == 1));
        const auto json = nlohmann::json::parse(reports.json);
        const auto* t = function_named(json, "t");
        REQUIRE(t != nullptr);
        CHECK((*t)["label"] == "changed");
        CHECK((*t)["base"]["extent"] == "parser-stopped");
        CHECK((*t)["head"]["extent"] == "parser-stopped");
        bool noted = false;
        for (const auto& w : json["warnings"]) {
            noted = noted || (w["side"] == "base" &&
                              w["message"] == "the parser stopped on the head side of this file: "
                                              "this side is measured lexically too");
        }
        CHECK(noted);
    };
    TempDir reports_dir;
    SECTION("when both sides are parsed in this run") {
        expect_lexical_base(check_all_reports(dir.path(), "--base HEAD~1", reports_dir.path()));
    }
    SECTION("when the base comes from a baseline snapshot") {
        const std::string snapshot = reports_dir.path() + "/base.json";
        REQUIRE(test::run_tollgate("snapshot --rev HEAD~1 --no-pch-cache --out " +
                                       shell_quote(snapshot),
                                   dir.path())
                    .exit_code == 0);
        expect_lexical_base(check_all_reports(
            dir.path(), "--base HEAD~1 --baseline " + shell_quote(snapshot), reports_dir.path()));
    }
}

TEST_CASE("check gives the same report with one and two parser processes", "[check][hostile]") {
    TempDir dir;
    init_repo(dir.path());
    for (int i = 0; i < 6; ++i) {
        dir.write("src/f" + std::to_string(i) + ".cpp",
                  "int f" + std::to_string(i) + "(int a) { return a; }\n");
    }
    commit_all(dir.path(), "base");
    for (int i = 0; i < 6; ++i) {
        dir.write("src/f" + std::to_string(i) + ".cpp",
                  "#include <vector>\nint f" + std::to_string(i) +
                      "(int a) { std::vector<int> v(a); return v.size() > 2 ? a : -a; }\n");
    }
    dir.write("src/deep.cpp", "int deep() { return " + repeat("A<", 20000) + "int" +
                                  repeat(">", 20000) + "::v; }\n");
    commit_all(dir.path(), "head");
    const auto one =
        test::run_tollgate("check --base HEAD~1 --no-pch-cache -j 1 --report json:-", dir.path());
    const auto two =
        test::run_tollgate("check --base HEAD~1 --no-pch-cache -j 2 --report json:-", dir.path());
    INFO(one.err << two.err);
    REQUIRE((one.exit_code == 0 || one.exit_code == 1));
    CHECK(two.exit_code == one.exit_code);
    CHECK(nlohmann::json::parse(two.out) == nlohmann::json::parse(one.out));
}

TEST_CASE("check shows no parser message from a header outside the revision", "[check][hostile]") {
    TempDir vendor; // a library folder the pipeline's compile database names
    vendor.write("vendor.h", "struct Vendor { VENDORTOKEN broken; };\n");
    TempDir dir;
    init_repo(dir.path());
    dir.write("src/a.cpp", "int f(int a) { return a; }\n");
    commit_all(dir.path(), "base");
    dir.write("src/a.cpp",
              "#include <vector>\n#include \"vendor.h\"\nint f(int a) { return -a; }\n");
    commit_all(dir.path(), "head");
    TempDir db;
    db.write(
        "compile_commands.json",
        nlohmann::json::array({{{"directory", dir.path()},
                                {"file", dir.path() + "/src/a.cpp"},
                                {"arguments", {"c++", "-I" + vendor.path(), "-c", "src/a.cpp"}}}})
            .dump());
    TempDir reports_dir;
    const Reports reports = check_all_reports(dir.path(),
                                              "--base HEAD~1 --compile-commands " +
                                                  shell_quote(db.path() + "/compile_commands.json"),
                                              reports_dir.path());
    INFO(reports.err);
    REQUIRE((reports.exit_code == 0 || reports.exit_code == 1));
    CHECK_FALSE(in_any(reports, "VENDORTOKEN"));
    const auto json = nlohmann::json::parse(reports.json);
    REQUIRE(json["warnings"].size() == 1);
    CHECK(json["warnings"][0]["line"] == 2);
    CHECK(json["warnings"][0]["message"] ==
          "the parser met an error inside a header outside the revision, included from here (its "
          "message is not shown: it may quote that header)");
}

TEST_CASE("measure never follows a symlink or opens a FIFO in the folder it reads",
          "[check][hostile]") {
    TempDir outside;
    outside.write("secret.cpp", "int SECRETTOKEN(int a) { return a; }\n");
    TempDir dir; // a plain folder, not a repository
    dir.write("src/a.cpp", "int f(int a) { return a; }\n");
    REQUIRE(run_command("ln -s " + shell_quote(outside.path() + "/secret.cpp") +
                            " src/link.cpp && mkfifo src/pipe.cpp",
                        dir.path())
                .exit_code == 0);
    const auto run = run_command("timeout 120 " + shell_quote(test::tollgate_binary()) +
                                     " measure --no-pch-cache --format json",
                                 dir.path());
    INFO(run.err);
    REQUIRE(run.exit_code == 0);
    CHECK(run.out.find("SECRETTOKEN") == std::string::npos);
    CHECK(run.err.find("skipped \"src/link.cpp\": symlink") != std::string::npos);
    CHECK(run.err.find("skipped \"src/pipe.cpp\": not a regular file") != std::string::npos);
    const auto json = nlohmann::json::parse(run.out);
    CHECK(json["functions"].size() == 1);
}
