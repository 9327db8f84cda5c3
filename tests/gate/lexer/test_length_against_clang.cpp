// SPDX-License-Identifier: MIT
// Each function's length N checked against clang's own raw lexer (clang-14 -dump-raw-tokens).
#include "lexer_test_support.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <map>
#include <sstream>

using namespace tollgate;

namespace {

struct RawLexerToken {
    std::string kind;
    unsigned line = 0;
    bool start_of_line = false;
};

// Parse clang's `-dump-raw-tokens` output: `kind 'spelling'<TAB>[flags]<TAB>Loc=<file:line:col>`,
// one record per token; a spelling may span lines, so a record ends at its Loc=<...>.
std::vector<RawLexerToken> parse_raw_tokens(const std::string& output) {
    std::vector<RawLexerToken> tokens;
    std::istringstream in(output);
    std::string line;
    std::string record;
    while (std::getline(in, line)) {
        record += record.empty() ? line : "\n" + line;
        const auto loc = record.rfind("\tLoc=<");
        if (loc == std::string::npos || record.back() != '>') {
            continue;
        }
        RawLexerToken token;
        token.kind = record.substr(0, record.find(' '));
        token.start_of_line = record.find("[StartOfLine]", 0) != std::string::npos &&
                              record.find("[StartOfLine]") > record.rfind('\'');
        const std::string location = record.substr(loc + 6, record.size() - loc - 7);
        const auto last = location.rfind(':');
        const auto middle = location.rfind(':', last - 1);
        token.line = static_cast<unsigned>(std::stoul(location.substr(middle + 1, last - middle)));
        tokens.push_back(token);
        record.clear();
    }
    return tokens;
}

// Return the raw tokens of code: no whitespace, no comments, no preprocessor directive lines.
std::vector<RawLexerToken> code_tokens(const std::vector<RawLexerToken>& raw) {
    std::vector<RawLexerToken> code;
    bool in_directive = false;
    for (const auto& token : raw) {
        if (token.kind == "unknown" || token.kind == "eof") {
            continue;
        }
        if (token.start_of_line) {
            in_directive = token.kind == "hash";
        }
        if (in_directive || token.kind == "comment") {
            continue;
        }
        code.push_back(token);
    }
    return code;
}

} // namespace

TEST_CASE("lex_functions length matches clang's raw token count", "[lexer]") {
    // Reference tool: clang's own raw lexer (`clang-14 -cc1 -dump-raw-tokens`).
    const auto probe = test::run_command("/usr/bin/clang-14 --version", ".");
    if (probe.exit_code != 0) {
        WARN("clang-14 is missing (install clang-14): raw token comparison skipped");
        return;
    }
    const std::string folder = std::string(TOLLGATE_FIXTURES_DIR) + "/lexer/";
    const std::vector<std::string> names = {"crc16.c", "ring_buffer.hpp", "ring_buffer_stats.cpp",
                                            "unit_converter.cpp", "low_pass_filter.cpp"};
    std::vector<SourceFile> files;
    for (const auto& name : names) {
        files.push_back({name, test::read_text(folder + name)});
    }
    const lexer::ParseContext context = lexer::make_parse_context(files);
    lexer::Lexer lexer;
    std::size_t compared = 0;
    for (const auto& file : files) {
        CAPTURE(file.path);
        const auto result = lexer.lex_functions(file, context);
        CHECK(result.lexically_recovered == 0);
        CHECK(result.warnings.empty());
        const auto dump = test::run_command("/usr/bin/clang-14 -cc1 -dump-raw-tokens " +
                                                test::shell_quote(folder + file.path) + "",
                                            ".");
        REQUIRE(dump.exit_code == 0);
        // clang prints the raw tokens on standard error.
        const auto raw = code_tokens(parse_raw_tokens(dump.err));
        REQUIRE(raw.size() > 100);
        for (const auto& function : result.functions) {
            CAPTURE(function.qualified_name);
            std::map<std::string, std::size_t> kinds;
            std::size_t total = 0;
            for (const auto& token : raw) {
                if (token.line >= function.start_line && token.line <= function.end_line) {
                    ++kinds[token.kind];
                    ++total;
                }
            }
            // Closing halves of pairs add nothing: ) ] } always, one `:` per `?`, and each `>`
            // or `>>` that closes a template list (the lexer's own "> " and ">>" keys are the
            // comparisons and shifts; every other `>`/`>>` closed a list).
            std::size_t angles_kept = 0;
            for (const auto& token : function.tokens) {
                angles_kept += token.key == ">" || token.key == ">>" ? 1 : 0;
            }
            const std::size_t expected = total - kinds["r_paren"] - kinds["r_square"] -
                                         kinds["r_brace"] - kinds["question"] - kinds["greater"] -
                                         kinds["greatergreater"] + angles_kept;
            CHECK(function.tokens.size() == expected);
            ++compared;
        }
    }
    // 5 + 6 + 4 + 5 + 7 functions in the fixtures.
    CHECK(compared == 27);
}
