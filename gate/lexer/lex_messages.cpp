// SPDX-License-Identifier: MIT
// Encoding and decoding of parser-process messages with nlohmann's MessagePack.
#include "gate/lexer/lex_messages.hpp"

#include "gate/lexer/file_functions_json.hpp"

#include <nlohmann/json.hpp>
#include <stdexcept>

namespace tollgate::lexer {

namespace {

using nlohmann::json;

std::string pack(const json& value) {
    std::string bytes;
    json::to_msgpack(value, nlohmann::detail::output_adapter<char>(bytes));
    return bytes;
}

json unpack(const std::string& bytes) {
    return json::from_msgpack(bytes);
}

} // namespace

std::string encode_context(std::uint64_t id, const std::vector<std::uint64_t>& drop,
                           const ParseContext& context) {
    json headers = json::array();
    for (const SourceFile& header : context.headers) {
        headers.push_back(json::array({header.path, header.content}));
    }
    json flags = json::object();
    for (const auto& [path, list] : context.file_flags) {
        flags[path] = list;
    }
    const json convention =
        json::array({context.convention.function_name_as_operand, context.convention.body_only,
                     context.convention.merge_unary_binary});
    return pack(
        {{"kind", "context"},
         {"id", id},
         {"drop", drop},
         {"headers", headers},
         {"include_dirs", context.include_dirs},
         {"file_flags", flags},
         {"language", context.force_language ? static_cast<int>(*context.force_language) : -1},
         {"convention", convention},
         {"cache_dir", context.cache_dir},
         {"trusted_dirs", context.trusted_dirs}});
}

std::string encode_job(std::uint64_t context_id, const SourceFile& file, unsigned cpu_seconds) {
    return pack({{"kind", "job"},
                 {"id", context_id},
                 {"path", file.path},
                 {"content", file.content},
                 {"cpu", cpu_seconds}});
}

std::string encode_ready() {
    return pack({{"kind", "ready"}});
}

std::string encode_result(const FileFunctions& functions) {
    return pack({{"kind", "result"}, {"functions", file_functions_to_json(functions)}});
}

std::string encode_failed(const std::string& message) {
    return pack({{"kind", "failed"}, {"message", message}});
}

WorkerRequest decode_request(const std::string& bytes) {
    const json value = unpack(bytes);
    WorkerRequest request;
    const std::string kind = value.at("kind").get<std::string>();
    request.id = value.at("id").get<std::uint64_t>();
    if (kind == "job") {
        request.kind = WorkerRequest::Kind::job;
        request.file.path = value.at("path").get<std::string>();
        request.file.content = value.at("content").get<std::string>();
        request.cpu_seconds = value.at("cpu").get<unsigned>();
        return request;
    }
    if (kind != "context") {
        throw std::runtime_error("unknown request");
    }
    request.kind = WorkerRequest::Kind::context;
    request.drop = value.at("drop").get<std::vector<std::uint64_t>>();
    ParseContext& context = request.context;
    for (const auto& header : value.at("headers")) {
        context.headers.push_back(
            {header.at(0).get<std::string>(), header.at(1).get<std::string>()});
    }
    context.include_dirs = value.at("include_dirs").get<std::vector<std::string>>();
    for (const auto& [path, list] : value.at("file_flags").items()) {
        context.file_flags[path] = list.get<std::vector<std::string>>();
    }
    const int language = value.at("language").get<int>();
    if (language == static_cast<int>(Language::c) || language == static_cast<int>(Language::cxx)) {
        context.force_language = static_cast<Language>(language);
    }
    const json& convention = value.at("convention");
    context.convention.function_name_as_operand = convention.at(0).get<bool>();
    context.convention.body_only = convention.at(1).get<bool>();
    context.convention.merge_unary_binary = convention.at(2).get<bool>();
    context.cache_dir = value.at("cache_dir").get<std::string>();
    context.trusted_dirs = value.at("trusted_dirs").get<std::vector<std::string>>();
    return request;
}

WorkerReply decode_reply(const std::string& bytes) {
    const json value = unpack(bytes);
    WorkerReply reply;
    const std::string kind = value.at("kind").get<std::string>();
    if (kind == "ready") {
        reply.kind = WorkerReply::Kind::ready;
    } else if (kind == "result") {
        reply.kind = WorkerReply::Kind::result;
        reply.functions = file_functions_from_json(value.at("functions"));
    } else if (kind == "failed") {
        reply.kind = WorkerReply::Kind::failed;
        reply.message = value.at("message").get<std::string>();
    } else {
        throw std::runtime_error("unknown reply");
    }
    return reply;
}

} // namespace tollgate::lexer
