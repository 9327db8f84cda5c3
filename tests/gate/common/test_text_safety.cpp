// SPDX-License-Identifier: MIT
// The text-safety helpers every writer shares: UTF-8 repair checked against the Unicode
// standard's example and two reference implementations, visible control characters, and the
// Markdown escapes checked by rendering them with cmark-gfm.
#include "gate/common/text_safety.hpp"
#include "support/render_markdown.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <nlohmann/json.hpp>
#include <sstream>

using namespace tollgate;
using tollgate::test::run_command;
using tollgate::test::shell_quote;
using tollgate::test::TempDir;

namespace {

const std::string k_fffd = "\xEF\xBF\xBD";

std::string bytes(std::initializer_list<int> values) {
    std::string out;
    for (const int v : values) {
        out += static_cast<char>(v);
    }
    return out;
}

// Deterministic byte strings rich in the bytes UTF-8 decoding turns on (lead bytes, continuation
// bytes, the edges of table 3-7's ranges), mixed with ASCII.
std::vector<std::string> tricky_strings(std::size_t count) {
    static const int k_bytes[] = {0x41, 0x7F, 0x80, 0x8F, 0x90, 0x9F, 0xA0, 0xBF, 0xC0, 0xC1,
                                  0xC2, 0xDF, 0xE0, 0xE1, 0xEC, 0xED, 0xEE, 0xEF, 0xF0, 0xF1,
                                  0xF3, 0xF4, 0xF5, 0xFF, 0x00, 0x1B, 0x25, 0x7C};
    std::uint32_t state = 12345;
    std::vector<std::string> out;
    for (std::size_t i = 0; i < count; ++i) {
        std::string s;
        const std::size_t length = 1 + i % 9;
        for (std::size_t k = 0; k < length; ++k) {
            state = state * 1103515245u + 12345u;
            s += static_cast<char>(k_bytes[(state >> 16) % std::size(k_bytes)]);
        }
        out.push_back(s);
    }
    return out;
}

std::string hex_of(const std::string& s) {
    std::string out;
    for (const unsigned char c : s) {
        out += fmt::format("{:02x}", c);
    }
    return out;
}

} // namespace

TEST_CASE("to_valid_utf8 replaces maximal ill-formed subparts", "[text]") {
    SECTION("the Unicode standard's example gives its result") {
        // The Unicode Standard 15.0, section 3.9, table 3-8 "U+FFFD for Non-Shortest Form
        // Sequences" (from memory; the same result from Python 3's bytes.decode("utf-8",
        // "replace") was checked by hand): 61 F1 80 80 E1 80 C2 62 80 63 80 BF 64 decodes to
        // 0061 FFFD FFFD FFFD 0062 FFFD 0063 FFFD FFFD 0064.
        const std::string input =
            bytes({0x61, 0xF1, 0x80, 0x80, 0xE1, 0x80, 0xC2, 0x62, 0x80, 0x63, 0x80, 0xBF, 0x64});
        CHECK(text::to_valid_utf8(input) ==
              "a" + k_fffd + k_fffd + k_fffd + "b" + k_fffd + "c" + k_fffd + k_fffd + "d");
    }
    SECTION("well-formed text is kept and ill-formed forms of table 3-7 are refused") {
        CHECK(text::to_valid_utf8("caf\xC3\xA9 \xF0\x9F\x8C\xA1") ==
              "caf\xC3\xA9 \xF0\x9F\x8C\xA1");
        CHECK(text::is_valid_utf8(bytes({0xED, 0x9F, 0xBF})));             // U+D7FF
        CHECK_FALSE(text::is_valid_utf8(bytes({0xED, 0xA0, 0x80})));       // a surrogate
        CHECK_FALSE(text::is_valid_utf8(bytes({0xC0, 0xAF})));             // overlong "/"
        CHECK_FALSE(text::is_valid_utf8(bytes({0xF4, 0x90, 0x80, 0x80}))); // above U+10FFFF
        CHECK_FALSE(text::is_valid_utf8(bytes({0xE2, 0x82})));             // cut short
        CHECK(text::to_valid_utf8("caf\xE9.c") == "caf" + k_fffd + ".c");  // Latin-1 e-acute
    }
    SECTION("nlohmann::json's replace handler writes the same text, so every output agrees") {
        for (const auto& s : tricky_strings(3000)) {
            INFO(hex_of(s));
            const std::string replaced =
                nlohmann::json(s).dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
            CHECK(replaced == nlohmann::json(text::to_valid_utf8(s)).dump());
            CHECK(text::dump_json(nlohmann::json(s), -1) == replaced);
        }
    }
    SECTION("Python's decoder, a reference implementation, agrees on every string") {
        if (run_command("command -v python3", ".").exit_code != 0) {
            WARN("python3 is not installed: the comparison with Python's decoder is skipped");
            return;
        }
        TempDir dir;
        std::string lines;
        const auto strings = tricky_strings(3000);
        for (const auto& s : strings) {
            lines += hex_of(s) + "\n";
        }
        dir.write("in.txt", lines);
        dir.write("decode.py", "import sys\n"
                               "for line in open(sys.argv[1]):\n"
                               "    b = bytes.fromhex(line.strip())\n"
                               "    print(b.decode('utf-8', 'replace').encode('utf-8').hex())\n");
        const auto result = run_command("python3 decode.py in.txt", dir.path());
        REQUIRE(result.exit_code == 0);
        std::istringstream expected(result.out);
        for (const auto& s : strings) {
            std::string line;
            REQUIRE(std::getline(expected, line));
            INFO(hex_of(s));
            CHECK(hex_of(text::to_valid_utf8(s)) == line);
        }
    }
}

TEST_CASE("visible_text writes control characters as escapes", "[text]") {
    SECTION("C0, DEL and C1 controls become \\xHH") {
        CHECK(text::visible_text("a\x1b[31mb") == "a\\x1b[31mb");
        CHECK(text::visible_text("line\nnext\r\t") == "line\\x0anext\\x0d\\x09");
        CHECK(text::visible_text(std::string("nul\0x", 5)) == "nul\\x00x");
        CHECK(text::visible_text("\x7f") == "\\x7f");
        CHECK(text::visible_text("\xC2\x85\xC2\x9B") == "\\x85\\x9b"); // NEL and CSI
    }
    SECTION("bidirectional overrides and line separators become \\uHHHH") {
        CHECK(text::visible_text("a\xE2\x80\xAE"
                                 "b") == "a\\u202eb"); // RIGHT-TO-LEFT OVERRIDE
        CHECK(text::visible_text("\xE2\x81\xA6x\xE2\x81\xA9") == "\\u2066x\\u2069");
        CHECK(text::visible_text("\xE2\x80\xA8") == "\\u2028");
    }
    SECTION("printable text, including non-ASCII, is kept; invalid bytes show as U+FFFD") {
        CHECK(text::visible_text("Kalman::update(double) \xC3\xA9\xE2\x86\x92") ==
              "Kalman::update(double) \xC3\xA9\xE2\x86\x92");
        CHECK(text::visible_text("caf\xE9\x1b") == "caf" + k_fffd + "\\x1b");
    }
}

TEST_CASE("clip cuts at a code point boundary and marks the cut", "[text]") {
    CHECK(text::clip("short", 10) == "short");
    CHECK(text::clip("abcdefghij", 8) == "abcde...");
    CHECK(text::clip("ab\xC3\xA9"
                     "cdef",
                     6) == "ab..."); // never half of the e-acute
    CHECK(text::clip("ab\xC3\xA9"
                     "cdef",
                     7) == "ab\xC3\xA9...");
}

TEST_CASE("markdown_text renders as exactly the text in cmark-gfm", "[text]") {
    // Reference renderer outside the project: Debian's cmark-gfm (GitHub's fork of cmark).
    const std::vector<std::string> hostile = {"a|b",
                                              "x\ny",
                                              "`code`",
                                              "<script>alert(1)</script>",
                                              "&amp; &#60;",
                                              "[link](http://e.x)",
                                              "# heading",
                                              "- item",
                                              "+ item",
                                              "* item",
                                              "1. one",
                                              "12) twelve",
                                              "> quote",
                                              "**bold** __b__",
                                              "_em_ *em*",
                                              "~~struck~~",
                                              "https://evil.example/x",
                                              "www.evil.example",
                                              "WWW.Evil.example",
                                              "a\\|b",
                                              "trailing\\",
                                              "\\",
                                              "$x$",
                                              "![img](x.png)",
                                              "    four spaces",
                                              "  two",
                                              "\x1b[31mred\x1b[0m",
                                              "caf\xE9.c",
                                              "===",
                                              "---",
                                              "<!-- c -->",
                                              "<details>",
                                              "a  b",
                                              "[x]: http://ref",
                                              "src/fusion_filter.cpp:16",
                                              "skyline::FusionFilter::update",
                                              "{curly} ^caret ?q= 'single' \"double\" ;,/%"};
    for (const auto& s : hostile) {
        const std::string escaped = text::markdown_text(s);
        INFO("data: " << s << "\nMarkdown: " << escaped);
        const std::string visible = text::visible_text(s);
        const auto html = test::render_gfm("- " + escaped + "\n\n| h |\n|---|\n| " + escaped +
                                           " |\n\n> " + escaped + "\n");
        if (!html) {
            WARN("cmark-gfm is not installed: the rendering check is skipped");
            return;
        }
        INFO("HTML: " << *html);
        // In a list item, a table cell and a block quote: the text itself, nothing else.
        const auto items = test::between(*html, "<li>", "</li>");
        REQUIRE(items.size() == 1);
        CHECK(items[0] == test::cmark_escaped(visible));
        const auto cells = test::between(*html, "<td>", "</td>");
        REQUIRE(cells.size() == 1);
        CHECK(cells[0] == test::cmark_escaped(visible)); // leading spaces too: "&#32;"
        CHECK(test::between(*html, "<blockquote>\n<p>", "</p>") ==
              std::vector<std::string>{test::cmark_escaped(visible)});
        CHECK(html->find("<a ") == std::string::npos);
    }
}

TEST_CASE("markdown_code renders as one code span holding the text", "[text]") {
    const std::vector<std::string> names = {"operator|",     "operator||",  "a`b",   "``x``",
                                            "`edge",         "edge`",       "a\\|b", " spaced ",
                                            "x\nfake | row", "<b>&amp;</b>"};
    for (const auto& name : names) {
        const std::string inline_span = text::markdown_code(name, text::MarkdownPlace::inline_text);
        const std::string cell_span = text::markdown_code(name, text::MarkdownPlace::table_cell);
        INFO("data: " << name << "\ninline: " << inline_span << "\ncell: " << cell_span);
        const auto html = test::render_gfm("- " + inline_span + "\n\n| h | i |\n|---|---|\n| " +
                                           cell_span + " | end |\n");
        if (!html) {
            WARN("cmark-gfm is not installed: the rendering check is skipped");
            return;
        }
        INFO("HTML: " << *html);
        const std::string expected =
            "<code>" + test::cmark_escaped(text::visible_text(name)) + "</code>";
        CHECK(test::between(*html, "<li>", "</li>") == std::vector<std::string>{expected});
        CHECK(test::between(*html, "<td>", "</td>") == std::vector<std::string>{expected, "end"});
    }
    CHECK(text::markdown_code("", text::MarkdownPlace::inline_text).empty());
}

TEST_CASE("percent_encode and url_text keep URLs whole and lossless", "[text]") {
    SECTION("RFC 3986 unreserved characters stay; every other byte is %XX") {
        CHECK(text::percent_encode("a-b_c.~/d e#1?x|\xE9", "/") == "a-b_c.~/d%20e%231%3Fx%7C%E9");
        CHECK(text::percent_encode("../x") == "..%2Fx");
        CHECK(text::percent_encode("%") == "%25");
    }
    SECTION("url_text encodes what would end a Markdown link destination") {
        CHECK(text::url_text("https://git.example/my repo|x/(a)<b>\"c\"\\`^{}\n") ==
              "https://git.example/my%20repo%7Cx/%28a%29%3Cb%3E%22c%22%5C%60%5E%7B%7D%0A");
        CHECK(text::url_text("https://h.example/a?b=1&c=%41#L3") ==
              "https://h.example/a?b=1&c=%41#L3");
    }
}

TEST_CASE("html_text escapes markup and makes controls visible", "[text]") {
    CHECK(text::html_text("<img src=x onerror='a()'> & \"q\"\x1b") ==
          "&lt;img src=x onerror=&#39;a()&#39;&gt; &amp; &quot;q&quot;\\x1b");
    CHECK(text::html_text("caf\xE9") == "caf" + k_fffd);
}

TEST_CASE("store_bytes and unstore_bytes keep any bytes exactly", "[text]") {
    SECTION("every single byte and every tricky string comes back") {
        for (int b = 0; b < 256; ++b) {
            const std::string s(1, static_cast<char>(b));
            const std::string stored = text::store_bytes(s);
            CHECK(text::is_valid_utf8(stored));
            CHECK(text::unstore_bytes(stored) == s);
        }
        for (const auto& s : tricky_strings(3000)) {
            INFO(hex_of(s));
            const std::string stored = text::store_bytes(s);
            CHECK(text::is_valid_utf8(stored));
            CHECK(text::unstore_bytes(stored) == s);
        }
    }
    SECTION("valid text without % is stored as it is") {
        CHECK(text::store_bytes("skyline::crc16(const uint8_t *)") ==
              "skyline::crc16(const uint8_t *)");
        CHECK(text::store_bytes("caf\xC3\xA9") == "caf\xC3\xA9");
        CHECK(text::store_bytes("\"%d\"") == "\"%25d\"");
        CHECK(text::store_bytes("caf\xE9.c") == "caf%E9.c");
    }
    SECTION("damaged or non-canonical forms are refused") {
        CHECK_FALSE(text::unstore_bytes("50%"));
        CHECK_FALSE(text::unstore_bytes("%G1"));
        CHECK_FALSE(text::unstore_bytes("%4"));
        CHECK_FALSE(text::unstore_bytes("%41")); // "A" is never stored encoded
        CHECK_FALSE(text::unstore_bytes("%e9")); // lowercase hex is not what store_bytes writes
    }
}
