// SPDX-License-Identifier: MIT
// Replays the kept inputs of the Java front end's fuzzer (tests/fuzz/regressions/java/) through
// the fuzzer's own harness.
#include "fuzz/java_check.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>

#if TOLLGATE_JAVA_ENABLED

namespace fs = std::filesystem;

TEST_CASE("lex_java_file keeps its promises on the kept fuzz inputs", "[java]") {
    const fs::path folder =
        fs::path(TOLLGATE_SOURCE_DIR) / "tests" / "fuzz" / "regressions" / "java";
    std::size_t replayed = 0;
    for (const auto& entry : fs::directory_iterator(folder)) {
        if (entry.path().filename() == "README.md") {
            continue;
        }
        CAPTURE(entry.path().filename().string());
        const std::string bytes = tollgate::test::read_text(entry.path().string());
        CHECK(tollgate::fuzz::check_java_input(reinterpret_cast<const std::uint8_t*>(bytes.data()),
                                               bytes.size()) == "");
        ++replayed;
    }
    CHECK(replayed >= 4);
}

TEST_CASE("check_java_input reports a broken promise", "[java]") {
    // The harness must be able to fail: a function whose lines run backwards is caught.
    tollgate::lexer::FileFunctions file;
    file.functions.emplace_back();
    file.functions.back().start_line = 5;
    file.functions.back().end_line = 2;
    CHECK(tollgate::fuzz::check_java_functions(file, 10) ==
          "a function's lines are out of order or outside the file");
}

#endif
