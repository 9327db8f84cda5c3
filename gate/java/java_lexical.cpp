// SPDX-License-Identifier: MIT
// The lexical path of the Java front end: functions from braces, tokens from neighbours.
#include "gate/java/java_lexical.hpp"

#include "tollgate/core/classify_java.hpp"

#include <algorithm>

namespace tollgate::java {

namespace {

constexpr std::size_t k_npos = static_cast<std::size_t>(-1);

// A type argument list is looked for within this many tokens of its `<` (real ones are short),
// so a run of unclosed `<` costs linear time.
constexpr std::size_t k_max_type_list_tokens = 256;

bool punct(const JavaToken& token, const char* text) {
    return token.kind == core::LexKind::punctuation && token.spelling == text;
}

bool keyword(const JavaToken& token, const char* text) {
    return token.kind == core::LexKind::keyword && token.spelling == text;
}

bool identifier(const JavaToken& token) {
    return token.kind == core::LexKind::identifier;
}

bool is_primitive(const JavaToken& token) {
    static const char* const k_primitives[] = {"boolean", "byte",  "char",   "short", "int",
                                               "long",    "float", "double", "void",  "var"};
    return token.kind == core::LexKind::keyword &&
           std::any_of(std::begin(k_primitives), std::end(k_primitives),
                       [&](const char* p) { return token.spelling == p; });
}

bool is_modifier(const JavaToken& token) {
    static const char* const k_modifiers[] = {
        "public", "protected", "private",   "static",   "final",   "abstract",  "synchronized",
        "native", "strictfp",  "transient", "volatile", "default", "non-sealed"};
    return token.kind == core::LexKind::keyword &&
           std::any_of(std::begin(k_modifiers), std::end(k_modifiers),
                       [&](const char* m) { return token.spelling == m; });
}

// Return the index of the token closing the bracket opened at `open`, or tokens.size().
std::size_t match(const std::vector<JavaToken>& tokens, std::size_t open) {
    int depth = 0;
    for (std::size_t i = open; i < tokens.size(); ++i) {
        const JavaToken& t = tokens[i];
        if (punct(t, "(") || punct(t, "[") || punct(t, "{")) {
            ++depth;
        } else if (punct(t, ")") || punct(t, "]") || punct(t, "}")) {
            if (--depth == 0) {
                return i;
            }
        }
    }
    return tokens.size();
}

// Return the index after an annotation starting at `at` (`@` Name(.Name)* [(...)]), or `at`
// when none starts there (`@interface` is no annotation).
std::size_t skip_annotation(const std::vector<JavaToken>& tokens, std::size_t at) {
    if (at + 1 >= tokens.size() || !punct(tokens[at], "@") || !identifier(tokens[at + 1])) {
        return at;
    }
    std::size_t k = at + 2;
    while (k + 1 < tokens.size() && punct(tokens[k], ".") && identifier(tokens[k + 1])) {
        k += 2;
    }
    if (k < tokens.size() && punct(tokens[k], "(")) {
        k = std::min(match(tokens, k), tokens.size() - 1) + 1;
    }
    return k;
}

enum class ScopeKind { type_body, function_body, block };

struct Scope {
    ScopeKind kind = ScopeKind::block;
    std::string name;             // type name, for type bodies
    bool is_record = false;       // a record's body (compact constructors live here)
    bool enum_constants = false;  // an enum body still listing its constants
    std::string record_signature; // the record's component types
    std::uint64_t record_components = 0;
};

struct Parameters {
    std::string signature;
    std::uint64_t count = 0;
};

// Describe the parameter list between `open` and `close`: types without names or annotations.
Parameters describe_parameters(const std::vector<JavaToken>& tokens, std::size_t open,
                               std::size_t close) {
    Parameters result;
    std::vector<std::string> current;
    int depth = 0;
    auto finish = [&] {
        // Drop the name (the last identifier) and keep what follows it ([] of `int xs[]`).
        std::size_t name = k_npos;
        for (std::size_t k = current.size(); k-- > 0;) {
            if (current[k] != "[" && current[k] != "]") {
                name = k;
                break;
            }
        }
        if (name != k_npos && name > 0 && current[name] != "this") {
            std::vector<std::string> type(current.begin(),
                                          current.begin() + static_cast<long>(name));
            type.insert(type.end(), current.begin() + static_cast<long>(name) + 1, current.end());
            result.signature += (result.count == 0 ? "" : ", ") + join_type_text(type);
            ++result.count;
        }
        current.clear();
    };
    for (std::size_t k = open + 1; k < close && k < tokens.size(); ++k) {
        const JavaToken& t = tokens[k];
        const std::size_t after = skip_annotation(tokens, k);
        if (after != k) {
            k = after - 1;
            continue;
        }
        if (keyword(t, "final")) {
            continue;
        }
        if (punct(t, "<") || punct(t, "(") || punct(t, "[")) {
            ++depth;
        } else if (punct(t, ">") || punct(t, ")") || punct(t, "]")) {
            --depth;
        } else if (punct(t, ">>")) {
            depth -= 2;
        } else if (punct(t, ">>>")) {
            depth -= 3;
        } else if (punct(t, ",") && depth <= 0) {
            finish();
            continue;
        }
        current.push_back(t.spelling);
    }
    finish();
    return result;
}

std::string package_of(const std::vector<JavaToken>& tokens) {
    for (std::size_t i = 0; i < tokens.size(); ++i) {
        if (keyword(tokens[i], "package")) {
            std::string name;
            for (std::size_t k = i + 1; k < tokens.size() && !punct(tokens[k], ";"); ++k) {
                name += tokens[k].spelling;
            }
            return name;
        }
        if (!punct(tokens[i], "@") && !identifier(tokens[i]) && !punct(tokens[i], ".") &&
            !punct(tokens[i], "(") && !punct(tokens[i], ")")) {
            return {};
        }
    }
    return {};
}

// The state of the definition scan.
class DefinitionScan {
public:
    explicit DefinitionScan(const std::vector<JavaToken>& tokens)
        : m_tokens(tokens), m_package(package_of(tokens)) {}

    std::vector<LexicalFunction> run() {
        for (std::size_t i = 0; i < m_tokens.size(); ++i) {
            if (!m_scopes.empty() && m_scopes.back().kind != ScopeKind::type_body) {
                inside_body(i);
            } else {
                i = at_member_level(i);
            }
        }
        return std::move(m_found);
    }

private:
    void inside_body(std::size_t i) {
        if (punct(m_tokens[i], "{")) {
            m_scopes.push_back({ScopeKind::block, {}, false, false, {}, 0});
        } else if (punct(m_tokens[i], "}")) {
            const ScopeKind kind = m_scopes.back().kind;
            m_scopes.pop_back();
            if (kind == ScopeKind::function_body) {
                m_open.body_close = i;
                m_found.push_back(m_open);
                start_member(i + 1);
            } else if (m_scopes.empty() || m_scopes.back().kind == ScopeKind::type_body) {
                start_member(i + 1); // a field initializer's block ended
            }
        }
    }

    std::vector<std::string> type_names() const {
        std::vector<std::string> names;
        for (const Scope& scope : m_scopes) {
            if (scope.kind == ScopeKind::type_body) {
                names.push_back(scope.name);
            }
        }
        return names;
    }

    // Handle token `i` in a type body or at the top level; return the last index consumed.
    std::size_t at_member_level(std::size_t i) {
        const JavaToken& t = m_tokens[i];
        Scope* scope = m_scopes.empty() ? nullptr : &m_scopes.back();
        const std::size_t annotated = skip_annotation(m_tokens, i);
        if (annotated != i) {
            return annotated - 1;
        }
        if (punct(t, "=")) {
            m_member_assigns = true;
        } else if (keyword(t, "class") || keyword(t, "interface") || keyword(t, "enum") ||
                   (identifier(t) && t.spelling == "record" && i + 1 < m_tokens.size() &&
                    identifier(m_tokens[i + 1]))) {
            m_member_declares_type = true;
        }
        if (punct(t, ";")) {
            if (scope != nullptr) {
                scope->enum_constants = false;
            }
            start_member(i + 1);
        } else if (punct(t, ",") && scope != nullptr && scope->enum_constants) {
            start_member(i + 1);
        } else if (punct(t, "}")) {
            if (!m_scopes.empty()) {
                m_scopes.pop_back();
            }
            start_member(i + 1);
        } else if (punct(t, "(")) {
            return open_parenthesis(i);
        } else if (punct(t, "{")) {
            open_brace(i);
        }
        return i;
    }

    // Start a new member at `at`: what the previous one declared or assigned is forgotten.
    void start_member(std::size_t at) {
        m_member_start = at;
        m_member_assigns = false;
        m_member_declares_type = false;
    }

    std::size_t open_parenthesis(std::size_t i) {
        if (m_member_declares_type) {
            return i; // a record's components: its body opens a type below
        }
        const std::size_t close = match(m_tokens, i);
        const Scope* scope = m_scopes.empty() ? nullptr : &m_scopes.back();
        const bool candidate = i > m_member_start && identifier(m_tokens[i - 1]) &&
                               !m_member_assigns && !(scope != nullptr && scope->enum_constants);
        if (!candidate || close >= m_tokens.size()) {
            return std::min(close, m_tokens.size() - 1);
        }
        // After the list: array dimensions of old-style results, a throws clause, then a body.
        std::size_t k = close + 1;
        while (k + 1 < m_tokens.size() && punct(m_tokens[k], "[") && punct(m_tokens[k + 1], "]")) {
            k += 2;
        }
        if (k < m_tokens.size() && keyword(m_tokens[k], "throws")) {
            ++k;
            while (k < m_tokens.size() && !punct(m_tokens[k], "{") && !punct(m_tokens[k], ";") &&
                   !punct(m_tokens[k], "}") && !punct(m_tokens[k], "(")) {
                ++k;
            }
        }
        if (k >= m_tokens.size() || !punct(m_tokens[k], "{")) {
            return close; // a declaration without a body, or not a method at all
        }
        const std::size_t name = i - 1;
        LexicalFunction function;
        function.first = m_member_start;
        function.name = name;
        function.has_name = true;
        function.body_open = k;
        function.qualified_name =
            qualified_java_name(m_package, type_names(), m_tokens[name].spelling);
        const Parameters parameters = describe_parameters(m_tokens, i, close);
        function.signature = parameters.signature;
        const bool constructor = scope != nullptr && scope->name == m_tokens[name].spelling;
        const bool is_void = name > 0 && keyword(m_tokens[name - 1], "void");
        function.potential_operands = parameters.count + (constructor || is_void ? 0 : 1);
        open_function(function, k);
        return k;
    }

    void open_function(const LexicalFunction& function, std::size_t body) {
        m_open = function;
        m_open.body_open = body;
        m_scopes.push_back({ScopeKind::function_body, {}, false, false, {}, 0});
    }

    void open_brace(std::size_t i) {
        Scope* scope = m_scopes.empty() ? nullptr : &m_scopes.back();
        if (scope != nullptr && scope->enum_constants) {
            // An enum constant with a body: a class body named after the constant.
            std::string name;
            for (std::size_t k = m_member_start; k < i; ++k) {
                if (identifier(m_tokens[k])) {
                    name = m_tokens[k].spelling;
                    break;
                }
            }
            m_scopes.push_back({ScopeKind::type_body, name, false, false, {}, 0});
            start_member(i + 1);
            return;
        }
        // Modifiers and annotations aside, what does the member say before its brace?
        std::vector<std::size_t> words;
        for (std::size_t k = m_member_start; k < i; ++k) {
            const std::size_t after = skip_annotation(m_tokens, k);
            if (after != k) {
                k = after - 1;
                continue;
            }
            if (!is_modifier(m_tokens[k])) {
                words.push_back(k);
            }
        }
        for (std::size_t w = 0; w < words.size(); ++w) {
            const JavaToken& word = m_tokens[words[w]];
            const bool declares = keyword(word, "class") || keyword(word, "enum") ||
                                  keyword(word, "interface") ||
                                  (identifier(word) && word.spelling == "record" &&
                                   w + 1 < words.size() && identifier(m_tokens[words[w + 1]]));
            if (declares && !m_member_assigns) {
                open_type(words, w, i);
                return;
            }
        }
        if (words.empty() && scope != nullptr) {
            // An initializer block: `{ ... }` or `static { ... }` in a type body.
            std::size_t static_at = k_npos;
            for (std::size_t k = m_member_start; k < i && static_at == k_npos; ++k) {
                static_at = keyword(m_tokens[k], "static") ? k : k_npos;
            }
            LexicalFunction function;
            function.first = static_at == k_npos ? i : static_at;
            function.body_open = i;
            function.qualified_name = qualified_java_name(
                m_package, type_names(),
                static_at == k_npos ? k_instance_initializer_name : k_static_initializer_name);
            open_function(function, i);
            return;
        }
        if (scope != nullptr && scope->is_record && words.size() == 1 &&
            identifier(m_tokens[words[0]]) && m_tokens[words[0]].spelling == scope->name) {
            LexicalFunction function;
            function.first = m_member_start;
            function.name = words[0];
            function.has_name = true;
            function.body_open = i;
            function.qualified_name = qualified_java_name(m_package, type_names(), scope->name);
            function.signature = scope->record_signature;
            function.potential_operands = scope->record_components;
            open_function(function, i);
            return;
        }
        m_scopes.push_back({ScopeKind::block, {}, false, false, {}, 0});
    }

    void open_type(const std::vector<std::size_t>& words, std::size_t w, std::size_t brace) {
        Scope scope;
        scope.kind = ScopeKind::type_body;
        const JavaToken& word = m_tokens[words[w]];
        if (w + 1 < words.size() && identifier(m_tokens[words[w + 1]])) {
            scope.name = m_tokens[words[w + 1]].spelling;
        }
        scope.enum_constants = keyword(word, "enum");
        scope.is_record = word.spelling == "record";
        if (scope.is_record) {
            for (std::size_t k = words[w]; k < brace; ++k) {
                if (punct(m_tokens[k], "(")) {
                    const std::size_t close = match(m_tokens, k);
                    const Parameters components = describe_parameters(m_tokens, k, close);
                    scope.record_signature = components.signature;
                    scope.record_components = components.count;
                    break;
                }
            }
        }
        m_scopes.push_back(std::move(scope));
        start_member(brace + 1);
    }

    const std::vector<JavaToken>& m_tokens;
    std::string m_package;
    std::vector<Scope> m_scopes;
    std::size_t m_member_start = 0;
    bool m_member_assigns = false;       // the current member has an `=` (a field initializer)
    bool m_member_declares_type = false; // the current member declares a class, enum, record ...
    LexicalFunction m_open;
    std::vector<LexicalFunction> m_found;
};

// Pre-decided forms of punctuation, from a pass over the function's tokens.
struct LexicalForms {
    std::vector<core::Form> form;   // per token of the range, Form::plain when nothing special
    std::vector<bool> in_type_list; // per token of the range: inside a type argument list
};

bool type_like_before(const std::vector<JavaToken>& tokens, std::size_t at, std::size_t first,
                      const NameTable& names) {
    if (at == first) {
        return true;
    }
    const JavaToken& previous = tokens[at - 1];
    if (punct(previous, ".") || is_modifier(previous) || punct(previous, "(") ||
        punct(previous, ",") || punct(previous, "<")) {
        return true;
    }
    return identifier(previous) &&
           (names.types.count(previous.spelling) != 0 || looks_like_type_name(previous.spelling));
}

LexicalForms decide_forms(const std::vector<JavaToken>& tokens, std::size_t first, std::size_t last,
                          const NameTable& names) {
    LexicalForms forms;
    forms.form.assign(last - first + 1, core::Form::plain);
    forms.in_type_list.assign(last - first + 1, false);
    auto form = [&](std::size_t k) -> core::Form& { return forms.form[k - first]; };
    // Type argument and parameter lists: `<` after a type-like token, closed by >, >> or >>>
    // with nothing but type tokens between.
    for (std::size_t i = first; i <= last; ++i) {
        if (!punct(tokens[i], "<") || form(i) != core::Form::plain ||
            !type_like_before(tokens, i, first, names)) {
            continue;
        }
        int depth = 0;
        std::size_t k = i;
        bool closed = false;
        const std::size_t limit = std::min(last, i + k_max_type_list_tokens);
        for (; k <= limit; ++k) {
            const JavaToken& t = tokens[k];
            if (punct(t, "<")) {
                ++depth;
            } else if (punct(t, ">")) {
                depth -= 1;
            } else if (punct(t, ">>")) {
                depth -= 2;
            } else if (punct(t, ">>>")) {
                depth -= 3;
            } else if (!(identifier(t) || is_primitive(t) || keyword(t, "extends") ||
                         keyword(t, "super") || punct(t, ",") || punct(t, ".") || punct(t, "?") ||
                         punct(t, "&") || punct(t, "[") || punct(t, "]"))) {
                break;
            }
            if (depth <= 0) {
                closed = true;
                break;
            }
        }
        if (!closed) {
            continue;
        }
        for (std::size_t m = i; m <= k; ++m) {
            const JavaToken& t = tokens[m];
            forms.in_type_list[m - first] = true;
            if (punct(t, "<")) {
                form(m) = core::Form::template_open;
            } else if (punct(t, ">") || punct(t, ">>") || punct(t, ">>>")) {
                form(m) = core::Form::pair_close;
            } else if (punct(t, "?")) {
                form(m) = core::Form::wildcard;
            } else if (punct(t, "&")) {
                form(m) = core::Form::type_bound;
            }
        }
        i = k;
    }
    std::size_t open_conditionals = 0;
    std::size_t catch_close = k_npos;
    for (std::size_t i = first; i <= last; ++i) {
        const JavaToken& t = tokens[i];
        if (form(i) != core::Form::plain || t.kind != core::LexKind::punctuation) {
            if (keyword(t, "catch") && i + 1 <= last && punct(tokens[i + 1], "(")) {
                catch_close = match(tokens, i + 1);
            }
            continue;
        }
        const JavaToken* previous = i > first ? &tokens[i - 1] : nullptr;
        const bool after_operand =
            previous != nullptr &&
            (identifier(*previous) || previous->kind == core::LexKind::literal ||
             punct(*previous, ")") || punct(*previous, "]") ||
             (previous->kind == core::LexKind::keyword &&
              core::is_java_operand_keyword(previous->spelling)));
        const std::string& s = t.spelling;
        if (s == "?") {
            ++open_conditionals;
        } else if (s == ":" && open_conditionals > 0) {
            --open_conditionals;
            form(i) = core::Form::pair_close;
        } else if (s == "+" || s == "-") {
            form(i) = after_operand ? core::Form::binary : core::Form::unary;
        } else if (s == "++" || s == "--") {
            form(i) = after_operand ? core::Form::postfix : core::Form::prefix;
        } else if (s == "|" && catch_close != k_npos && i < catch_close) {
            form(i) = core::Form::multi_catch;
        } else if (s == "->") {
            for (std::size_t k = i; k-- > first;) {
                const JavaToken& back = tokens[k];
                if (keyword(back, "case") || keyword(back, "default")) {
                    form(i) = core::Form::case_arrow;
                    break;
                }
                if (punct(back, ";") || punct(back, "{") || punct(back, "}") || punct(back, "(") ||
                    punct(back, ":") || punct(back, "->")) {
                    break;
                }
            }
        }
    }
    return forms;
}

core::NameKind lexical_name_kind(const std::vector<JavaToken>& tokens, std::size_t i,
                                 std::size_t first, std::size_t last, const NameTable& names,
                                 const LexicalForms& forms) {
    const JavaToken* previous = i > first ? &tokens[i - 1] : nullptr;
    const JavaToken* next = i < last ? &tokens[i + 1] : nullptr;
    const std::string& name = tokens[i].spelling;
    if (previous != nullptr && punct(*previous, "::")) {
        return core::NameKind::function;
    }
    if (previous != nullptr && keyword(*previous, "new")) {
        return core::NameKind::type;
    }
    // Every part of a qualified type after `new` (`new java.util.ArrayList<>()`) names a type;
    // the walk back is bounded so a long chain of names stays linear.
    for (std::size_t k = i, steps = 0; k >= first + 2 && steps < 64; k -= 2, ++steps) {
        if (!punct(tokens[k - 1], ".") || !identifier(tokens[k - 2])) {
            break;
        }
        if (k - 2 > first && keyword(tokens[k - 3], "new")) {
            return core::NameKind::type;
        }
    }
    if (next != nullptr && punct(*next, "(")) {
        return core::NameKind::function;
    }
    if (forms.in_type_list[i - first]) {
        return core::NameKind::type; // every name in a type argument list names a type
    }
    if (next != nullptr && (punct(*next, ".") || punct(*next, "::"))) {
        core::Basis basis = core::Basis::lexical;
        return qualifier_kind(names, name, basis);
    }
    if (next != nullptr &&
        (identifier(*next) || punct(*next, "...") ||
         (punct(*next, "<") && forms.form[i + 1 - first] == core::Form::template_open) ||
         (punct(*next, "[") && i + 2 <= last && punct(tokens[i + 2], "]")))) {
        return core::NameKind::type;
    }
    if (previous != nullptr && forms.form[i - 1 - first] == core::Form::template_open) {
        return core::NameKind::type;
    }
    if (previous != nullptr && (punct(*previous, ",") || punct(*previous, "&")) &&
        names.types.count(name) != 0 && names.values.count(name) == 0) {
        return core::NameKind::type;
    }
    if (names.values.count(name) == 0 && names.types.count(name) != 0) {
        return core::NameKind::type;
    }
    return core::NameKind::value;
}

} // namespace

std::vector<LexicalFunction> scan_java_definitions(const std::vector<JavaToken>& tokens) {
    return DefinitionScan(tokens).run();
}

NameTable lexical_names(const std::vector<JavaToken>& tokens) {
    NameTable names;
    for (std::size_t i = 0; i + 1 < tokens.size(); ++i) {
        const JavaToken& t = tokens[i];
        const JavaToken& next = tokens[i + 1];
        if ((keyword(t, "class") || keyword(t, "interface") || keyword(t, "enum") ||
             keyword(t, "new") || keyword(t, "extends") || keyword(t, "implements") ||
             keyword(t, "throws")) &&
            identifier(next)) {
            names.types.insert(next.spelling);
        } else if (identifier(t) && identifier(next)) {
            names.types.insert(t.spelling); // `Type name`
            if (i + 2 < tokens.size() && (punct(tokens[i + 2], "=") || punct(tokens[i + 2], ";") ||
                                          punct(tokens[i + 2], ",") || punct(tokens[i + 2], ")") ||
                                          punct(tokens[i + 2], ":"))) {
                names.values.insert(next.spelling);
            }
        } else if ((is_primitive(t) || punct(t, "]") || punct(t, ">")) && identifier(next)) {
            names.values.insert(next.spelling);
        } else if (keyword(t, "import") && !keyword(next, "static")) {
            std::size_t k = i + 1;
            while (k + 1 < tokens.size() && !punct(tokens[k + 1], ";")) {
                ++k;
            }
            if (k < tokens.size() && identifier(tokens[k])) {
                names.types.insert(tokens[k].spelling);
            }
        }
    }
    return names;
}

core::TokenList classify_java_lexically(const std::vector<JavaToken>& tokens, std::size_t first,
                                        std::size_t last, std::size_t defined,
                                        const NameTable& names,
                                        const core::Convention& convention) {
    core::TokenList counted;
    if (first > last || last >= tokens.size()) {
        return counted;
    }
    const LexicalForms forms = decide_forms(tokens, first, last, names);
    for (std::size_t i = first; i <= last; ++i) {
        const JavaToken& t = tokens[i];
        core::RawToken raw;
        raw.spelling = t.spelling;
        raw.kind = t.kind;
        raw.line = t.line;
        raw.basis = core::Basis::lexical;
        raw.form = forms.form[i - first];
        if (punct(t, "@") && i + 1 <= last && identifier(tokens[i + 1])) {
            // An annotation: `@` and its whole name are one operator.
            std::size_t k = i + 1;
            raw.spelling = "@" + tokens[k].spelling;
            while (k + 2 <= last && punct(tokens[k + 1], ".") && identifier(tokens[k + 2])) {
                raw.spelling += "." + tokens[k + 2].spelling;
                k += 2;
            }
            raw.kind = core::LexKind::identifier;
            raw.name = core::NameKind::annotation;
            i = k;
        } else if (t.kind == core::LexKind::identifier) {
            raw.name = i == defined ? core::NameKind::defined
                                    : lexical_name_kind(tokens, i, first, last, names, forms);
        }
        if (auto token = core::classify_java_token(raw, convention)) {
            counted.push_back(std::move(*token));
        }
    }
    return counted;
}

std::vector<FoundFunction> measure_lexically(const JavaScan& scan,
                                             const core::Convention& convention) {
    std::vector<FoundFunction> found;
    const NameTable names = lexical_names(scan.tokens);
    for (const LexicalFunction& function : scan_java_definitions(scan.tokens)) {
        FoundFunction item;
        lexer::FunctionSpan& span = item.span;
        span.qualified_name = function.qualified_name;
        span.signature = function.signature;
        span.potential_operands = function.potential_operands;
        span.start_line = scan.tokens[function.first].line;
        span.end_line = scan.tokens[function.body_close].line;
        span.mode = lexer::ExtentMode::lexical;
        const std::size_t begin = convention.body_only ? function.body_open : function.first;
        span.tokens = classify_java_lexically(
            scan.tokens, begin, function.body_close,
            function.has_name ? function.name : scan.tokens.size(), names, convention);
        item.first_offset = scan.tokens[function.first].offset;
        item.last_offset = scan.tokens[function.body_close].offset;
        found.push_back(std::move(item));
    }
    return found;
}

} // namespace tollgate::java
