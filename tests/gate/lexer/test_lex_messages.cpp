// SPDX-License-Identifier: MIT
// The parser-process messages: every field survives a round trip, any bytes included, and a
// damaged message is refused instead of read.
#include "gate/lexer/lex_messages.hpp"

#include <catch2/catch.hpp>

using namespace tollgate;

namespace {

lexer::FileFunctions sample_functions() {
    lexer::FileFunctions file;
    file.path = std::string("src/\xff\x00name.cpp", 14);
    lexer::FunctionSpan span;
    span.usr = "c:@F@f#I#";
    span.fallback_key = "f(int)#0";
    span.qualified_name = "ns::f";
    span.signature = "int";
    span.path = file.path;
    span.start_line = 3;
    span.end_line = 4000000000u;
    span.mode = lexer::ExtentMode::parser_stopped;
    span.potential_operands = 1ull << 40;
    span.token_hash = "0123456789abcdef";
    for (int i = 0; i < 3; ++i) {
        core::Token token;
        token.key = i == 2 ? std::string("\x00\x01", 2) : "-";
        token.spelling = "-";
        token.role = i == 1 ? core::Role::operand_token : core::Role::operator_token;
        token.form = i == 0 ? "unary minus" : "";
        token.basis = i == 0 ? core::Basis::lexical : core::Basis::syntax_tree;
        token.line = 3 + static_cast<unsigned>(i);
        span.tokens.push_back(token);
    }
    file.functions = {span, span};
    file.warnings = {{file.path, 7, "include \"x\" not found"}};
    file.lexically_recovered = 2;
    file.parser_stop = lexer::ParserStop::out_of_memory;
    return file;
}

} // namespace

TEST_CASE("lexer messages", "[lexer]") {
    SECTION("a result comes back equal, bytes and enumerations included") {
        const auto sent = sample_functions();
        const auto reply = lexer::decode_reply(lexer::encode_result(sent));
        REQUIRE(reply.kind == lexer::WorkerReply::Kind::result);
        CHECK(reply.functions.path == sent.path);
        CHECK(reply.functions.functions == sent.functions);
        CHECK(reply.functions.warnings.size() == 1);
        CHECK(reply.functions.warnings[0].message == sent.warnings[0].message);
        CHECK(reply.functions.warnings[0].line == 7);
        CHECK(reply.functions.lexically_recovered == 2);
        CHECK(reply.functions.parser_stop == lexer::ParserStop::out_of_memory);
    }
    SECTION("a context and a job come back equal") {
        lexer::ParseContext context;
        context.headers = {{"inc/a.h", std::string("\0#define A 1\n\xfe", 15)}, {"b.hpp", ""}};
        context.include_dirs = {"", "inc"};
        context.file_flags["src/a.cpp"] = {"-DX=1", "-I/tollgate-src/inc"};
        context.force_language = lexer::Language::c;
        context.convention.body_only = true;
        context.cache_dir = "/var/cache/tollgate";
        context.trusted_dirs = {"/opt/vendor/include"};
        const auto request = lexer::decode_request(lexer::encode_context(9, {3, 4}, context));
        REQUIRE(request.kind == lexer::WorkerRequest::Kind::context);
        CHECK(request.id == 9);
        CHECK(request.drop == std::vector<std::uint64_t>{3, 4});
        CHECK(request.context.headers == context.headers);
        CHECK(request.context.include_dirs == context.include_dirs);
        CHECK(request.context.file_flags == context.file_flags);
        CHECK(request.context.force_language == lexer::Language::c);
        CHECK(request.context.convention == context.convention);
        CHECK(request.context.cache_dir == context.cache_dir);
        CHECK(request.context.trusted_dirs == context.trusted_dirs);

        const SourceFile file{"src/a.cpp", std::string("int\0x;", 6)};
        const auto job = lexer::decode_request(lexer::encode_job(9, file, 60));
        REQUIRE(job.kind == lexer::WorkerRequest::Kind::job);
        CHECK(job.id == 9);
        CHECK(job.file == file);
        CHECK(job.cpu_seconds == 60);
    }
    SECTION("a cut, padded or unknown message is refused") {
        const std::string whole = lexer::encode_result(sample_functions());
        CHECK_THROWS(lexer::decode_reply(whole.substr(0, whole.size() - 1)));
        CHECK_THROWS(lexer::decode_reply(whole + "x"));
        CHECK_THROWS(lexer::decode_reply(std::string(1, '\x09')));
        CHECK_THROWS(lexer::decode_reply(""));
        // A count larger than the message is refused before anything is allocated for it.
        CHECK_THROWS(lexer::decode_reply(std::string("\x04\x00\xff\xff\xff\xff\x0f", 7)));
        CHECK(lexer::decode_reply(lexer::encode_failed("no context")).message == "no context");
    }
}
