// SPDX-License-Identifier: MIT
// The whole-file lexical measurement behind a parser that stopped.
#include "gate/lexer/lexical_fallback.hpp"

#include "gate/lexer/function_finish.hpp"
#include "gate/lexer/lexical_scan.hpp"
#include "gate/lexer/raw_lexer.hpp"

namespace tollgate::lexer {

namespace {

// Tokens the fallback measures at most (about 250 bytes each while measured): a 1 MB line of
// `a+a+...` is a million tokens.
constexpr std::size_t k_max_fallback_tokens = 4'000'000;

} // namespace

std::string parser_stop_text(ParserStop stop, unsigned seconds) {
    switch (stop) {
    case ParserStop::none:
        break;
    case ParserStop::crashed:
        return "crashed";
    case ParserStop::out_of_memory:
        return "ran out of memory";
    case ParserStop::timed_out:
        return "took longer than " + std::to_string(seconds) + " s";
    case ParserStop::failed:
        return "could not parse it";
    }
    return "stopped";
}

FileFunctions lex_lexically(const SourceFile& file, const ParseContext& context, ParserStop stop,
                            const std::string& warning) {
    FileFunctions result;
    result.path = file.path;
    result.parser_stop = stop;
    const auto language = language_for_path(file.path, context.force_language);
    if (!language) {
        result.warnings.push_back({file.path, 0, "not a c or c++ file: nothing measured"});
        return result;
    }
    const RawTokens raw = tokenize_raw(file.content, *language, k_max_fallback_tokens);
    if (!raw.complete) {
        // This process must not spend gigabytes on one hostile file.
        result.warnings.push_back({file.path, 0,
                                   warning + ", but it holds more than " +
                                       std::to_string(k_max_fallback_tokens) +
                                       " tokens: not measured"});
        return result;
    }
    result.warnings.push_back({file.path, 0, warning});
    std::vector<PendingFunction> pending;
    for (const LexicalDefinition& definition : scan_definitions(raw.tokens, raw.directives)) {
        PendingFunction item;
        item.lexical = true;
        item.first = definition.first;
        item.span.qualified_name = definition.qualified_name;
        item.span.signature = definition.signature;
        item.span.potential_operands = definition.potential_operands;
        item.span.start_line = raw.tokens[definition.first].line;
        item.span.end_line = raw.tokens[definition.body_close].line;
        item.span.mode = ExtentMode::parser_stopped;
        item.range = {definition.first, definition.body_close, definition.name};
        pending.push_back(std::move(item));
    }
    result.functions =
        finish_functions(std::move(pending), file.path, raw.tokens, nullptr, context.convention);
    return result;
}

} // namespace tollgate::lexer
