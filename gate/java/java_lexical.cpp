// SPDX-License-Identifier: MIT
// The Java lexical path, second half: tokens classified from their neighbours, and the whole
// path for one file.
#include "gate/java/java_lexical.hpp"

#include "gate/java/java_lexical_tokens.hpp"
#include "tollgate/core/classify_java.hpp"

namespace tollgate::java {

namespace {

using namespace lexical;

// A type argument list is looked for within this many tokens of its `<` (real ones are short),
// so a run of unclosed `<` costs linear time.
constexpr std::size_t k_max_type_list_tokens = 256;

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

// Mark type argument and parameter lists in `forms`: a `<` after a type-like token, closed by
// >, >> or >>> with nothing but type tokens between.
void mark_type_lists(const std::vector<JavaToken>& tokens, std::size_t first, std::size_t last,
                     const NameTable& names, LexicalForms& forms) {
    auto form = [&](std::size_t k) -> core::Form& { return forms.form[k - first]; };
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
}

// Mark the forms of the other punctuators that have several: the conditional's `:`, unary and
// binary `+ -`, prefix and postfix `++ --`, a multi-catch `|`, a switch rule's `->`.
void mark_operator_forms(const std::vector<JavaToken>& tokens, std::size_t first, std::size_t last,
                         LexicalForms& forms) {
    auto form = [&](std::size_t k) -> core::Form& { return forms.form[k - first]; };
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
}

LexicalForms decide_forms(const std::vector<JavaToken>& tokens, std::size_t first, std::size_t last,
                          const NameTable& names) {
    LexicalForms forms;
    forms.form.assign(last - first + 1, core::Form::plain);
    forms.in_type_list.assign(last - first + 1, false);
    mark_type_lists(tokens, first, last, names, forms);
    mark_operator_forms(tokens, first, last, forms);
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
