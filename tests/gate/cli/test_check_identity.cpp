// SPDX-License-Identifier: MIT
// Identity survives signature and namespace edits: scripted histories through `tollgate check`,
// the pairing passes of gate/delta/README.md, and a real rename that stays removed + added.
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

using tollgate::test::commit_all;
using tollgate::test::init_repo;
using tollgate::test::run_tollgate;
using tollgate::test::TempDir;

namespace {

// Commit `base` then `head` as the file `path` and return check's JSON report of the change.
nlohmann::json check_change(const TempDir& dir, const std::string& path, const std::string& base,
                            const std::string& head, const std::string& extra = "") {
    init_repo(dir.path());
    dir.write(path, base);
    const std::string base_id = commit_all(dir.path(), "base");
    dir.write(path, head);
    const std::string head_id = commit_all(dir.path(), "head");
    const auto result = run_tollgate("check --base " + base_id + " --head " + head_id +
                                         " --report json:- --no-pch-cache " + extra,
                                     dir.path());
    INFO(result.err);
    REQUIRE((result.exit_code == 0 || result.exit_code == 1));
    return nlohmann::json::parse(result.out);
}

// Return "label name" for every reported function, sorted.
std::vector<std::string> touched_set(const nlohmann::json& report) {
    std::vector<std::string> set;
    for (const auto& f : report["functions"]) {
        set.push_back(f["label"].get<std::string>() + " " + f["function"].get<std::string>());
    }
    std::sort(set.begin(), set.end());
    return set;
}

const nlohmann::json& reported(const nlohmann::json& report, const std::string& name) {
    for (const auto& f : report["functions"]) {
        if (f["function"] == name) {
            return f;
        }
    }
    FAIL("no function " << name << " in report");
    throw std::logic_error("unreachable");
}

} // namespace

TEST_CASE("check pairs a function whose parameter type changed", "[check]") {
    TempDir dir;
    const auto report = check_change(dir, "sum.cpp",
                                     "#include <cstddef>\n"
                                     "int sum(const int* v, std::size_t n) {\n"
                                     "    int total = 0;\n"
                                     "    for (std::size_t i = 0; i < n; ++i) total += v[i];\n"
                                     "    return total;\n"
                                     "}\n",
                                     "#include <cstddef>\n"
                                     "int sum(const int* v, int n) {\n"
                                     "    int total = 0;\n"
                                     "    for (int i = 0; i < n; ++i) total += v[i];\n"
                                     "    return total;\n"
                                     "}\n");
    // The USR changes with the parameter types (C++ mangling), so did the fallback key; the
    // qualified name alone pairs them (pass 4).
    CHECK(touched_set(report) == std::vector<std::string>{"changed sum"});
    const auto& sum = reported(report, "sum");
    CHECK(sum["signature"] == "const int *, int");
    CHECK(sum["base_signature"] == "const int *, std::size_t");
    CHECK(sum["base_function"].is_null());
    CHECK_FALSE(sum["base"].is_null());
    CHECK_FALSE(sum["head"].is_null());
}

TEST_CASE("check pairs an overload whose parameter list was edited beside another", "[check]") {
    TempDir dir;
    const auto report =
        check_change(dir, "scale.cpp",
                     "double scale(double v) { return v * 2.0; }\n"
                     "int scale(int v, int by) { return v * by; }\n",
                     "double scale(double v) { return v * 2.0; }\n"
                     "int scale(int v, int by, int plus) { return v * by + plus; }\n");
    CHECK(touched_set(report) == std::vector<std::string>{"changed scale"});
    const auto& scale = report["functions"][0];
    CHECK(scale["signature"] == "int, int, int");
    CHECK(scale["base_signature"] == "int, int");
}

TEST_CASE("check pairs two edited overloads of one name by their tokens", "[check]") {
    // Two base candidates named `scale` and two head ones: the name alone is ambiguous (pass 4
    // pairs nothing); each is the other's unique best token match (pass 8).
    TempDir dir;
    const auto report = check_change(dir, "scale.cpp",
                                     "double scale(double v) { return v * 2.0; }\n"
                                     "int scale(int v) { return v * 2; }\n",
                                     "double scale(float v) { return v * 2.0; }\n"
                                     "int scale(long v) { return v * 2; }\n");
    CHECK(touched_set(report) == std::vector<std::string>{"changed scale", "changed scale"});
    std::vector<std::string> signatures;
    for (const auto& f : report["functions"]) {
        signatures.push_back(f["base_signature"].get<std::string>() + " -> " +
                             f["signature"].get<std::string>());
    }
    std::sort(signatures.begin(), signatures.end());
    CHECK(signatures == std::vector<std::string>{"double -> float", "int -> long"});
}

TEST_CASE("check follows a class moved into a nested namespace", "[check]") {
    TempDir dir;
    const std::string body = "class Ring {\n"
                             "public:\n"
                             "    int push(int v) { m_last = v; return ++m_count; }\n"
                             "    int count() const { return m_count; }\n"
                             "    int last() const { return m_last; }\n"
                             "private:\n"
                             "    int m_count = 0;\n"
                             "    int m_last = 0;\n"
                             "};\n";
    // Moved into the nested namespace and re-indented, as an editor does: every line changes.
    std::string indented;
    for (std::size_t start = 0; start < body.size();) {
        const std::size_t end = body.find('\n', start);
        indented += "    " + body.substr(start, end - start + 1);
        start = end + 1;
    }
    const auto report =
        check_change(dir, "ring.hpp", "namespace skyline {\n" + body + "}\n",
                     "namespace skyline {\nnamespace buffers {\n" + indented + "}\n}\n");
    // Identical tokens under a renamed scope: pass 7 pairs them as moved, not removed + added.
    CHECK(touched_set(report) == std::vector<std::string>{"moved skyline::buffers::Ring::count",
                                                          "moved skyline::buffers::Ring::last",
                                                          "moved skyline::buffers::Ring::push"});
    const auto& push = reported(report, "skyline::buffers::Ring::push");
    CHECK(push["base_function"] == "skyline::Ring::push");
    CHECK(push["base_signature"].is_null());
    CHECK(push["base"]["token_hash"] == push["head"]["token_hash"]);
}

TEST_CASE("check follows out-of-line members whose class was renamed", "[check]") {
    // The class name is a token of each member's own qualifier, so the tokens differ by one
    // name: pass 8 pairs them by similarity.
    TempDir dir;
    const auto report = check_change(dir, "gauge.cpp",
                                     "struct Gauge { int scale; int read(int raw) const; };\n"
                                     "int Gauge::read(int raw) const {\n"
                                     "    int value = raw * scale;\n"
                                     "    if (value < 0) value = 0;\n"
                                     "    return value / 2;\n"
                                     "}\n",
                                     "struct Meter { int scale; int read(int raw) const; };\n"
                                     "int Meter::read(int raw) const {\n"
                                     "    int value = raw * scale;\n"
                                     "    if (value < 0) value = 0;\n"
                                     "    return value / 2;\n"
                                     "}\n");
    CHECK(touched_set(report) == std::vector<std::string>{"moved Meter::read"});
    CHECK(reported(report, "Meter::read")["base_function"] == "Gauge::read");
}

TEST_CASE("check leaves a real rename with a rewritten body removed and added", "[check]") {
    TempDir dir;
    const auto report =
        check_change(dir, "parse.cpp",
                     "int parse_digits(const char* s) {\n"
                     "    int n = 0;\n"
                     "    while (*s >= '0' && *s <= '9') n = n * 10 + (*s++ - '0');\n"
                     "    return n;\n"
                     "}\n",
                     "#include <cstdlib>\n"
                     "long read_number(const char* text, int base) {\n"
                     "    char* end = nullptr;\n"
                     "    return std::strtol(text, &end, base);\n"
                     "}\n");
    CHECK(touched_set(report) ==
          std::vector<std::string>{"added read_number", "removed parse_digits"});
}

TEST_CASE("check pairs a function that became inactive with its active self", "[check]") {
    TempDir dir;
    const auto report = check_change(dir, "probe.c",
                                     "int probe(int v) { return v * 2 + 1; }\n"
                                     "int keep(int v) { return v; }\n",
                                     "#ifdef WITH_PROBE\n"
                                     "int probe(int v) { return v * 2 + 3; }\n"
                                     "#endif\n"
                                     "int keep(int v) { return v; }\n");
    // Every line of both extents changed and the start line moved: "moved" within the file.
    CHECK(touched_set(report) == std::vector<std::string>{"moved probe"});
    const auto& probe = reported(report, "probe");
    CHECK(probe["head"]["marks"] == nlohmann::json::array({"inactive"}));
    CHECK(probe["base"]["marks"] == nlohmann::json::array());
}
