// SPDX-License-Identifier: MIT
// Placeholder replaced by the libclang front end.
#include "gate/lexer/lexer.hpp"
#include "gate/common/errors.hpp"
namespace tollgate::lexer {
struct Lexer::Impl {};
Lexer::Lexer() : m_impl(std::make_unique<Impl>()) {}
Lexer::~Lexer() = default;
FileFunctions Lexer::lex_functions(const SourceFile&, const ParseContext&) { throw Failure("lexer unavailable"); }
ParseContext make_parse_context(const std::vector<SourceFile>&, const std::string&, const std::string&) { return {}; }
std::optional<Language> language_for_path(const std::string&, std::optional<Language>) { return std::nullopt; }
}
