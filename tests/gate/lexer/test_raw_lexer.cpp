// SPDX-License-Identifier: MIT
// The raw lexer of the lexical fallback against clang's own lexer (libclang's clang_tokenize on
// the same bytes), token by token: kind, spelling, offset and line.
#include "gate/lexer/raw_lexer.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <clang-c/Index.h>
#include <sstream>

using namespace tollgate;

namespace {

std::string describe(const lexer::SourceToken& token) {
    static const char* kinds[] = {"keyword", "punctuation", "identifier", "literal"};
    std::ostringstream out;
    out << kinds[static_cast<int>(token.kind)] << " '" << token.spelling << "' @" << token.offset
        << " line " << token.line;
    return out.str();
}

// The code tokens clang's lexer finds in `content` (as `language`), with comments dropped and
// directive lines left out as the lexer does it: a `#` first on its line starts a directive,
// which runs to the end of the line and over backslash continuations.
std::vector<std::string> clang_tokens(const std::string& content, lexer::Language language) {
    const bool c = language == lexer::Language::c;
    const char* path = c ? "/reference/file.c" : "/reference/file.cpp";
    const char* args[] = {"-x", c ? "c" : "c++", c ? "-std=gnu11" : "-std=c++17", "-w"};
    CXUnsavedFile unsaved{path, content.data(), static_cast<unsigned long>(content.size())};
    CXIndex index = clang_createIndex(0, 0);
    CXTranslationUnit unit = nullptr;
    REQUIRE(clang_parseTranslationUnit2(index, path, args, 4, &unsaved, 1,
                                        CXTranslationUnit_Incomplete, &unit) == CXError_Success);
    CXFile file = clang_getFile(unit, path);
    CXSourceRange whole = clang_getRange(
        clang_getLocationForOffset(unit, file, 0),
        clang_getLocationForOffset(unit, file, static_cast<unsigned>(content.size())));
    CXToken* tokens = nullptr;
    unsigned count = 0;
    clang_tokenize(unit, whole, &tokens, &count);
    std::vector<std::string> result;
    unsigned previous_line = 0;
    unsigned directive_end = 0;
    auto continues = [&](unsigned line) {
        // Does line `line` (1-based) end with a backslash?
        std::size_t start = 0;
        for (unsigned l = 1; l < line && start != std::string::npos; ++l) {
            start = content.find('\n', start);
            start = start == std::string::npos ? start : start + 1;
        }
        if (start == std::string::npos) {
            return false;
        }
        std::size_t end = content.find('\n', start);
        if (end == std::string::npos) {
            return false;
        }
        while (end > start && content[end - 1] == '\r') {
            --end;
        }
        return end > start && content[end - 1] == '\\';
    };
    for (unsigned i = 0; i < count; ++i) {
        const CXTokenKind kind = clang_getTokenKind(tokens[i]);
        if (kind == CXToken_Comment) {
            continue;
        }
        const CXSourceRange extent = clang_getTokenExtent(unit, tokens[i]);
        unsigned begin = 0;
        unsigned end = 0;
        unsigned line = 0;
        clang_getSpellingLocation(clang_getRangeStart(extent), nullptr, &line, nullptr, &begin);
        clang_getSpellingLocation(clang_getRangeEnd(extent), nullptr, nullptr, nullptr, &end);
        if (line <= directive_end) {
            continue;
        }
        if (kind == CXToken_Punctuation && line != previous_line && end == begin + 1 &&
            content[begin] == '#') {
            directive_end = line;
            while (continues(directive_end)) {
                ++directive_end;
            }
            previous_line = line;
            continue;
        }
        previous_line = line;
        lexer::SourceToken token;
        token.kind = kind == CXToken_Keyword      ? core::LexKind::keyword
                     : kind == CXToken_Identifier ? core::LexKind::identifier
                     : kind == CXToken_Literal    ? core::LexKind::literal
                                                  : core::LexKind::punctuation;
        token.spelling = content.substr(begin, end - begin);
        token.offset = begin;
        token.line = line;
        result.push_back(describe(token));
    }
    clang_disposeTokens(unit, tokens, count);
    clang_disposeTranslationUnit(unit);
    clang_disposeIndex(index);
    return result;
}

std::vector<std::string> raw_tokens(const std::string& content, lexer::Language language) {
    std::vector<std::string> result;
    for (const auto& token : lexer::tokenize_raw(content, language).tokens) {
        result.push_back(describe(token));
    }
    return result;
}

// Compare token by token so a failure names the first difference.
void check_same_tokens(const std::string& content, lexer::Language language) {
    const auto expected = clang_tokens(content, language);
    const auto actual = raw_tokens(content, language);
    REQUIRE(expected.size() > 20);
    const std::size_t common = std::min(expected.size(), actual.size());
    for (std::size_t i = 0; i < common; ++i) {
        INFO("token " << i);
        REQUIRE(actual[i] == expected[i]);
    }
    CHECK(actual.size() == expected.size());
}

// Every tricky spelling the fallback must read as clang does (invented lines).
const char* const k_tricky_cxx = R"cxx(#include <vector>
#define SUM(a, b) \
    ((a) + (b))
/* a block
   comment */ int x = 1; // a line comment \
   continued on the next line
auto s = R"delim(raw ) " text)delim";
auto u = u8"utf8" U"wide" L'w' u'c' U'C' u8'a';
int n = 1'000'000 + 0x1.8p+3 + 1e-5 + .5f + 0b1010 + 42ull + 1.e3;
bool t = a and b or not c bitand d xor_eq e;
int g[2] = <% 1, 2 %>; int h <: 2 :> ; %: define DIGRAPH
auto l = "text"_suffix + 12_km + 'c'_ch;
template <class T> void f(std::vector<std::vector<T>> v) { a<::b>c; }
void m() { x->*y; x.*y; a <=> b; a <<= 2; a >>= 3; a ... b; p->q; ::r; ++i--; }
int \u00e9t\u00e9 = 3; int caf\u00E9 = 4;
int spl\
iced = 5;
char e = ''; char q = '\'';
const char* unterminated = "open
char o = 'x
$ident @ ` \ end
#if 0
int hidden;
#else
int shown;
#endif
)cxx";

const char* const k_tricky_c = R"c(#include <stdio.h>
typedef struct { int a; } pair;
static inline int restrict_it(int *restrict p) { return typeof(*p)(1) + _Alignof(int); }
int class = 1, bool = 2, true = 3; /* C keywords only */
int main(void) { return a::b + u8"x"[0] + L'y' + 0x10p-1; }
)c";

} // namespace

TEST_CASE("tokenize_raw matches clang's lexer", "[lexer]") {
    // Reference tool: libclang 14's clang_tokenize, which runs clang's own lexer on the file.
    SECTION("on the lexer fixtures") {
        const std::string folder = std::string(TOLLGATE_FIXTURES_DIR) + "/lexer/";
        for (const std::string name : {"crc16.c", "ring_buffer.hpp", "ring_buffer_stats.cpp",
                                       "unit_converter.cpp", "low_pass_filter.cpp"}) {
            INFO(name);
            const auto language = name.back() == 'c' ? lexer::Language::c : lexer::Language::cxx;
            check_same_tokens(test::read_text(folder + name), language);
        }
    }
    SECTION("on literals, digraphs, alternative tokens, splices and stray characters in C++") {
        check_same_tokens(k_tricky_cxx, lexer::Language::cxx);
    }
    SECTION("on C's own keywords and literals") {
        check_same_tokens(k_tricky_c, lexer::Language::c);
    }
    SECTION("directive lines are recorded, not returned") {
        const auto raw =
            lexer::tokenize_raw("#if X\nint a;\n#else\nint b;\n#endif\n", lexer::Language::cxx);
        CHECK(raw.tokens.size() == 6);
        REQUIRE(raw.directives.size() == 3);
        CHECK(raw.directives[0].kind == lexer::DirectiveKind::open_condition);
        CHECK(raw.directives[1].kind == lexer::DirectiveKind::alternative);
        CHECK(raw.directives[1].before == 3);
        CHECK(raw.directives[2].kind == lexer::DirectiveKind::close_condition);
    }
    SECTION("the lexer stops at its token limit and says so") {
        const auto cut =
            lexer::tokenize_raw("int a = b + c + d + e + f;\n", lexer::Language::cxx, 5);
        CHECK(cut.tokens.size() == 5);
        CHECK_FALSE(cut.complete);
        CHECK(lexer::tokenize_raw("int a;\n", lexer::Language::cxx, 5).complete);
    }
    SECTION("a megabyte of one expression is read in one pass") {
        std::string line = "int f(int a) { return ";
        for (int i = 0; i < 250000; ++i) {
            line += "a+";
        }
        line += "a; }\n";
        CHECK(lexer::tokenize_raw(line, lexer::Language::cxx).tokens.size() == 500011);
    }
}
