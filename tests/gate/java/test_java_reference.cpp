// SPDX-License-Identifier: MIT
// The Java front end against the JDK's own compiler: N of every function of the Java fixtures
// equals the token count of javac's scanner, reduced by java/1's pair rules.
#include "gate/java/java_front_end.hpp"
#include "gate/java/java_lexical.hpp"
#include "support/temp_repo.hpp"
#include "tollgate/core/counts.hpp"

#include <catch2/catch.hpp>
#include <sstream>

#if TOLLGATE_JAVA_ENABLED

using namespace tollgate;

namespace {

struct Reference {
    unsigned start_line = 0;
    unsigned end_line = 0;
    std::uint64_t length = 0;
};

const std::vector<std::string> k_fixtures = {"TelemetryDecoder.java", "StationRegistry.java",
                                             "FrameArchive.java"};

// Run tests/java/TokenCount.java (the JDK's scanner and tree API) over the fixtures.
std::map<std::string, std::vector<Reference>> run_reference(const std::string& folder) {
    std::string command =
        "java --add-exports jdk.compiler/com.sun.tools.javac.parser=ALL-UNNAMED "
        "--add-exports jdk.compiler/com.sun.tools.javac.util=ALL-UNNAMED " +
        test::shell_quote(std::string(TOLLGATE_SOURCE_DIR) + "/tests/java/TokenCount.java");
    for (const auto& name : k_fixtures) {
        command += " " + name;
    }
    const auto run = test::run_command(command, folder);
    INFO(run.err);
    REQUIRE(run.exit_code == 0); // needs a JDK: default-jdk-headless (.ci/build installs it)
    std::map<std::string, std::vector<Reference>> result;
    std::istringstream lines(run.out);
    std::string file;
    Reference reference;
    while (lines >> file >> reference.start_line >> reference.end_line >> reference.length) {
        result[file].push_back(reference);
    }
    return result;
}

// Return "operator KEY" / "operand KEY" -> count for `tokens`.
std::map<std::string, std::uint64_t> key_counts(const core::TokenList& tokens) {
    std::map<std::string, std::uint64_t> counts;
    for (const auto& token : tokens) {
        ++counts[(token.role == core::Role::operator_token ? "operator " : "operand ") + token.key];
    }
    return counts;
}

std::uint64_t length_of(const core::TokenList& tokens) {
    const core::Counts counts = core::count_tokens(tokens);
    return counts.total_operators + counts.total_operands;
}

} // namespace

TEST_CASE("lex_java_file length matches the JDK's token count", "[java]") {
    // Reference tool: the JDK's own compiler (OpenJDK 17's com.sun.tools.javac.parser scanner
    // and com.sun.source tree positions), run by tests/java/TokenCount.java.
    const std::string folder = std::string(TOLLGATE_FIXTURES_DIR) + "/java";
    const auto reference = run_reference(folder);
    for (const auto& name : k_fixtures) {
        CAPTURE(name);
        const SourceFile file{name, test::read_text(folder + "/" + name)};
        const auto& expected = reference.at(name);
        REQUIRE(expected.size() >= 3);

        // The syntax tree path finds the same functions with the same length.
        const auto result = java::lex_java_file(file, {});
        CHECK(result.warnings.empty());
        CHECK(result.lexically_recovered == 0);
        REQUIRE(result.functions.size() == expected.size());
        for (std::size_t i = 0; i < expected.size(); ++i) {
            const auto& function = result.functions[i];
            CAPTURE(function.qualified_name);
            CHECK(function.mode == lexer::ExtentMode::syntax_tree);
            CHECK(function.start_line == expected[i].start_line);
            CHECK(function.end_line == expected[i].end_line);
            CHECK(length_of(function.tokens) == expected[i].length);
        }

        // So does the lexical path, which measures what the tree cannot.
        auto found = java::measure_lexically(java::scan_java(file.content), {});
        std::sort(found.begin(), found.end(),
                  [](const auto& a, const auto& b) { return a.first_offset < b.first_offset; });
        std::string names;
        for (const auto& f : found) {
            names += f.span.qualified_name + " ";
        }
        INFO(names);
        REQUIRE(found.size() == expected.size());
        for (std::size_t i = 0; i < expected.size(); ++i) {
            CAPTURE(found[i].span.qualified_name);
            CHECK(found[i].span.start_line == expected[i].start_line);
            CHECK(found[i].span.end_line == expected[i].end_line);
            CHECK(length_of(found[i].span.tokens) == expected[i].length);
            // On valid code the lexical path also gives the tree's tables, key by key.
            REQUIRE(i < result.functions.size());
            CHECK(key_counts(found[i].span.tokens) == key_counts(result.functions[i].tokens));
        }
    }
}

TEST_CASE("lex_java_file names functions by package, enclosing types, name and parameters",
          "[java]") {
    const std::string folder = std::string(TOLLGATE_FIXTURES_DIR) + "/java";
    const SourceFile file{"TelemetryDecoder.java",
                          test::read_text(folder + "/TelemetryDecoder.java")};
    const auto tree = java::lex_java_file(file, {});
    lexer::FileFunctions lexical;
    java::finish_functions(java::measure_lexically(java::scan_java(file.content), {}), file.path,
                           lexical);
    std::vector<std::string> keys;
    for (const auto& function : tree.functions) {
        keys.push_back(function.fallback_key);
    }
    CHECK(keys == std::vector<std::string>{
                      "com.skyline.ground.TelemetryDecoder.(static initializer)()#0",
                      "com.skyline.ground.TelemetryDecoder.Reading.Reading(long, double, double, "
                      "int)#0",
                      "com.skyline.ground.TelemetryDecoder.Reading.fahrenheit()#0",
                      "com.skyline.ground.TelemetryDecoder.TelemetryDecoder()#0",
                      "com.skyline.ground.TelemetryDecoder.crc16(byte[], int, int)#0",
                      "com.skyline.ground.TelemetryDecoder.decode(byte[])#0",
                      "com.skyline.ground.TelemetryDecoder.rejected()#0",
                      "com.skyline.ground.TelemetryDecoder.decodeAll(List<byte[]>)#0",
                      "com.skyline.ground.TelemetryDecoder.Reassembler.push(byte[], int...)#0",
                  });
    SECTION("the lexical path gives the same identities, so base and head pair across paths") {
        REQUIRE(lexical.functions.size() == tree.functions.size());
        for (std::size_t i = 0; i < keys.size(); ++i) {
            CHECK(lexical.functions[i].fallback_key == keys[i]);
            CHECK(lexical.functions[i].potential_operands == tree.functions[i].potential_operands);
        }
    }
    SECTION("n2* counts parameters and a non-void result") {
        CHECK(tree.functions[4].potential_operands == 4); // crc16(byte[], int, int) -> int
        CHECK(tree.functions[3].potential_operands == 0); // constructor
        CHECK(tree.functions[1].potential_operands == 4); // compact constructor: 4 components
    }
}

#endif
