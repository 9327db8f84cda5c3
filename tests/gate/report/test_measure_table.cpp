// SPDX-License-Identifier: MIT
// The measure and explain writers with hostile text: JSON stays valid, the terminal gets no
// control character of the source's.
#include "gate/common/text_safety.hpp"
#include "gate/report/measure_table.hpp"
#include "tollgate/core/counts.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <sstream>

using namespace tollgate;

namespace {

const std::string k_fffd = "\xEF\xBF\xBD";

// A function of a Latin-1 file whose string literals hold a Latin-1 byte and an escape sequence.
report::MeasuredFunction hostile_function() {
    report::MeasuredFunction f;
    f.path = "src/caf\xE9\x1b[2J.c";
    f.start_line = 3;
    f.end_line = 9;
    f.name = "greet\x1b]0;title\x07";
    f.signature = "const char \xFF*";
    f.counts.operators["greet"] = {1, "", 0};
    f.counts.operators["("] = {2, "call", 1};
    f.counts.operands["\"caf\xE9\""] = {1, "", 0};
    f.counts.operands["\"\x1b[31m\""] = {2, "", 0};
    f.counts.distinct_operators = 2;
    f.counts.distinct_operands = 2;
    f.counts.total_operators = 3;
    f.counts.total_operands = 3;
    f.measures = core::compute_measures(core::counts_from_totals(2, 2, 3, 3));
    return f;
}

bool has_control_byte(const std::string& text) {
    for (const char c : text) {
        const auto byte = static_cast<unsigned char>(c);
        if ((byte < 0x20 && c != '\n') || byte == 0x7F) {
            return true;
        }
    }
    return false;
}

} // namespace

TEST_CASE("write_measure_json and write_explain_json write hostile text as valid JSON",
          "[report]") {
    const auto f = hostile_function();
    SECTION("measure JSON") {
        std::ostringstream out;
        // Before: type_error 316 at the Latin-1 byte.
        REQUIRE_NOTHROW(
            report::write_measure_json(out, {f}, {{f.path, 4, "bad \xE9"}}, "HEAD", "c-family/1"));
        const auto json = nlohmann::json::parse(out.str());
        CHECK(json["functions"][0]["file"] == "src/caf" + k_fffd + "\x1b[2J.c");
        CHECK(json["functions"][0]["signature"] == "const char " + k_fffd + "*");
        CHECK(json["warnings"][0]["message"] == "bad " + k_fffd);
    }
    SECTION("explain JSON") {
        std::ostringstream out;
        REQUIRE_NOTHROW(report::write_explain_json(out, f, "HEAD", "c-family/1"));
        const auto json = nlohmann::json::parse(out.str());
        std::vector<std::string> operands;
        for (const auto& entry : json["operands"]) {
            operands.push_back(entry["token"]);
        }
        CHECK(operands == std::vector<std::string>{"\"\x1b[31m\"", "\"caf" + k_fffd + "\""});
    }
}

TEST_CASE("write_measure_text and write_explain_text show control characters as escapes",
          "[report]") {
    const auto f = hostile_function();
    SECTION("measure table") {
        std::ostringstream out;
        report::write_measure_text(out, {f}, {{f.path, 4, "bad\nline"}}, report::Columns::essential,
                                   "HEAD");
        INFO(out.str());
        CHECK_FALSE(has_control_byte(out.str()));
        CHECK(out.str().find("src/caf" + k_fffd + "\\x1b[2J.c:3") != std::string::npos);
        CHECK(out.str().find("greet\\x1b]0;title\\x07") != std::string::npos);
        CHECK(out.str().find("bad\\x0aline") != std::string::npos);
    }
    SECTION("explain tables") {
        std::ostringstream out;
        report::write_explain_text(out, f, "HEAD", "c-family/1", 18.0);
        INFO(out.str());
        CHECK_FALSE(has_control_byte(out.str()));
        CHECK(text::is_valid_utf8(out.str()));
        CHECK(out.str().find("\"\\x1b[31m\"") != std::string::npos);
        CHECK(out.str().find("\"caf" + k_fffd + "\"") != std::string::npos);
    }
}
