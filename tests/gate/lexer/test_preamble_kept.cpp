// SPDX-License-Identifier: MIT
// A kept translation unit really reparses with its precompiled preamble: libclang writes the
// preamble to a temporary file ("preamble-*.pch" in TMPDIR) that lives as long as the preamble,
// so the file's name shows whether a reparse kept the preamble or built another. Measured
// against a fresh parse of the same text, with and without the precompiled standard headers.
#include "gate/lexer/file_functions_json.hpp"
#include "gate/lexer/lexer.hpp"
#include "support/fake_forge.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>
#include <set>

using namespace tollgate;
using test::ScopedEnvironment;
using test::TempDir;

namespace {

// The preamble files under `folder` (a parser's private temporary folder), by name.
std::set<std::string> preamble_files(const std::string& folder) {
    std::set<std::string> names;
    for (const auto& entry : std::filesystem::recursive_directory_iterator(folder)) {
        const std::string name = entry.path().filename().string();
        if (name.rfind("preamble-", 0) == 0 && entry.path().extension() == ".pch") {
            names.insert(name);
        }
    }
    return names;
}

// An invented header-only library and a source that includes it and a standard header (whose
// path the parser must resolve through the main file's stand-in, main_file_stand_ins.hpp).
const char* const k_header_v1 = "#pragma once\n"
                                "#include <vector>\n"
                                "namespace grid {\n"
                                "template <typename T> T clamp(T v, T lo, T hi) {\n"
                                "    return v < lo ? lo : v > hi ? hi : v;\n"
                                "}\n"
                                "}\n";
const char* const k_header_v2 = "#pragma once\n"
                                "#include <vector>\n"
                                "namespace grid {\n"
                                "template <typename T> T clamp(T v, T lo, T hi) {\n"
                                "    return v < lo ? lo : v > hi ? hi : v;\n"
                                "}\n"
                                "template <typename T> T square(T v) { return v * v; }\n"
                                "}\n";

std::string source(int scale) {
    return "#include \"grid/cell.hpp\"\n"
           "#include <string>\n"
           "int sweep(const std::vector<int>& cells) {\n"
           "    int total = 0;\n"
           "    for (int c : cells) { total += grid::clamp(c * " +
           std::to_string(scale) +
           ", 0, 99); }\n"
           "    return total;\n"
           "}\n"
           "std::string label(int n) { return std::to_string(n + " +
           std::to_string(scale) + "); }\n";
}

lexer::ParseContext context_with(const std::string& header, const std::string& cache_dir) {
    lexer::ParseContext context;
    context.headers = {{"include/grid/cell.hpp", header}};
    context.include_dirs = {"include"};
    context.cache_dir = cache_dir;
    return context;
}

// The result of a parser that keeps nothing: what every reuse must equal.
nlohmann::json fresh(const SourceFile& file, const lexer::ParseContext& context) {
    lexer::Lexer lexer;
    return lexer::file_functions_to_json(lexer.lex_functions(file, context));
}

} // namespace

TEST_CASE("a kept unit reparses with its preamble until a file of the preamble changes",
          "[lexer][preamble]") {
    TempDir temporary, pch_cache;
    ScopedEnvironment environment;
    environment.set("TMPDIR", temporary.path());
    for (const bool with_pch : {false, true}) {
        DYNAMIC_SECTION((with_pch ? "with" : "without") << " precompiled standard headers") {
            const std::string cache = with_pch ? pch_cache.path() : std::string();
            const lexer::ParseContext first = context_with(k_header_v1, cache);
            lexer::Lexer lexer;
            lexer.keep_preambles(2);

            // The first version is parsed plainly: a path seen once pays for no preamble.
            const SourceFile v1{"src/field.cpp", source(1)};
            const auto r1 = lexer::file_functions_to_json(lexer.lex_functions(v1, first));
            CHECK(preamble_files(temporary.path()).empty());
            CHECK(r1 == fresh(v1, first));
            CHECK(r1["functions"].size() == 2);
            CHECK(r1["warnings"].empty()); // <vector>, <string> and the header were all found

            // The second version builds the preamble.
            const SourceFile v2{"src/field.cpp", source(2)};
            const auto r2 = lexer::file_functions_to_json(lexer.lex_functions(v2, first));
            const auto built = preamble_files(temporary.path());
            REQUIRE(built.size() == 1);
            CHECK(r2 == fresh(v2, first));
            CHECK(r2 != r1);

            // A third version: the same preamble file, so it was kept.
            const SourceFile v3{"src/field.cpp", source(3)};
            const auto r3 = lexer::file_functions_to_json(lexer.lex_functions(v3, first));
            CHECK(preamble_files(temporary.path()) == built);
            CHECK(r3 == fresh(v3, first));

            // The header changes under the same path: the preamble is built anew.
            const lexer::ParseContext second = context_with(k_header_v2, cache);
            const SourceFile v4{"src/field.cpp", source(4)};
            const auto r4 = lexer::file_functions_to_json(lexer.lex_functions(v4, second));
            const auto rebuilt = preamble_files(temporary.path());
            CHECK(rebuilt.size() == 1);
            CHECK(rebuilt != built);
            CHECK(r4 == fresh(v4, second));
        }
    }
}

TEST_CASE("a file whose headers have errors is never reparsed from a preamble",
          "[lexer][preamble]") {
    // A header that does not compile, with a scope its error leaves open: without a preamble the
    // rest of the file parses inside the damage, with one it would parse fresh (a preamble's
    // scopes close at its end), so the two would measure differently. Seen on googletest sources
    // parsed without their build flags.
    TempDir temporary;
    ScopedEnvironment environment;
    environment.set("TMPDIR", temporary.path());
    lexer::ParseContext context;
    context.headers = {{"include/broken.hpp", "#pragma once\nnamespace grid {\nstruct Cell { int "
                                              "v; void put( };\n"}};
    context.include_dirs = {"include"};
    lexer::Lexer lexer;
    lexer.keep_preambles(2);
    for (int version = 1; version <= 3; ++version) {
        const SourceFile file{"src/use.cpp",
                              "#include \"broken.hpp\"\nint twice(int x) { return x * " +
                                  std::to_string(version) + "; }\n"};
        const auto result = lexer::file_functions_to_json(lexer.lex_functions(file, context));
        CHECK(result == fresh(file, context));
        CHECK_FALSE(result["warnings"].empty()); // the header's error is reported
    }
    CHECK(preamble_files(temporary.path()).empty());
}

TEST_CASE("a parser that keeps no units builds no preamble", "[lexer][preamble]") {
    TempDir temporary;
    ScopedEnvironment environment;
    environment.set("TMPDIR", temporary.path());
    lexer::Lexer lexer;
    const lexer::ParseContext context = context_with(k_header_v1, "");
    const auto result = lexer.lex_functions({"src/field.cpp", source(1)}, context);
    CHECK(result.functions.size() == 2);
    CHECK(preamble_files(temporary.path()).empty());
}
