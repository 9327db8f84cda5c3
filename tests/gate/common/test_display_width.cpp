// SPDX-License-Identifier: MIT
// display_width and clip_columns: the columns a terminal gives text, checked against glibc's
// wcwidth() (the reference every terminal program on this system uses) in the C.UTF-8 locale.
#include "gate/common/text_safety.hpp"

#include <catch2/catch.hpp>
#include <clocale>
#include <cwchar>
#include <string>

using namespace tollgate;

namespace {

// `code_point` encoded as UTF-8.
std::string utf8(char32_t code_point) {
    std::string out;
    if (code_point < 0x80) {
        out += static_cast<char>(code_point);
    } else if (code_point < 0x800) {
        out += static_cast<char>(0xC0 | (code_point >> 6));
        out += static_cast<char>(0x80 | (code_point & 0x3F));
    } else if (code_point < 0x10000) {
        out += static_cast<char>(0xE0 | (code_point >> 12));
        out += static_cast<char>(0x80 | ((code_point >> 6) & 0x3F));
        out += static_cast<char>(0x80 | (code_point & 0x3F));
    } else {
        out += static_cast<char>(0xF0 | (code_point >> 18));
        out += static_cast<char>(0x80 | ((code_point >> 12) & 0x3F));
        out += static_cast<char>(0x80 | ((code_point >> 6) & 0x3F));
        out += static_cast<char>(0x80 | (code_point & 0x3F));
    }
    return out;
}

} // namespace

TEST_CASE("display_width counts the columns glibc's wcwidth gives", "[text]") {
    // Reference tool: glibc's wcwidth() under C.UTF-8 (Debian 12's glibc 2.36 builds it in).
    const char* previous = std::setlocale(LC_CTYPE, nullptr);
    const std::string saved = previous != nullptr ? previous : "C";
    if (std::setlocale(LC_CTYPE, "C.UTF-8") == nullptr) {
        WARN("the C.UTF-8 locale is missing: display_width was not compared with wcwidth");
        return;
    }
    // Latin, accents (precomposed and combining), Greek, Cyrillic, Hebrew points, Arabic marks,
    // Devanagari, Thai, Hangul (syllables, leading and medial jamo), CJK ideographs and
    // punctuation, kana, fullwidth forms, zero-width characters, variation selectors, symbols
    // and emoji, supplementary ideographs.
    const char32_t samples[] = {
        0x41,    0x7E,    0xE9,    0x301,   0x36F,   0x3A9,   0x416,  0x5B0,  0x5BF,   0x64B,
        0x915,   0x94D,   0xE01,   0xE31,   0x1100,  0x115F,  0x1160, 0x11A8, 0x1AB0,  0x1DC0,
        0x200B,  0x20D0,  0x2026,  0x2190,  0x231A,  0x26A0,  0x26D4, 0x2713, 0x2E80,  0x3000,
        0x3001,  0x302A,  0x3042,  0x30A2,  0x3099,  0x4E2D,  0x9FFF, 0xA960, 0xAC00,  0xD7A3,
        0xF900,  0xFE0F,  0xFE30,  0xFEFF,  0xFF01,  0xFF21,  0xFF61, 0xFFE0, 0x1F300, 0x1F600,
        0x1F64F, 0x1F680, 0x1F90D, 0x20000, 0x2A6D6, 0xE0100,
    };
    for (const char32_t c : samples) {
        const int expected = ::wcwidth(static_cast<wchar_t>(c));
        INFO("U+" << std::hex << static_cast<unsigned long>(c) << " wcwidth " << std::dec
                  << expected);
        REQUIRE(expected >= 0);
        CHECK(text::display_width(utf8(c)) == static_cast<std::size_t>(expected));
    }
    std::setlocale(LC_CTYPE, saved.c_str());
}

TEST_CASE("display_width of whole texts", "[text]") {
    CHECK(text::display_width("") == 0);
    CHECK(text::display_width("skyline::crc16") == 14);
    CHECK(text::display_width("caf\xC3\xA9") == 4);              // precomposed é
    CHECK(text::display_width("cafe\xCC\x81") == 4);             // e + combining acute
    CHECK(text::display_width("\xE6\xB8\xAC\xE9\x87\x8F") == 4); // two CJK ideographs
    CHECK(text::display_width("caf\xE9") == 4); // an ill-formed byte shows as one U+FFFD
}

TEST_CASE("clip_columns cuts at a code point boundary with an ellipsis", "[text]") {
    const std::string ellipsis = "\xE2\x80\xA6";
    SECTION("text that fits is kept whole") {
        CHECK(text::clip_columns("abc", 3, text::CutEnd::right) == "abc");
        CHECK(text::clip_columns("abc", 10, text::CutEnd::left) == "abc");
    }
    SECTION("the right end is cut, the ellipsis taking one column") {
        CHECK(text::clip_columns("abcdef", 4, text::CutEnd::right) == "abc" + ellipsis);
        CHECK(text::display_width(text::clip_columns("abcdef", 4, text::CutEnd::right)) == 4);
    }
    SECTION("the left end is cut") {
        CHECK(text::clip_columns("abcdef", 4, text::CutEnd::left) == ellipsis + "def");
    }
    SECTION("a wide character that does not fit whole is left out whole") {
        const std::string cjk = "\xE6\xB8\xAC\xE9\x87\x8F\xE5\x80\xBC"; // three ideographs
        const std::string cut = text::clip_columns(cjk, 4, text::CutEnd::right);
        CHECK(cut == "\xE6\xB8\xAC" + ellipsis); // 2 + 1 columns; a second would make 5
        CHECK(text::is_valid_utf8(cut));
    }
    SECTION("a combining mark stays with its letter") {
        CHECK(text::clip_columns("e\xCC\x81xyz", 2, text::CutEnd::right) == "e\xCC\x81" + ellipsis);
        CHECK(text::clip_columns("abe\xCC\x81", 2, text::CutEnd::left) == ellipsis + "e\xCC\x81");
        // A mark whose letter was cut is not left alone at the start.
        CHECK(text::clip_columns("abc\xCC\x81", 1, text::CutEnd::left) == ellipsis);
    }
    SECTION("zero columns give nothing") {
        CHECK(text::clip_columns("abc", 0, text::CutEnd::right).empty());
    }
}
