// SPDX-License-Identifier: MIT
// What both Java paths share: identity texts, the qualifier rule and the finishing steps.
#include "gate/java/java_names.hpp"

#include "tollgate/core/token_digest.hpp"

#include <algorithm>
#include <cctype>
#include <map>

namespace tollgate::java {

namespace {

bool is_word(const std::string& spelling) {
    if (spelling.empty()) {
        return false;
    }
    const auto c = static_cast<unsigned char>(spelling[0]);
    return std::isalnum(c) != 0 || c == '_' || c == '$' || c >= 0x80;
}

} // namespace

std::string join_type_text(const std::vector<std::string>& spellings) {
    std::string text;
    std::string previous;
    for (const std::string& s : spellings) {
        if (!text.empty()) {
            const bool space = (is_word(previous) && is_word(s)) || previous == "," ||
                               (previous == "?" && is_word(s)) || s == "&" || previous == "&";
            if (space) {
                text += ' ';
            }
        }
        text += s;
        previous = s;
    }
    return text;
}

bool looks_like_type_name(const std::string& name) {
    if (name.empty() || !std::isupper(static_cast<unsigned char>(name[0]))) {
        return false;
    }
    return std::any_of(name.begin(), name.end(),
                       [](char c) { return std::islower(static_cast<unsigned char>(c)) != 0; });
}

core::NameKind qualifier_kind(const NameTable& table, const std::string& name, core::Basis& basis) {
    basis = core::Basis::syntax_tree;
    if (table.values.count(name) != 0) {
        return core::NameKind::value;
    }
    if (table.types.count(name) != 0) {
        return core::NameKind::type;
    }
    if (looks_like_type_name(name)) {
        basis = core::Basis::spelling;
        return core::NameKind::type;
    }
    return core::NameKind::value;
}

std::string qualified_java_name(const std::string& package, const std::vector<std::string>& types,
                                const std::string& name) {
    std::string text = package;
    for (const std::string& type : types) {
        text += (text.empty() ? "" : ".") + type;
    }
    return text + (text.empty() ? "" : ".") + name;
}

void finish_functions(std::vector<FoundFunction> found, const std::string& path,
                      lexer::FileFunctions& out) {
    std::sort(found.begin(), found.end(), [](const FoundFunction& a, const FoundFunction& b) {
        return a.first_offset < b.first_offset;
    });
    std::map<std::string, unsigned> ordinals;
    for (FoundFunction& item : found) {
        lexer::FunctionSpan& span = item.span;
        span.path = path;
        const std::string base = span.qualified_name + "(" + span.signature + ")";
        span.fallback_key = base + "#" + std::to_string(ordinals[base]++);
        span.token_hash = core::token_digest(span.tokens);
        out.functions.push_back(std::move(span));
    }
    std::stable_sort(out.functions.begin(), out.functions.end(),
                     [](const lexer::FunctionSpan& a, const lexer::FunctionSpan& b) {
                         return a.start_line != b.start_line ? a.start_line < b.start_line
                                                             : a.fallback_key < b.fallback_key;
                     });
}

} // namespace tollgate::java
