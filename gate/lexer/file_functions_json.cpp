// SPDX-License-Identifier: MIT
// One serialiser of lexed files, shared by the lexed-file cache and the parser processes.
#include "gate/lexer/file_functions_json.hpp"

#include "gate/common/text_safety.hpp"

#include <stdexcept>

namespace tollgate::lexer {

namespace {

using nlohmann::json;
using text::store_bytes;

ExtentMode mode_from(const std::string& name) {
    for (const ExtentMode mode :
         {ExtentMode::syntax_tree, ExtentMode::lexical, ExtentMode::parser_stopped}) {
        if (name == extent_name(mode)) {
            return mode;
        }
    }
    throw std::runtime_error("unknown extent");
}

template <typename Enum>
Enum enum_from(const json& value, Enum last) {
    const int number = value.get<int>();
    if (number < 0 || number > static_cast<int>(last)) {
        throw std::runtime_error("enumeration out of range");
    }
    return static_cast<Enum>(number);
}

} // namespace

std::string stored_text(const json& stored) {
    auto bytes = text::unstore_bytes(stored.get<std::string>());
    if (!bytes) {
        throw std::runtime_error("bad stored text");
    }
    return std::move(*bytes);
}

const char* extent_name(ExtentMode mode) {
    switch (mode) {
    case ExtentMode::syntax_tree:
        return "syntax-tree";
    case ExtentMode::lexical:
        return "lexical";
    case ExtentMode::parser_stopped:
        return "parser-stopped";
    }
    return "syntax-tree";
}

json file_functions_to_json(const FileFunctions& functions) {
    json list = json::array();
    for (const auto& f : functions.functions) {
        json tokens = json::array();
        for (const auto& t : f.tokens) {
            tokens.push_back({store_bytes(t.key), store_bytes(t.spelling),
                              t.role == core::Role::operand_token ? 1 : 0, store_bytes(t.form),
                              static_cast<int>(t.basis), t.line});
        }
        list.push_back({{"usr", store_bytes(f.usr)},
                        {"fallback_key", store_bytes(f.fallback_key)},
                        {"qualified_name", store_bytes(f.qualified_name)},
                        {"signature", store_bytes(f.signature)},
                        {"path", store_bytes(f.path)},
                        {"start_line", f.start_line},
                        {"end_line", f.end_line},
                        {"extent", extent_name(f.mode)},
                        {"potential_operands", f.potential_operands},
                        {"token_hash", f.token_hash},
                        {"inactive", f.inactive},
                        {"brace_extent", f.brace_extent},
                        {"tokens", tokens}});
    }
    json warnings = json::array();
    for (const auto& w : functions.warnings) {
        warnings.push_back({store_bytes(w.path), w.line, store_bytes(w.message)});
    }
    return {{"path", store_bytes(functions.path)},
            {"functions", list},
            {"warnings", warnings},
            {"lexically_recovered", functions.lexically_recovered},
            {"parser_stop", static_cast<int>(functions.parser_stop)}};
}

FileFunctions file_functions_from_json(const json& value) {
    FileFunctions out;
    out.path = stored_text(value.at("path"));
    for (const auto& f : value.at("functions")) {
        FunctionSpan span;
        span.usr = stored_text(f.at("usr"));
        span.fallback_key = stored_text(f.at("fallback_key"));
        span.qualified_name = stored_text(f.at("qualified_name"));
        span.signature = stored_text(f.at("signature"));
        span.path = stored_text(f.at("path"));
        span.start_line = f.at("start_line").get<unsigned>();
        span.end_line = f.at("end_line").get<unsigned>();
        span.mode = mode_from(f.at("extent").get<std::string>());
        span.potential_operands = f.at("potential_operands").get<std::uint64_t>();
        span.token_hash = f.at("token_hash").get<std::string>();
        span.inactive = f.at("inactive").get<bool>();
        span.brace_extent = f.at("brace_extent").get<bool>();
        for (const auto& t : f.at("tokens")) {
            core::Token token;
            token.key = stored_text(t.at(0));
            token.spelling = stored_text(t.at(1));
            token.role =
                t.at(2).get<int>() == 1 ? core::Role::operand_token : core::Role::operator_token;
            token.form = stored_text(t.at(3));
            token.basis = enum_from(t.at(4), core::Basis::lexical);
            token.line = t.at(5).get<unsigned>();
            span.tokens.push_back(std::move(token));
        }
        out.functions.push_back(std::move(span));
    }
    for (const auto& w : value.at("warnings")) {
        out.warnings.push_back(
            {stored_text(w.at(0)), w.at(1).get<unsigned>(), stored_text(w.at(2))});
    }
    out.lexically_recovered = value.at("lexically_recovered").get<unsigned>();
    out.parser_stop = enum_from(value.at("parser_stop"), ParserStop::failed);
    return out;
}

} // namespace tollgate::lexer
