// SPDX-License-Identifier: MIT
// The lexical cross-check: function definitions found from balanced braces after a parameter list.
#include "gate/lexer/lexical_scan.hpp"

#include "gate/lexer/lexical_signature.hpp"
#include "gate/lexer/macro_names.hpp"

#include <algorithm>
#include <array>
#include <optional>
#include <string_view>

namespace tollgate::lexer {

namespace {

constexpr std::size_t k_npos = static_cast<std::size_t>(-1);

// Qualifier scanning gives up after this many tokens: a real header never needs more.
constexpr std::size_t k_max_qualifier_tokens = 256;

bool is_open(const SourceToken& token) {
    return is_punct(token, "(") || is_punct(token, "[") || is_punct(token, "{");
}

bool is_close(const SourceToken& token) {
    return is_punct(token, ")") || is_punct(token, "]") || is_punct(token, "}");
}

// Names that look like calls at namespace scope but never name a function.
bool is_attribute_name(const std::string& spelling) {
    static constexpr std::array<std::string_view, 6> k_names = {
        "__attribute__", "__attribute", "__declspec", "__asm__", "__asm", "_Pragma"};
    for (auto name : k_names) {
        if (spelling == name) {
            return true;
        }
    }
    return false;
}

// Skip a template argument list starting at `open` (`<`); return the index after its `>`.
std::size_t skip_angles(const std::vector<SourceToken>& tokens, std::size_t open) {
    int depth = 0;
    for (std::size_t i = open; i < tokens.size(); ++i) {
        const SourceToken& token = tokens[i];
        if (is_punct(token, "<")) {
            ++depth;
        } else if (is_punct(token, ">")) {
            --depth;
        } else if (is_punct(token, ">>")) {
            depth -= 2;
        } else if (is_punct(token, ";") || is_punct(token, "{") || is_punct(token, "}")) {
            return k_npos;
        } else if (is_punct(token, "(")) {
            i = match_bracket(tokens, i);
            if (i >= tokens.size()) {
                return k_npos;
            }
            continue;
        }
        if (depth <= 0) {
            return i + 1;
        }
    }
    return k_npos;
}

// Skip a constructor initializer list starting after `:`; return the index of the body's `{`.
std::size_t skip_initializers(const std::vector<SourceToken>& tokens, std::size_t k) {
    while (k < tokens.size()) {
        // A member or base name, possibly qualified or with template arguments.
        bool named = false;
        while (k < tokens.size()) {
            const SourceToken& token = tokens[k];
            if (token.kind == core::LexKind::identifier || is_punct(token, "::") ||
                is_keyword(token, "template") || is_keyword(token, "typename")) {
                named = true;
                ++k;
            } else if (is_punct(token, "<") && named) {
                k = skip_angles(tokens, k);
                if (k == k_npos) {
                    return k_npos;
                }
            } else {
                break;
            }
        }
        if (!named || k >= tokens.size()) {
            return k_npos;
        }
        if (!is_punct(tokens[k], "(") && !is_punct(tokens[k], "{")) {
            return k_npos;
        }
        k = match_bracket(tokens, k);
        if (k >= tokens.size()) {
            return k_npos;
        }
        ++k;
        if (k < tokens.size() && is_punct(tokens[k], "...")) {
            ++k;
        }
        if (k < tokens.size() && is_punct(tokens[k], ",")) {
            ++k;
            continue;
        }
        if (k < tokens.size() && is_punct(tokens[k], "{")) {
            return k;
        }
        return k_npos;
    }
    return k_npos;
}

// From the `(` of a parameter list, return the index of the body's `{`, or k_npos when what
// follows the list is not a function body (a declaration, a call, an initializer).
std::size_t find_body(const std::vector<SourceToken>& tokens, std::size_t open) {
    std::size_t k = match_bracket(tokens, open);
    if (k >= tokens.size()) {
        return k_npos;
    }
    ++k;
    const std::size_t limit = k + k_max_qualifier_tokens;
    while (k < tokens.size() && k < limit) {
        const SourceToken& token = tokens[k];
        if (is_punct(token, "{")) {
            return k;
        }
        if (is_punct(token, ":")) {
            return skip_initializers(tokens, k + 1);
        }
        if (is_punct(token, "->")) {
            // Trailing return type: anything balanced up to the body.
            ++k;
            while (k < tokens.size() && k < limit) {
                if (is_punct(tokens[k], "{")) {
                    return k;
                }
                if (is_punct(tokens[k], ";") || is_punct(tokens[k], "=") ||
                    is_punct(tokens[k], "}")) {
                    return k_npos;
                }
                if (is_punct(tokens[k], "(") || is_punct(tokens[k], "[")) {
                    k = match_bracket(tokens, k);
                }
                ++k;
            }
            return k_npos;
        }
        if (token.kind == core::LexKind::keyword) {
            if (token.spelling == "const" || token.spelling == "volatile" ||
                token.spelling == "noexcept" || token.spelling == "throw" ||
                token.spelling == "mutable" || token.spelling == "constexpr" ||
                token.spelling == "__attribute__") {
                ++k;
                if (k < tokens.size() && is_punct(tokens[k], "(")) {
                    k = match_bracket(tokens, k) + 1;
                }
                continue;
            }
            if (token.spelling == "try") {
                ++k;
                continue;
            }
            return k_npos;
        }
        if (token.kind == core::LexKind::identifier) {
            // override, final, and attribute macros such as NOEXCEPT_MACRO or API(x).
            ++k;
            if (k < tokens.size() && is_punct(tokens[k], "(")) {
                k = match_bracket(tokens, k) + 1;
            }
            continue;
        }
        if (is_punct(token, "&") || is_punct(token, "&&")) {
            ++k;
            continue;
        }
        if (is_punct(token, "[") && k + 1 < tokens.size() && is_punct(tokens[k + 1], "[")) {
            k = match_bracket(tokens, k) + 1;
            continue;
        }
        return k_npos;
    }
    return k_npos;
}

// Return the `<` that opens the template argument list closed at `close` (`>` or `>>`), walking
// back no further than `start`; k_npos when there is none.
std::size_t angles_open(const std::vector<SourceToken>& tokens, std::size_t close,
                        std::size_t start) {
    int depth = 0;
    for (std::size_t i = close + 1; i-- > start;) {
        const SourceToken& token = tokens[i];
        if (is_punct(token, ">")) {
            ++depth;
        } else if (is_punct(token, ">>")) {
            depth += 2;
        } else if (is_punct(token, "<")) {
            if (--depth <= 0) {
                return depth == 0 ? i : k_npos;
            }
        } else if (is_punct(token, ";") || is_punct(token, "{") || is_punct(token, "}") ||
                   is_punct(token, "(") || is_punct(token, ")")) {
            return k_npos;
        }
    }
    return k_npos;
}

// Find the name of the function whose parameter list opens at `open`: an identifier, or the
// `operator` keyword a few tokens back. Return k_npos when there is none.
std::size_t find_name(const std::vector<SourceToken>& tokens, std::size_t open,
                      std::size_t statement_start) {
    if (open == 0 || open <= statement_start) {
        return k_npos;
    }
    // operator+ ( ... ), operator() ( ... ), operator new[] ( ... ), operator int ( ... )
    for (std::size_t back = 1; back <= 5 && back <= open - statement_start; ++back) {
        const SourceToken& token = tokens[open - back];
        if (is_keyword(token, "operator")) {
            return open - back;
        }
        if (is_punct(token, ";") || is_punct(token, "{") || is_punct(token, "}")) {
            break;
        }
    }
    std::size_t name = open - 1;
    if (is_punct(tokens[name], ">") || is_punct(tokens[name], ">>")) {
        // An explicit specialisation: `C::f<Arg>(...)` is named by the `f` before `<...>`.
        name = angles_open(tokens, name, statement_start);
        if (name == k_npos || name == statement_start) {
            return k_npos;
        }
        --name;
    }
    const SourceToken& previous = tokens[name];
    if (previous.kind != core::LexKind::identifier || is_attribute_name(previous.spelling)) {
        return k_npos;
    }
    if (name >= 1 && (is_punct(tokens[name - 1], ".") || is_punct(tokens[name - 1], "->"))) {
        return k_npos;
    }
    return name;
}

// Return true when the statement from `start` whose `(` names `name` and whose braces open at
// `body` declares a type rather than a function: a typedef, an enumeration whose base or
// attributes come from a macro (`enum Kind MACRO(unsigned char) { ... }`, a list without `;`),
// or a class whose attributes come from a macro right after its key (`struct ALIGNED(8) S {`).
bool declares_type(const std::vector<SourceToken>& tokens, std::size_t start, std::size_t name,
                   std::size_t body) {
    for (std::size_t i = start; i < name; ++i) {
        if (is_keyword(tokens[i], "typedef")) {
            return true;
        }
        if (is_keyword(tokens[i], "enum")) {
            if (i + 1 < name &&
                (is_keyword(tokens[i + 1], "class") || is_keyword(tokens[i + 1], "struct"))) {
                return true;
            }
            const std::size_t close = match_bracket(tokens, body);
            for (std::size_t j = body + 1; j < close && j < tokens.size(); ++j) {
                if (is_punct(tokens[j], ";")) {
                    return false; // statements: a function returning an enumeration
                }
            }
            return true;
        }
    }
    return name > start &&
           (is_keyword(tokens[name - 1], "class") || is_keyword(tokens[name - 1], "struct") ||
            is_keyword(tokens[name - 1], "union"));
}

enum class ScopeKind { container, function, block };

struct Scope {
    ScopeKind kind = ScopeKind::container;
    std::string name; // namespace or class name, empty for others
};

struct ScanState {
    std::vector<Scope> stack;
    std::size_t statement_start = 0;
    std::size_t pending_body = k_npos;
    LexicalDefinition pending;
    LexicalDefinition open_function;
    int paren_depth = 0;
};

// Return the name of the namespace or class whose `{` is at `open`, or an empty string.
std::string container_name(const std::vector<SourceToken>& tokens, std::size_t start,
                           std::size_t open) {
    for (std::size_t i = start; i < open; ++i) {
        const SourceToken& token = tokens[i];
        if (is_keyword(token, "namespace") || is_keyword(token, "class") ||
            is_keyword(token, "struct") || is_keyword(token, "union")) {
            // The last identifier before `{`, `:` or `final` names it.
            std::string name;
            for (std::size_t j = i + 1; j < open; ++j) {
                if (is_punct(tokens[j], ":") || is_punct(tokens[j], "<")) {
                    break;
                }
                if (tokens[j].kind == core::LexKind::identifier && tokens[j].spelling != "final") {
                    name = name.empty() || !is_punct(tokens[j - 1], "::")
                               ? tokens[j].spelling
                               : name + "::" + tokens[j].spelling;
                }
            }
            return name;
        }
    }
    return {};
}

std::string scope_prefix(const std::vector<Scope>& stack) {
    std::string prefix;
    for (const Scope& scope : stack) {
        if (scope.kind == ScopeKind::container && !scope.name.empty()) {
            prefix += scope.name + "::";
        }
    }
    return prefix;
}

std::string innermost_class(const std::vector<Scope>& stack) {
    return stack.empty() ? std::string() : stack.back().name;
}

// Return the name of a function made by a macro invocation followed by a body, as written
// ("TEST(Suite, Name)"): the statement starts with the invocation and the macro's name reads as
// a macro's (a constructor of the enclosing class does not count). Nothing otherwise.
std::optional<std::string> test_macro_name(const std::vector<SourceToken>& tokens,
                                           std::size_t start, std::size_t name,
                                           const std::vector<Scope>& stack) {
    if (name != start || !is_macro_style_name(tokens[name].spelling) ||
        tokens[name].spelling == innermost_class(stack)) {
        return std::nullopt;
    }
    return macro_invocation_name(tokens, name);
}

} // namespace

std::size_t match_bracket(const std::vector<SourceToken>& tokens, std::size_t open) {
    if (open >= tokens.size()) {
        return tokens.size();
    }
    if (is_punct(tokens[open], "<")) {
        const std::size_t after = skip_angles(tokens, open);
        return after == k_npos ? tokens.size() : after - 1;
    }
    int depth = 0;
    for (std::size_t i = open; i < tokens.size(); ++i) {
        if (is_open(tokens[i])) {
            ++depth;
        } else if (is_close(tokens[i])) {
            if (--depth == 0) {
                return i;
            }
        }
    }
    return tokens.size();
}

bool declares_type_at(const std::vector<SourceToken>& tokens, std::size_t first, std::size_t name) {
    if (name <= first || name + 1 >= tokens.size() || !is_punct(tokens[name + 1], "(")) {
        return false;
    }
    const std::size_t body = find_body(tokens, name + 1);
    return body != k_npos && declares_type(tokens, first, name, body);
}

// The scan state at an open #if, restored by its #else / #elif, and how many definitions had
// been found before it.
struct SavedCondition {
    ScanState state;
    std::size_t found_before = 0;
    std::size_t opened_at = 0; // the first token after the #if
};

// Apply the conditional directive `mark` to the scan: an #if saves the state, an #else / #elif
// restores it, an #endif forgets it. `found_count` is the number of definitions found so far.
void apply_directive(const DirectiveMark& mark, std::size_t found_count, ScanState& state,
                     std::vector<SavedCondition>& saved) {
    switch (mark.kind) {
    case DirectiveKind::open_condition:
        saved.push_back({state, found_count, mark.before});
        break;
    case DirectiveKind::alternative:
        if (!saved.empty()) {
            state = saved.back().state;
            // A branch that opened at a statement boundary starts its own statement: a
            // declaration of the #else branch does not begin in the #if branch.
            if (state.statement_start == saved.back().opened_at) {
                state.statement_start = mark.before;
            }
            // A branch that completed a definition ended a statement inside itself: the next
            // branch's statement starts after the directive, not before the #if (else
            // `#if A f(){} #else f(){} #endif` would measure both as one).
            const bool outside_function =
                state.stack.empty() || state.stack.back().kind == ScopeKind::container;
            if (outside_function && found_count > saved.back().found_before) {
                state.statement_start = std::max(state.statement_start, mark.before);
                state.pending_body = k_npos;
                state.paren_depth = 0;
            }
        }
        break;
    case DirectiveKind::close_condition:
        if (!saved.empty()) {
            saved.pop_back();
        }
        break;
    case DirectiveKind::other:
        break;
    }
}

// Add `definition` to `found`, keeping definitions apart. An #else restores the brace count of
// its #if, so one header can be seen to close twice (`f() { #if X } #else } #endif`), or an
// unbalanced #else can reopen a body that closed: a definition that starts no later than the
// ones it overlaps replaces them (its extent holds both endings); one that starts inside an
// earlier definition is a repeat of it and is dropped.
void add_definition(std::vector<LexicalDefinition>& found, LexicalDefinition definition) {
    while (!found.empty() && found.back().body_close >= definition.first &&
           found.back().first >= definition.first) {
        found.pop_back();
    }
    if (found.empty() || found.back().body_close < definition.first) {
        found.push_back(std::move(definition));
    }
}

std::vector<LexicalDefinition> scan_definitions(const std::vector<SourceToken>& tokens,
                                                const std::vector<DirectiveMark>& directives) {
    std::vector<LexicalDefinition> found;
    ScanState state;
    std::vector<SavedCondition> saved;
    std::size_t next_directive = 0;
    for (std::size_t i = 0; i < tokens.size(); ++i) {
        for (; next_directive < directives.size() && directives[next_directive].before <= i;
             ++next_directive) {
            apply_directive(directives[next_directive], found.size(), state, saved);
        }
        const SourceToken& token = tokens[i];
        const bool in_function =
            !state.stack.empty() && state.stack.back().kind != ScopeKind::container;
        if (in_function) {
            if (is_punct(token, "{")) {
                state.stack.push_back({ScopeKind::block, {}});
            } else if (is_punct(token, "}")) {
                const ScopeKind kind = state.stack.back().kind;
                state.stack.pop_back();
                if (kind == ScopeKind::function) {
                    LexicalDefinition definition = state.open_function;
                    definition.body_close = i;
                    add_definition(found, std::move(definition));
                    state.statement_start = i + 1;
                }
            }
            continue;
        }
        if (state.pending_body == i) {
            state.stack.push_back({ScopeKind::function, {}});
            state.open_function = state.pending;
            state.pending_body = k_npos;
            continue;
        }
        if (state.pending_body != k_npos && i < state.pending_body) {
            continue; // parameters, qualifiers and initializers of a header already found
        }
        if (is_punct(token, "{")) {
            state.stack.push_back(
                {ScopeKind::container, container_name(tokens, state.statement_start, i)});
            state.statement_start = i + 1;
            state.pending_body = k_npos;
            state.paren_depth = 0;
        } else if (is_punct(token, "}")) {
            if (!state.stack.empty()) {
                state.stack.pop_back();
            }
            state.statement_start = i + 1;
            state.pending_body = k_npos;
            state.paren_depth = 0;
        } else if (is_punct(token, ";")) {
            state.statement_start = i + 1;
            state.pending_body = k_npos;
            state.paren_depth = 0;
        } else if (is_punct(token, ":") && i > 0 &&
                   (is_keyword(tokens[i - 1], "public") || is_keyword(tokens[i - 1], "private") ||
                    is_keyword(tokens[i - 1], "protected"))) {
            state.statement_start = i + 1;
        } else if (is_punct(token, ")")) {
            --state.paren_depth;
        } else if (is_punct(token, "(")) {
            if (state.paren_depth == 0 && state.pending_body == k_npos) {
                const std::size_t name = find_name(tokens, i, state.statement_start);
                const std::size_t body = name == k_npos ? k_npos : find_body(tokens, i);
                if (body != k_npos && !declares_type(tokens, state.statement_start, name, body)) {
                    LexicalDefinition definition;
                    definition.first = state.statement_start;
                    definition.name = name;
                    definition.body_open = body;
                    const std::string written =
                        written_name(tokens, name, i, state.statement_start);
                    definition.qualified_name = scope_prefix(state.stack) + written;
                    const Parameters parameters = describe_parameters(tokens, i);
                    definition.signature = parameters.signature;
                    definition.potential_operands =
                        parameters.count + (has_result(tokens, state.statement_start, name, body,
                                                       written, innermost_class(state.stack))
                                                ? 1
                                                : 0);
                    if (const auto invocation =
                            test_macro_name(tokens, state.statement_start, name, state.stack)) {
                        // Named as written, like the parser's macro-made functions; such a
                        // body takes no parameters and returns nothing.
                        definition.qualified_name = scope_prefix(state.stack) + *invocation;
                        definition.signature.clear();
                        definition.potential_operands = 0;
                    }
                    state.pending = std::move(definition);
                    state.pending_body = body;
                    continue; // the parameter list is skipped with the rest of the header
                }
            }
            ++state.paren_depth;
        }
    }
    return found;
}

} // namespace tollgate::lexer
