// SPDX-License-Identifier: MIT
// Reuse of parsed headers: calibrate reports exactly the same with translation units reparsed
// from their precompiled preambles, or parsed after their precompiled shared headers, as with
// every version parsed from scratch, on a scripted history whose headers, include blocks and
// flags change along the way.
#include "support/fake_forge.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <nlohmann/json.hpp>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::run_tollgate;
using tollgate::test::ScopedEnvironment;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

// A header-only template library of our own (invented), a source that includes it and edits its
// functions commit after commit; midway the header itself changes (its preamble must not be
// reused), the include block gains a line, and a macro guards one function.
std::string make_history(const TempDir& dir) {
    const std::string repo = dir.path() + "/r";
    init_repo(repo);
    std::string header = "#pragma once\n"
                         "#include <vector>\n"
                         "namespace grid {\n"
                         "template <typename T> struct Cell { T value; T twice() const { return "
                         "value + value; } };\n"
                         "template <typename T> T clamp(T v, T lo, T hi) { return v < lo ? lo : v "
                         "> hi ? hi : v; }\n"
                         "}\n";
    dir.write("r/include/grid/cell.hpp", header);
    for (int c = 0; c < 9; ++c) {
        if (c == 4) { // the header changes: every unit that includes it is built anew
            header.insert(header.rfind('}'),
                          "template <typename T> T square(T v) { return v * v; }\n");
            dir.write("r/include/grid/cell.hpp", header);
        }
        const std::string extra_include = c >= 6 ? "#include <cstddef>\n" : "";
        dir.write("r/src/field.cpp",
                  fmt::format("#include \"grid/cell.hpp\"\n{0}"
                              "#define SCALE {1}\n"
                              "int sweep(int n) {{\n"
                              "    std::vector<grid::Cell<int>> cells(1, {{n}});\n"
                              "    grid::Cell<int> cell = cells.front();\n"
                              "    int total = 0;\n"
                              "    for (int i = 0; i < n * SCALE; ++i) {{\n"
                              "        total += grid::clamp(cell.twice() - i, 0, {1});\n"
                              "    }}\n"
                              "    return total;\n"
                              "}}\n"
                              "#if SCALE > 3\n"
                              "int boost(int v) {{ return v * SCALE + {1}; }}\n"
                              "#endif\n"
                              "double mean(const double* v, int n) {{\n"
                              "    double s = 0;\n"
                              "    for (int i = 0; i < n; ++i) {{ s += v[i] * {1}; }}\n"
                              "    return n ? s / n : 0;\n"
                              "}}\n",
                              extra_include, c + 1));
        commit_all(repo, fmt::format("revision {}", c));
    }
    return repo;
}

nlohmann::json measured(const std::string& out) {
    auto doc = nlohmann::json::parse(out);
    doc.erase("seconds");
    doc.erase("threads");
    doc.erase("cache");
    return doc;
}

} // namespace

TEST_CASE("calibrate reports the same with and without preamble reuse and shared headers",
          "[calibrate]") {
    TempDir dir, pch_cache;
    const std::string repo = make_history(dir);
    ScopedEnvironment environment;
    environment.set("TOLLGATE_CACHE_DIR", pch_cache.path());
    for (const char* jobs : {"1", "2"}) {
        // With the precompiled standard headers too: a reused unit resolves the standard headers
        // under another path (main_file_stand_ins.hpp), which once made every file measure empty.
        for (const char* pch : {"--no-pch-cache", ""}) {
            DYNAMIC_SECTION("with " << jobs << " workers " << pch) {
                TempDir plain_cache;
                const auto plain = run_tollgate(
                    fmt::format("calibrate -v {} -j {} --format json --preamble-units 0 "
                                "--no-shared-headers --cache-dir {}",
                                pch, jobs, shell_quote(plain_cache.path())),
                    repo);
                INFO(plain.err);
                REQUIRE(plain.exit_code == 0);
                CHECK(plain.err.find("reparsed") == std::string::npos);
                CHECK(plain.err.find("shared headers") == std::string::npos);
                const nlohmann::json plain_report = measured(plain.out);
                // Each way of reusing parsed headers, alone and together.
                for (const char* reuse_options : {"--preamble-units 4 --no-shared-headers",
                                                  "--preamble-units 0", "--preamble-units 4"}) {
                    TempDir reuse_cache;
                    const auto reuse = run_tollgate(
                        fmt::format("calibrate -v {} -j {} --format json {} --cache-dir {}", pch,
                                    jobs, reuse_options, shell_quote(reuse_cache.path())),
                        repo);
                    INFO(reuse_options << "\n" << reuse.err);
                    REQUIRE(reuse.exit_code == 0);
                    // The switches work both ways: reuse happened here and not in the plain run.
                    const bool preambles =
                        std::string(reuse_options).find("units 4") != std::string::npos;
                    const bool shared =
                        std::string(reuse_options).find("--no-shared") == std::string::npos;
                    if (preambles) {
                        CHECK(reuse.err.find("reparsed (preamble kept") != std::string::npos);
                    }
                    if (shared && !preambles && std::string(pch).empty()) {
                        // The shared headers ride on the precompiled standard headers.
                        CHECK(reuse.err.find("after its precompiled shared headers") !=
                              std::string::npos);
                    }
                    CHECK(measured(reuse.out) == plain_report);
                }
                CHECK(plain_report["commits"].size() == 8);
                // Every commit measured functions: nothing came out empty.
                for (const auto& commit : plain_report["commits"]) {
                    CHECK(commit["functions"].get<int>() > 0);
                }
            }
        }
    }
}
