// SPDX-License-Identifier: MIT
// Shared headers: which leading #include lines are precompiled ahead of a file, what keys them,
// and that parsing after them gives what a plain parse gives.
#include "gate/lexer/lexer.hpp"
#include "gate/lexer/shared_headers.hpp"
#include "lexer_test_support.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>

using namespace tollgate;

namespace {

const std::string k_big = "#pragma once\n#include \"lib/detail.hpp\"\ntemplate <class T> struct "
                          "Big { T value; };\n";
const std::string k_detail = "#ifndef LIB_DETAIL_HPP\n#define LIB_DETAIL_HPP\nint "
                             "detail_helper(int);\n#endif\n";
const std::string k_own = "#pragma once\nint meter_reading(int);\n";
const std::string k_source = "// Meter readings.\n#include \"meter.hpp\"\n\n#include "
                             "\"lib/big.hpp\"\n#include <vector>\n\nint meter_reading(int raw) "
                             "{\n    Big<int> big{raw};\n    return big.value + 1;\n}\n";

std::vector<SourceFile> headers(const std::string& detail = k_detail) {
    return {{"include/lib/big.hpp", k_big},
            {"include/lib/detail.hpp", detail},
            {"src/meter.hpp", k_own},
            {"src/unrelated.hpp", "#pragma once\nint unrelated();\n"}};
}

} // namespace

TEST_CASE("shared_includes takes the leading includes but the file's own header",
          "[lexer][shared]") {
    const auto shared = lexer::shared_includes({"src/meter.cpp", k_source}, headers());
    REQUIRE(shared);
    CHECK(shared->lines ==
          std::vector<std::string>{"#include \"lib/big.hpp\"", "#include <vector>"});
}

TEST_CASE("shared_includes stops at the first directive or code that is not an include",
          "[lexer][shared]") {
    const std::string source = "#include \"lib/big.hpp\"\n#define METER_SCALE 3\n#include "
                               "<vector>\nint f() { return METER_SCALE; }\n";
    const auto shared = lexer::shared_includes({"src/scale.cpp", source}, headers());
    REQUIRE(shared);
    CHECK(shared->lines == std::vector<std::string>{"#include \"lib/big.hpp\""});
    // Nothing to share: a define first, or no include at all.
    CHECK_FALSE(
        lexer::shared_includes({"src/a.cpp", "#define X 1\n#include <vector>\n"}, headers()));
    CHECK_FALSE(lexer::shared_includes({"src/b.cpp", "int b() { return 1; }\n"}, headers()));
    // A carriage return inside a line may end it for the compiler: the run stops before it.
    const auto returned = lexer::shared_includes(
        {"src/d.cpp", "#include <vector>\n#include <map> // x\r#define Y 1\n"}, headers());
    REQUIRE(returned);
    CHECK(returned->lines == std::vector<std::string>{"#include <vector>"});
    // An include of a macro is a doubt: the run stops before it.
    CHECK_FALSE(lexer::shared_includes({"src/c.cpp", "#include HEADER_OF_C\n"}, headers()));
}

TEST_CASE("shared_includes refuses when moving the own header or including twice could change "
          "the parse",
          "[lexer][shared]") {
    // The own header defines a macro the later headers might test.
    auto with_macro = headers();
    with_macro[2].content = "#pragma once\n#define METER_WIDE 1\nint meter_reading(int);\n";
    CHECK_FALSE(lexer::shared_includes({"src/meter.cpp", k_source}, with_macro));
    // A header without a guard would be read twice (in the precompiled header, then again).
    auto unguarded = headers();
    unguarded[0].content = "template <class T> struct Big { T value; };\n";
    CHECK_FALSE(lexer::shared_includes({"src/meter.cpp", k_source}, unguarded));
    // A guard by #ifndef/#define counts, and so does #if !defined(X).
    auto if_defined = headers();
    if_defined[0].content = "#if !defined(BIG_HPP)\n#define BIG_HPP\nstruct Big {};\n#endif\n";
    CHECK(lexer::shared_includes({"src/meter.cpp", k_source}, if_defined));
}

TEST_CASE("the shared digest follows every header the includes may reach, and only those",
          "[lexer][shared]") {
    const auto base = lexer::shared_includes({"src/meter.cpp", k_source}, headers());
    REQUIRE(base);
    // A header reached through lib/big.hpp changed: another precompiled header.
    const auto detail_changed = lexer::shared_includes(
        {"src/meter.cpp", k_source},
        headers("#ifndef LIB_DETAIL_HPP\n#define LIB_DETAIL_HPP\nlong detail_helper(long);\n"
                "#endif\n"));
    REQUIRE(detail_changed);
    CHECK(detail_changed->digest != base->digest);
    // The file's own header and an unrelated one changed: the same.
    auto own_changed = headers();
    own_changed[2].content = "#pragma once\nint meter_reading(int);\nint meter_zero();\n";
    own_changed[3].content = "#pragma once\nint unrelated(int);\n";
    const auto same = lexer::shared_includes({"src/meter.cpp", k_source}, own_changed);
    REQUIRE(same);
    CHECK(same->digest == base->digest);
    // A reachable header that includes a macro may reach anything: every header counts.
    auto by_macro = headers("#pragma once\n#include DETAIL_IMPL\n");
    const auto wide = lexer::shared_includes({"src/meter.cpp", k_source}, by_macro);
    REQUIRE(wide);
    by_macro[3].content = "#pragma once\nint unrelated(int);\n";
    const auto wide_changed = lexer::shared_includes({"src/meter.cpp", k_source}, by_macro);
    REQUIRE(wide_changed);
    CHECK(wide_changed->digest != wide->digest);
}

// A plain lexer and one with shared headers, over one revision.
struct SideBySide {
    test::TempDir cache;
    test::TempDir folder;
    lexer::ParseContext context;
    lexer::Lexer plain;
    lexer::Lexer shared;

    explicit SideBySide(const std::vector<SourceFile>& files)
        : context(lexer::make_parse_context(files)) {
        context.cache_dir = cache.path() + "/pch";
        shared.share_headers(folder.path());
    }

    // Lex `file` both ways; the results must agree.
    void compare(const SourceFile& file) {
        const auto expected = plain.lex_functions(file, context);
        const auto got = shared.lex_functions(file, context);
        REQUIRE_FALSE(expected.functions.empty());
        CHECK(got.functions == expected.functions);
        CHECK(got.warnings.size() == expected.warnings.size());
    }

    // How many shared headers were precompiled.
    std::size_t built() const {
        std::size_t count = 0;
        for (const auto& entry : std::filesystem::directory_iterator(folder.path())) {
            const std::string name = entry.path().filename().string();
            count += name.rfind("tollgate-shared-", 0) == 0 && entry.path().extension() == ".pch";
        }
        return count;
    }
};

TEST_CASE("lex_functions gives the same results after precompiled shared headers",
          "[lexer][shared]") {
    // common practice, no source: a precompiled header must not change what is parsed.
    std::vector<SourceFile> files = headers();
    files.push_back({"src/meter.cpp", k_source});
    const std::string second_source =
        "#include \"meter.hpp\"\n#include \"lib/big.hpp\"\n#include <vector>\n\nint "
        "meter_total(const std::vector<int>& raw) {\n    Big<long> sum{0};\n    for (int r : raw) "
        "{ sum.value += meter_reading(r); }\n    return static_cast<int>(sum.value);\n}\n";
    SideBySide lexers(files);
    for (const std::string& source : {k_source, second_source, k_source}) {
        lexers.compare({"src/meter.cpp", source});
    }
    // Asked for three times with the same headers: built once, on the third.
    CHECK(lexers.built() == 1);
}

TEST_CASE("shared headers with an error are not precompiled and the file parses as before",
          "[lexer][shared]") {
    std::vector<SourceFile> files = headers();
    files[0].content = "#pragma once\nstruct Big { int value; } // the semicolon is missing\n";
    files.push_back({"src/meter.cpp", k_source});
    SideBySide lexers(files);
    for (int round = 0; round < 3; ++round) {
        lexers.compare(files.back());
    }
    CHECK(lexers.built() == 0);
}
