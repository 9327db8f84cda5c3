// SPDX-License-Identifier: MIT
// Java through every command: a repository mixing C++ and Java, gated, snapshotted, explained
// and calibrated with the real binary.
#include "gate/baseline/snapshot.hpp"
#include "gate/baseline/snapshot_file.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#if TOLLGATE_JAVA_ENABLED

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::read_text;
using tollgate::test::run_tollgate;
using tollgate::test::TempDir;

namespace {

const char* const k_policy = "tollgate-policy: 1\n"
                             "rules:\n"
                             "  - id: effort-growth\n"
                             "    kind: growth\n"
                             "    measure: effort\n"
                             "    max-increase-percent: 40\n"
                             "    level: blocking\n";

const char* const k_java_base = R"(package com.skyline.ground;

public class Calibration {
    private double offset;

    public double apply(double raw) {
        return raw + offset;
    }

    public void reset() {
        offset = 0.0;
    }
}
)";

// apply() grows well past +40% effort; reset() is untouched.
const char* const k_java_head = R"(package com.skyline.ground;

public class Calibration {
    private double offset;

    public double apply(double raw) {
        if (Double.isNaN(raw) || raw < -90.0 || raw > 60.0) {
            throw new IllegalArgumentException("reading out of range: " + raw);
        }
        double corrected = raw + offset;
        return Math.round(corrected * 100.0) / 100.0;
    }

    public void reset() {
        offset = 0.0;
    }
}
)";

const char* const k_cpp_base = "int scale(int raw) {\n    return raw * 2;\n}\n";
const char* const k_cpp_head = "int scale(int raw) {\n    return raw * 2 + 1;\n}\n";

struct History {
    std::string base;
    std::string head;
};

History mixed_history(const TempDir& dir, const std::string& policy) {
    init_repo(dir.path());
    dir.write(".tollgate.yaml", policy);
    dir.write("firmware/scale.cpp", k_cpp_base);
    dir.write("ground/src/com/skyline/ground/Calibration.java", k_java_base);
    History history;
    history.base = commit_all(dir.path(), "base");
    dir.write("firmware/scale.cpp", k_cpp_head);
    dir.write("ground/src/com/skyline/ground/Calibration.java", k_java_head);
    history.head = commit_all(dir.path(), "head");
    return history;
}

} // namespace

TEST_CASE("check judges a change to C++ and Java with one report and one verdict", "[java]") {
    TempDir dir;
    const History h = mixed_history(dir, k_policy);
    const auto result = run_tollgate("check --no-pch-cache --no-color --base " + h.base +
                                         " --head " + h.head + " --report json:report.json" +
                                         " --report sarif:report.sarif --report markdown:report.md",
                                     dir.path());
    INFO(result.out << result.err);
    CHECK(result.exit_code == 1);
    CHECK(result.out.find("verdict: BLOCKED by 1 blocking finding") != std::string::npos);
    CHECK(result.out.find("block  com.skyline.ground.Calibration.apply  "
                          "ground/src/com/skyline/ground/Calibration.java:6\n"
                          "           effort +") != std::string::npos);

    const auto report = nlohmann::json::parse(read_text(dir.path() + "/report.json"));
    CHECK(report["convention"] == "c-family/2, java/1");
    std::vector<std::string> functions;
    for (const auto& f : report["functions"]) {
        functions.push_back(f["label"].get<std::string>() + " " + f["function"].get<std::string>());
    }
    std::sort(functions.begin(), functions.end());
    CHECK(functions == std::vector<std::string>{"changed com.skyline.ground.Calibration.apply",
                                                "changed scale"});

    const auto sarif = nlohmann::json::parse(read_text(dir.path() + "/report.sarif"));
    const auto& results = sarif["runs"][0]["results"];
    REQUIRE(results.size() == 1);
    const auto& location = results[0]["locations"][0]["physicalLocation"];
    CHECK(location["artifactLocation"]["uri"] == "ground/src/com/skyline/ground/Calibration.java");
    CHECK(location["region"]["startLine"] == 6);

    const std::string markdown = read_text(dir.path() + "/report.md");
    CHECK(markdown.find("Calibration.apply") != std::string::npos);
    CHECK(markdown.find("scale") != std::string::npos);
    CHECK(markdown.find("convention c-family/2, java/1") != std::string::npos);
}

TEST_CASE("check applies the policy's path globs and overrides to Java paths", "[java]") {
    SECTION("an override for **/*.java turns the Java finding into a warning") {
        TempDir dir;
        const History h =
            mixed_history(dir, std::string(k_policy) + "paths:\n"
                                                       "  overrides:\n"
                                                       "    - match: \"**/*.java\"\n"
                                                       "      rules:\n"
                                                       "        effort-growth: {level: warning}\n");
        const auto result = run_tollgate(
            "check --no-pch-cache --no-color --base " + h.base + " --head " + h.head, dir.path());
        INFO(result.out << result.err);
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("warn   com.skyline.ground.Calibration.apply  "
                              "ground/src/com/skyline/ground/Calibration.java:6\n"
                              "           effort +") != std::string::npos);
    }
    SECTION("an exclude of ground/** leaves the Java function unjudged") {
        TempDir dir;
        const History h =
            mixed_history(dir, std::string(k_policy) + "paths:\n"
                                                       "  include: [\"**\"]\n"
                                                       "  exclude: [\"ground/**\"]\n");
        const auto result = run_tollgate(
            "check --no-pch-cache --no-color --base " + h.base + " --head " + h.head, dir.path());
        INFO(result.out << result.err);
        CHECK(result.exit_code == 0);
    }
}

TEST_CASE("snapshot records both conventions and check takes the Java base from it", "[java]") {
    TempDir dir;
    const History h = mixed_history(dir, k_policy);
    const auto made =
        run_tollgate("snapshot --no-pch-cache --rev " + h.base + " --out base.json", dir.path());
    INFO(made.out << made.err);
    REQUIRE(made.exit_code == 0);
    const auto snapshot = nlohmann::json::parse(read_text(dir.path() + "/base.json"));
    CHECK(snapshot["convention"] == "c-family/2, java/1");
    std::vector<std::string> names;
    for (const auto& f : snapshot["functions"]) {
        names.push_back(f["function"].get<std::string>());
    }
    CHECK(names == std::vector<std::string>{"scale", "com.skyline.ground.Calibration.apply",
                                            "com.skyline.ground.Calibration.reset"});

    SECTION("the base side comes from the snapshot and the verdict is the same") {
        const auto result =
            run_tollgate("check --no-pch-cache --no-color --baseline base.json --base " + h.base +
                             " --head " + h.head,
                         dir.path());
        INFO(result.out << result.err);
        CHECK(result.exit_code == 1);
        CHECK(result.out.find("block  com.skyline.ground.Calibration.apply  "
                              "ground/src/com/skyline/ground/Calibration.java:6\n"
                              "           effort +") != std::string::npos);
    }
    SECTION("a snapshot counted without Java is not used; the warning names the rebuild") {
        // What a build without the Java front end writes: C/C++ functions only, c-family/2.
        std::vector<tollgate::lexer::FileFunctions> files(1);
        files[0].path = "firmware/scale.cpp";
        const auto old = tollgate::baseline::make_snapshot(files, snapshot["commit"], "c-family/2",
                                                           {}, "2026-01-01T00:00:00Z");
        tollgate::baseline::save_snapshot(old, dir.path() + "/old.json");
        const auto result =
            run_tollgate("check --no-pch-cache --no-color --baseline old.json --base " + h.base +
                             " --head " + h.head,
                         dir.path());
        INFO(result.err);
        // A tool upgrade makes the pipeline's snapshot stale, not the change wrong: the base is
        // parsed and the verdict is the change's own.
        CHECK(result.exit_code == 1);
        CHECK(result.err.find("tollgate: warning: the baseline snapshot old.json is not used: it "
                              "was measured under convention \"c-family/2\", this run counts "
                              "\"c-family/2, java/1\"; the base was parsed (rebuild it: "
                              "tollgate snapshot --rev " +
                              h.base.substr(0, 7) + " --out old.json)") != std::string::npos);
    }
}

TEST_CASE("measure and explain take Java files", "[java]") {
    TempDir dir;
    const History h = mixed_history(dir, k_policy);
    const auto measured = run_tollgate("measure --no-pch-cache", dir.path());
    INFO(measured.out << measured.err);
    CHECK(measured.exit_code == 0);
    CHECK(measured.out.find("com.skyline.ground.Calibration.apply") != std::string::npos);
    CHECK(measured.out.find("firmware/scale.cpp:1") != std::string::npos);
    const auto explained = run_tollgate(
        "explain --no-pch-cache ground/src/com/skyline/ground/Calibration.java:apply", dir.path());
    INFO(explained.out << explained.err);
    CHECK(explained.exit_code == 0);
    CHECK(explained.out.find("IllegalArgumentException") != std::string::npos);
    CHECK(explained.out.find("type name") != std::string::npos);
}

TEST_CASE("calibrate replays Java changes with the C++ ones", "[java]") {
    TempDir dir;
    TempDir cache;
    const History h = mixed_history(dir, k_policy);
    const auto result =
        run_tollgate("calibrate --format json --no-pch-cache --cache-dir " +
                         tollgate::test::shell_quote(cache.path()) + " --policy .tollgate.yaml",
                     dir.path());
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
    const auto doc = nlohmann::json::parse(result.out);
    REQUIRE(doc["commits"].size() == 1);
    CHECK(doc["commits"][0]["commit"] == h.head);
    // The head commit changes scale (C++) and Calibration.apply (Java): both are in the
    // distribution, and the Java growth is what the policy would have blocked.
    CHECK(doc["measures"]["effort"]["growth"]["summary"]["count"] == 2);
    CHECK(doc["what_if"]["blocked"] == 1);
    CHECK(doc["what_if"]["flagged"][0]["rules"] == nlohmann::json::array({"effort-growth"}));
}

TEST_CASE("the pre-push hook blocks a push that bloats a Java method", "[java]") {
    TempDir dir;
    const std::string work = dir.path() + "/work";
    const std::string remote = dir.path() + "/remote.git";
    tollgate::test::git("init -q --bare -b main " + remote, dir.path());
    init_repo(work);
    dir.write("work/.tollgate.yaml", k_policy);
    dir.write("work/ground/Calibration.java", k_java_base);
    commit_all(work, "base");
    tollgate::test::git("remote add origin " + remote, work);
    tollgate::test::git("push -q origin main", work);
    REQUIRE(run_tollgate("hook install", work).exit_code == 0);
    dir.write("work/ground/Calibration.java", k_java_head);
    commit_all(work, "range checks");
    const auto push = tollgate::test::run_command("git push origin main", work);
    INFO(push.err);
    CHECK(push.exit_code != 0);
    CHECK(push.err.find("block  com.skyline.ground.Calibration.apply  "
                        "ground/Calibration.java:6\n"
                        "           effort +") != std::string::npos);
    CHECK(push.err.find("BLOCKED") != std::string::npos);
}

#endif

#if TOLLGATE_JAVA_ENABLED
TEST_CASE("snapshot --compare takes two snapshots of one convention, whichever", "[java]") {
    TempDir dir;
    std::vector<tollgate::lexer::FileFunctions> files(1);
    files[0].path = "firmware/scale.cpp";
    const std::string commit(40, 'a');
    auto save = [&](const std::string& name, const std::string& convention) {
        tollgate::baseline::save_snapshot(tollgate::baseline::make_snapshot(files, commit,
                                                                            convention, {},
                                                                            "2026-01-01T00:00:00Z"),
                                          dir.path() + "/" + name);
    };
    save("old-a.json", "c-family/1");
    save("old-b.json", "c-family/1");
    save("new.json", "c-family/1, java/1");
    SECTION("two snapshots made before Java was measured still compare") {
        const auto result = run_tollgate("snapshot --compare old-a.json old-b.json", dir.path());
        INFO(result.err);
        CHECK(result.exit_code == 0);
        CHECK(result.out.find("snapshot trend under convention \"c-family/1\"") !=
              std::string::npos);
    }
    SECTION("snapshots of different conventions are refused") {
        const auto result = run_tollgate("snapshot --compare old-a.json new.json", dir.path());
        CHECK(result.exit_code == 2);
        CHECK(result.err.find("measured under convention \"c-family/1, java/1\"") !=
              std::string::npos);
    }
}
#endif
