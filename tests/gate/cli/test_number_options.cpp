// SPDX-License-Identifier: MIT
// The strict readers of numeric command-line values and of sizes.
#include "gate/cli/number_options.hpp"
#include "gate/common/byte_size.hpp"

#include <catch2/catch.hpp>

using tollgate::byte_size_problem;
using tollgate::format_byte_size;
using tollgate::parse_byte_size;
using tollgate::real_number_problem;
using tollgate::whole_number_problem;

TEST_CASE("whole_number_problem", "[cli]") {
    SECTION("decimal digits within the range are accepted, leading zeros too") {
        CHECK(whole_number_problem("0", 0, 1024).empty());
        CHECK(whole_number_problem("1024", 0, 1024).empty());
        CHECK(whole_number_problem("007", 0, 1024).empty());
    }
    SECTION("anything but digits is not a whole number") {
        for (const char* text : {"", "1.5", "1e3", "0x10", "+3", " 3", "3 ", "abc", "-"}) {
            INFO(text);
            CHECK(whole_number_problem(text, 0, 1024) ==
                  "\"" + std::string(text) + "\" is not a whole number (give one from 0 to 1024)");
        }
    }
    SECTION("negative, too large or past 64 bits is out of range") {
        for (const char* text : {"-1", "-0", "1025", "18446744073709551615", "18446744073709551616",
                                 "99999999999999999999999"}) {
            INFO(text);
            CHECK(whole_number_problem(text, 0, 1024) ==
                  "\"" + std::string(text) +
                      "\" is out of range (give a whole number from 0 to 1024)");
        }
        CHECK(whole_number_problem("0", 1, 9) ==
              "\"0\" is out of range (give a whole number from 1 to 9)");
    }
}

TEST_CASE("real_number_problem", "[cli]") {
    SECTION("finite decimals within the range are accepted") {
        for (const char* text : {"18", "1", "100", "18.5", "1e1", ".5e1", "+20", "100.0"}) {
            INFO(text);
            CHECK(real_number_problem(text, 1, 100).empty());
        }
    }
    SECTION("nan and infinities are not finite") {
        for (const char* text : {"nan", "NaN", "-nan", "nan(0x1)", "inf", "-inf", "Infinity"}) {
            INFO(text);
            CHECK(real_number_problem(text, 1, 100) ==
                  "\"" + std::string(text) + "\" is not a finite number (give one from 1 to 100)");
        }
    }
    SECTION("hexadecimal, blanks and words are not numbers") {
        for (const char* text : {"0x12", " 18", "18 ", "1,5", "abc", "", "1e", "e5"}) {
            INFO(text);
            CHECK(real_number_problem(text, 1, 100) ==
                  "\"" + std::string(text) + "\" is not a number (give one from 1 to 100)");
        }
    }
    SECTION("outside the range, or past what a double holds, is out of range") {
        for (const char* text : {"0.5", "100.01", "-18", "1e400", "-1e400"}) {
            INFO(text);
            CHECK(real_number_problem(text, 1, 100) ==
                  "\"" + std::string(text) + "\" is out of range (give a number from 1 to 100)");
        }
        CHECK(real_number_problem("1e-400", 0, 100).empty()); // below precision: reads as 0
    }
}

TEST_CASE("parse_byte_size and byte_size_problem", "[cli]") {
    SECTION("bytes and binary multiples") {
        CHECK(parse_byte_size("0") == 0u);
        CHECK(parse_byte_size("512") == 512u);
        CHECK(parse_byte_size("1K") == 1024u);
        CHECK(parse_byte_size("16m") == 16u * 1024 * 1024);
        CHECK(parse_byte_size("2G") == 2ull * 1024 * 1024 * 1024);
        CHECK(parse_byte_size("18446744073709551615") == 18446744073709551615ull);
    }
    SECTION("other text and sizes past 64 bits are not sizes") {
        for (const char* text : {"", "K", "1.5M", "16MB", "16 M", "-1", "8Q", "0x10",
                                 "18446744073709551616", "17179869184G"}) {
            INFO(text);
            CHECK_FALSE(parse_byte_size(text).has_value());
        }
    }
    SECTION("the problem says which") {
        CHECK(byte_size_problem("16M", 1ull << 40).empty());
        CHECK(byte_size_problem("8Q", 1ull << 40) ==
              "\"8Q\" is not a size (give bytes, or a number followed by K, M or G, e.g. \"16M\")");
        CHECK(byte_size_problem("2000G", 1ull << 40) ==
              "\"2000G\" is out of range (give a size up to 1 TiB)");
        CHECK(byte_size_problem("17179869184G", 1ull << 40) ==
              "\"17179869184G\" is out of range (give a size up to 1 TiB)");
    }
}

TEST_CASE("format_byte_size", "[cli]") {
    CHECK(format_byte_size(0) == "0 B");
    CHECK(format_byte_size(1023) == "1023 B");
    CHECK(format_byte_size(1024) == "1 KiB");
    CHECK(format_byte_size(2000) == "1.9 KiB");
    CHECK(format_byte_size(16u << 20) == "16 MiB");
    // One byte over a limit never prints as the limit itself.
    CHECK(format_byte_size((16u << 20) + 1) == "16.0 MiB");
    CHECK(format_byte_size(8ull << 30) == "8 GiB");
    CHECK(format_byte_size(18446744073709551615ull) == "15.9 EiB");
}
