// SPDX-License-Identifier: MIT
// The precompiled standard headers: same results with and without, built once, reused.
#include "gate/lexer/pch_cache.hpp"
#include "lexer_test_support.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>

using namespace tollgate;

TEST_CASE("lex_functions gives the same results with precompiled headers", "[lexer]") {
    // common practice, no source: a precompiled header must not change what is parsed.
    const std::string folder = std::string(TOLLGATE_FIXTURES_DIR) + "/lexer/";
    std::vector<SourceFile> files;
    for (const char* name : {"crc16.c", "ring_buffer.hpp", "ring_buffer_stats.cpp",
                             "unit_converter.cpp", "low_pass_filter.cpp"}) {
        files.push_back({name, test::read_text(folder + name)});
    }
    test::TempDir cache;
    lexer::ParseContext without = lexer::make_parse_context(files);
    lexer::ParseContext with = without;
    with.cache_dir = cache.path() + "/pch";

    const unsigned builds_before = lexer::precompiled_header_builds();
    lexer::Lexer first;
    for (const auto& file : files) {
        CAPTURE(file.path);
        const auto plain = first.lex_functions(file, without);
        const auto precompiled = first.lex_functions(file, with);
        CHECK(precompiled.functions == plain.functions);
        CHECK(precompiled.warnings.size() == plain.warnings.size());
        CHECK_FALSE(plain.functions.empty());
    }
    // One header for C, one for C++.
    CHECK(lexer::precompiled_header_builds() == builds_before + 2);
    std::vector<std::filesystem::path> made;
    for (const auto& entry : std::filesystem::directory_iterator(with.cache_dir)) {
        if (entry.path().extension() == ".pch") {
            made.push_back(entry.path());
        }
        CHECK(entry.path().string().find(".tmp.") == std::string::npos);
    }
    REQUIRE(made.size() == 2);
    const auto written = std::filesystem::last_write_time(made[0]);

    SECTION("a second lexer in the same cache folder reuses the header") {
        lexer::Lexer second;
        const auto result = second.lex_functions(files[3], with);
        CHECK_FALSE(result.functions.empty());
        CHECK(lexer::precompiled_header_builds() == builds_before + 2);
        CHECK(std::filesystem::last_write_time(made[0]) == written);
    }
    SECTION("an empty cache folder disables the header") {
        CHECK(lexer::precompiled_header({"-x", "c++", "-std=c++17"}, "").empty());
    }
}
