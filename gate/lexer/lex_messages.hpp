// SPDX-License-Identifier: MIT
// The messages between Tollgate and its parser processes, in a compact binary encoding (any bytes
// of a source file travel unchanged).
#pragma once

#include "gate/common/source.hpp"
#include "gate/lexer/lexer.hpp"

#include <cstdint>
#include <string>
#include <vector>

namespace tollgate::lexer {

// Return the message that gives a parser process `context` under `id`, after it forgets the
// contexts `drop`.
std::string encode_context(std::uint64_t id, const std::vector<std::uint64_t>& drop,
                           const ParseContext& context);

// Return the message that asks for `file` to be lexed with context `context_id`, within
// `cpu_seconds` of processor time.
std::string encode_job(std::uint64_t context_id, const SourceFile& file, unsigned cpu_seconds);

// Return the message a parser process sends once it is set up.
std::string encode_ready();

// Return the message that answers a job with `functions`.
std::string encode_result(const FileFunctions& functions);

// Return the message that answers a job libclang could not parse, with `message`.
std::string encode_failed(const std::string& message);

// A message to a parser process.
struct WorkerRequest {
    enum class Kind { context, job };
    Kind kind = Kind::job;
    std::uint64_t id = 0;            // the context's id (both kinds)
    std::vector<std::uint64_t> drop; // contexts to forget (context messages)
    ParseContext context;            // the context (context messages)
    SourceFile file;                 // the file to lex (job messages)
    unsigned cpu_seconds = 0;        // processor time for this job (job messages)
};

// Return the request `bytes` holds. Throws std::exception when it is malformed.
WorkerRequest decode_request(const std::string& bytes);

// A message from a parser process.
struct WorkerReply {
    enum class Kind { ready, result, failed };
    Kind kind = Kind::ready;
    FileFunctions functions; // result messages
    std::string message;     // failed messages
};

// Return the reply `bytes` holds. Throws std::exception when it is malformed.
WorkerReply decode_reply(const std::string& bytes);

} // namespace tollgate::lexer
