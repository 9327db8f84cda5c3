// SPDX-License-Identifier: MIT
// The Java lexical path, first half: methods, constructors and initializers found from braces.
#include "gate/java/java_lexical.hpp"
#include "gate/java/java_lexical_tokens.hpp"

namespace tollgate::java {

namespace {

using namespace lexical;

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

} // namespace

std::vector<LexicalFunction> scan_java_definitions(const std::vector<JavaToken>& tokens) {
    return DefinitionScan(tokens).run();
}

} // namespace tollgate::java
