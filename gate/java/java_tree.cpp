// SPDX-License-Identifier: MIT
// The tree-sitter path of the Java front end: functions and classified tokens from a syntax tree.
// Every walk is iterative (a tree cursor and an explicit stack), so nesting depth costs memory,
// never the call stack.
#include "gate/java/java_tree.hpp"

#include "gate/java/java_scan.hpp"
#include "tollgate/core/classify_java.hpp"

#include <cstring>
#include <memory>
#include <optional>
#include <tree_sitter/api.h>

extern "C" const TSLanguage* tree_sitter_java(void);

namespace tollgate::java {

namespace {

// Syntax errors reported per file; the rest are summed up in one more warning.
constexpr std::size_t k_max_problems = 20;

struct ParserDeleter {
    void operator()(TSParser* parser) const { ts_parser_delete(parser); }
};
struct TreeDeleter {
    void operator()(TSTree* tree) const { ts_tree_delete(tree); }
};

// A tree cursor that is deleted with its scope.
class Cursor {
public:
    explicit Cursor(TSNode node) : m_cursor(ts_tree_cursor_new(node)) {}
    ~Cursor() { ts_tree_cursor_delete(&m_cursor); }
    Cursor(const Cursor&) = delete;
    Cursor& operator=(const Cursor&) = delete;
    TSTreeCursor* get() { return &m_cursor; }

private:
    TSTreeCursor m_cursor;
};

bool is(const char* type, const char* name) {
    return type != nullptr && std::strcmp(type, name) == 0;
}

bool is_any(const char* type, std::initializer_list<const char*> names) {
    for (const char* name : names) {
        if (is(type, name)) {
            return true;
        }
    }
    return false;
}

bool is_type_declaration(const char* type) {
    return is_any(type, {"class_declaration", "interface_declaration", "enum_declaration",
                         "record_declaration", "annotation_type_declaration"});
}

bool is_type_body(const char* type) {
    return is_any(type, {"class_body", "interface_body", "enum_body", "enum_body_declarations",
                         "annotation_type_body"});
}

bool is_comment(const char* type) {
    return is(type, "line_comment") || is(type, "block_comment");
}

bool is_word(const std::string& text) {
    if (text.empty()) {
        return false;
    }
    const auto c = static_cast<unsigned char>(text[0]);
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_' || c == '$' || c >= 0x80;
}

// One node on the path from the root to the cursor.
struct Frame {
    TSNode node;
    const char* type = nullptr;
    const char* field = nullptr; // its field name in its parent, or null
    unsigned index = 0;          // its position among its parent's children
    bool scope = false;          // it pushed a name onto the enclosing types
    bool function = false;       // it is the function being collected
};

class TreeWalker {
public:
    TreeWalker(const std::string& text, const core::Convention& convention)
        : m_text(text), m_convention(convention) {}

    TreeResult run(TSTree* tree) {
        TreeResult result;
        result.complete = true;
        const TSNode root = ts_tree_root_node(tree);
        result.has_errors = ts_node_has_error(root);
        collect_names(root, result);
        collect_functions(root, result);
        return result;
    }

private:
    std::string text_of(TSNode node) const {
        const unsigned begin = ts_node_start_byte(node);
        const unsigned end = ts_node_end_byte(node);
        if (begin >= end || end > m_text.size()) {
            return {};
        }
        return m_text.substr(begin, end - begin);
    }

    static unsigned line_of(TSNode node) { return ts_node_start_point(node).row + 1; }

    // The spellings of the leaves under `node`, comments and annotations left out.
    std::vector<std::string> leaf_spellings(TSNode node) const {
        std::vector<std::string> spellings;
        if (ts_node_is_null(node)) {
            return spellings;
        }
        Cursor cursor(node);
        for (;;) {
            const TSNode current = ts_tree_cursor_current_node(cursor.get());
            const char* type = ts_node_type(current);
            const bool skip = is_comment(type) || is(type, "marker_annotation") ||
                              is(type, "annotation") || ts_node_is_missing(current);
            if (!skip && (ts_node_child_count(current) == 0 || is(type, "string_literal"))) {
                std::string text = text_of(current);
                if (!text.empty()) {
                    spellings.push_back(std::move(text));
                }
            } else if (!skip && ts_tree_cursor_goto_first_child(cursor.get())) {
                continue;
            }
            while (!ts_tree_cursor_goto_next_sibling(cursor.get())) {
                if (!ts_tree_cursor_goto_parent(cursor.get())) {
                    return spellings;
                }
            }
        }
    }

    // First pass: the package, the names the file declares, and the syntax errors.
    void collect_names(TSNode root, TreeResult& result) {
        Cursor cursor(root);
        std::vector<Frame> path;
        std::size_t problems = 0;
        for (;;) {
            Frame frame;
            frame.node = ts_tree_cursor_current_node(cursor.get());
            frame.type = ts_node_type(frame.node);
            frame.field = ts_tree_cursor_current_field_name(cursor.get());
            note_name(frame, path);
            if (ts_node_is_missing(frame.node) || is(frame.type, "ERROR")) {
                if (++problems <= k_max_problems) {
                    const std::string missing = ts_node_is_missing(frame.node)
                                                    ? "missing \"" + std::string(frame.type) + "\""
                                                    : std::string("syntax error");
                    result.problems.push_back({{}, line_of(frame.node), missing});
                }
            }
            if (is(frame.type, "package_declaration")) {
                for (unsigned i = 0; i < ts_node_named_child_count(frame.node); ++i) {
                    const TSNode child = ts_node_named_child(frame.node, i);
                    if (!is_comment(ts_node_type(child)) && m_package.empty()) {
                        m_package = join_type_text(leaf_spellings(child));
                    }
                }
            }
            if (ts_tree_cursor_goto_first_child(cursor.get())) {
                path.push_back(frame);
                continue;
            }
            while (!ts_tree_cursor_goto_next_sibling(cursor.get())) {
                if (!ts_tree_cursor_goto_parent(cursor.get())) {
                    if (problems > k_max_problems) {
                        result.problems.push_back(
                            {{}, 0, std::to_string(problems - k_max_problems) + " more errors"});
                    }
                    return;
                }
                path.pop_back();
            }
        }
    }

    void note_name(const Frame& frame, const std::vector<Frame>& path) {
        if (path.empty()) {
            return;
        }
        const Frame& parent = path.back();
        if (is(frame.type, "type_identifier")) {
            m_names.types.insert(text_of(frame.node));
            return;
        }
        if (!is(frame.type, "identifier")) {
            return;
        }
        if (is(frame.field, "name") && is_type_declaration(parent.type)) {
            m_names.types.insert(text_of(frame.node));
        } else if (is(frame.field, "name") &&
                   is_any(parent.type, {"variable_declarator", "formal_parameter",
                                        "catch_formal_parameter", "enhanced_for_statement",
                                        "enum_constant", "resource", "instanceof_expression"})) {
            m_names.values.insert(text_of(frame.node));
        } else if (is(parent.type, "inferred_parameters") ||
                   (is(parent.type, "lambda_expression") && is(frame.field, "parameters"))) {
            m_names.values.insert(text_of(frame.node));
        } else if (is(parent.type, "scoped_identifier") && is(frame.field, "name") &&
                   path.size() >= 2 && is(path[path.size() - 2].type, "import_declaration")) {
            const std::string import_text = text_of(path[path.size() - 2].node);
            if (import_text.find("static") == std::string::npos) {
                m_names.types.insert(text_of(frame.node));
            }
        }
    }

    // Second pass: functions, their identity and their tokens.
    void collect_functions(TSNode root, TreeResult& result) {
        Cursor cursor(root);
        std::vector<Frame> path;
        for (;;) {
            Frame frame;
            frame.node = ts_tree_cursor_current_node(cursor.get());
            frame.type = ts_node_type(frame.node);
            frame.field = ts_tree_cursor_current_field_name(cursor.get());
            frame.index = path.empty() ? 0 : m_child_counter.back()++;
            bool descend = false;
            if (m_function) {
                descend = visit_inside(frame, path);
            } else {
                descend = visit_outside(frame, path);
            }
            if (descend && ts_tree_cursor_goto_first_child(cursor.get())) {
                path.push_back(frame);
                m_child_counter.push_back(0);
                continue;
            }
            leave(frame, result);
            while (!ts_tree_cursor_goto_next_sibling(cursor.get())) {
                if (!ts_tree_cursor_goto_parent(cursor.get())) {
                    return;
                }
                leave(path.back(), result);
                path.pop_back();
                m_child_counter.pop_back();
            }
        }
    }

    // Outside any function: open scopes and functions; return whether to look inside `frame`.
    bool visit_outside(Frame& frame, const std::vector<Frame>& path) {
        const char* type = frame.type;
        if (is(type, "program") || is(type, "ERROR") || is_type_body(type)) {
            return true;
        }
        if (is_type_declaration(type)) {
            const TSNode name = ts_node_child_by_field_name(frame.node, "name", 4);
            m_types.push_back(ts_node_is_null(name) ? std::string("(anonymous)") : text_of(name));
            m_records.push_back(is(type, "record_declaration") ? frame.node : TSNode{});
            frame.scope = true;
            return true;
        }
        if (is(type, "enum_constant")) {
            const TSNode body = ts_node_child_by_field_name(frame.node, "body", 4);
            if (ts_node_is_null(body)) {
                return false;
            }
            const TSNode name = ts_node_child_by_field_name(frame.node, "name", 4);
            m_types.push_back(text_of(name));
            m_records.push_back(TSNode{});
            frame.scope = true;
            return true;
        }
        const bool in_type_body = !path.empty() && is_type_body(path.back().type);
        if (is_any(type, {"method_declaration", "constructor_declaration"})) {
            const TSNode body = ts_node_child_by_field_name(frame.node, "body", 4);
            if (ts_node_is_null(body)) {
                return false; // abstract, interface or native: a declaration only
            }
            open_function(frame, body, text_of(ts_node_child_by_field_name(frame.node, "name", 4)));
            describe_parameters(ts_node_child_by_field_name(frame.node, "parameters", 10));
            const TSNode result = ts_node_child_by_field_name(frame.node, "type", 4);
            m_found.span.potential_operands +=
                !ts_node_is_null(result) && !is(ts_node_type(result), "void_type") ? 1 : 0;
            return true;
        }
        if (is(type, "compact_constructor_declaration")) {
            const TSNode body = ts_node_child_by_field_name(frame.node, "body", 4);
            if (ts_node_is_null(body)) {
                return false;
            }
            open_function(frame, body, text_of(ts_node_child_by_field_name(frame.node, "name", 4)));
            if (!m_records.empty() && !ts_node_is_null(m_records.back())) {
                describe_parameters(
                    ts_node_child_by_field_name(m_records.back(), "parameters", 10));
            }
            return true;
        }
        if (is(type, "static_initializer")) {
            TSNode body = frame.node;
            for (unsigned i = 0; i < ts_node_named_child_count(frame.node); ++i) {
                if (is(ts_node_type(ts_node_named_child(frame.node, i)), "block")) {
                    body = ts_node_named_child(frame.node, i);
                }
            }
            open_function(frame, body, k_static_initializer_name);
            return true;
        }
        if (is(type, "block") && in_type_body) {
            open_function(frame, frame.node, k_instance_initializer_name);
            return true;
        }
        return false;
    }

    void open_function(Frame& frame, TSNode body, const std::string& name) {
        m_function = true;
        frame.function = true;
        m_function_node = frame.node;
        m_found = FoundFunction{};
        m_found.span.qualified_name = qualified_java_name(m_package, m_types, name);
        m_found.span.start_line = line_of(frame.node);
        m_found.span.end_line = ts_node_end_point(frame.node).row + 1;
        m_found.span.mode = lexer::ExtentMode::syntax_tree;
        m_found.first_offset = ts_node_start_byte(frame.node);
        m_found.last_offset = ts_node_end_byte(frame.node);
        m_body_start = m_convention.body_only ? ts_node_start_byte(body) : m_found.first_offset;
    }

    void describe_parameters(TSNode parameters) {
        if (ts_node_is_null(parameters)) {
            return;
        }
        std::string signature;
        std::uint64_t count = 0;
        // A cursor walks the children in linear time (ts_node_named_child starts over each time).
        Cursor cursor(parameters);
        for (bool more = ts_tree_cursor_goto_first_child(cursor.get()); more;
             more = ts_tree_cursor_goto_next_sibling(cursor.get())) {
            const TSNode parameter = ts_tree_cursor_current_node(cursor.get());
            if (!ts_node_is_named(parameter)) {
                continue;
            }
            const char* type = ts_node_type(parameter);
            std::string text;
            if (is(type, "formal_parameter")) {
                text = join_type_text(
                    leaf_spellings(ts_node_child_by_field_name(parameter, "type", 4)));
                const TSNode dimensions = ts_node_child_by_field_name(parameter, "dimensions", 10);
                if (!ts_node_is_null(dimensions)) {
                    text += join_type_text(leaf_spellings(dimensions));
                }
            } else if (is(type, "spread_parameter")) {
                for (unsigned k = 0; k < ts_node_named_child_count(parameter) && k < 8; ++k) {
                    const TSNode part = ts_node_named_child(parameter, k);
                    const char* part_type = ts_node_type(part);
                    if (!is(part_type, "modifiers") && !is(part_type, "variable_declarator") &&
                        !is_comment(part_type)) {
                        text = join_type_text(leaf_spellings(part));
                    }
                }
                text += "...";
            } else {
                continue; // a receiver parameter (`Outer this`) or a comment
            }
            signature += (count == 0 ? "" : ", ") + text;
            ++count;
        }
        m_found.span.signature = signature;
        m_found.span.potential_operands = count;
        m_found.span.usr = "java:" + m_found.span.qualified_name + "(" + signature + ")";
    }

    // Inside a function: emit tokens; return whether to look inside `frame`.
    bool visit_inside(const Frame& frame, const std::vector<Frame>& path) {
        const char* type = frame.type;
        if (is_comment(type) || ts_node_is_missing(frame.node)) {
            return false;
        }
        if (ts_node_end_byte(frame.node) <= m_body_start) {
            return false; // the signature, when the convention counts the body only
        }
        const Frame& parent = path.back();
        if (is_any(parent.type, {"annotation", "marker_annotation"}) &&
            (is(frame.field, "name") || is(type, "@"))) {
            return false; // counted with the annotation itself
        }
        if (is(type, "marker_annotation") || is(type, "annotation")) {
            const TSNode name = ts_node_child_by_field_name(frame.node, "name", 4);
            std::string spelling = "@";
            for (const std::string& part : leaf_spellings(name)) {
                spelling += part;
            }
            emit(spelling, core::LexKind::identifier, core::NameKind::annotation, core::Form::plain,
                 core::Basis::syntax_tree, frame.node);
            return true;
        }
        if (is(type, "string_literal")) {
            emit(text_of(frame.node), core::LexKind::literal, core::NameKind::unknown,
                 core::Form::plain, core::Basis::spelling, frame.node);
            return false;
        }
        if (ts_node_child_count(frame.node) > 0) {
            return true;
        }
        if (ts_node_start_byte(frame.node) < m_body_start) {
            return false;
        }
        leaf(frame, path);
        return false;
    }

    void emit(std::string spelling, core::LexKind kind, core::NameKind name, core::Form form,
              core::Basis basis, TSNode node) {
        if (spelling.empty()) {
            return;
        }
        core::RawToken raw;
        raw.spelling = std::move(spelling);
        raw.kind = kind;
        raw.name = name;
        raw.form = form;
        raw.basis = basis;
        raw.line = line_of(node);
        if (auto token = core::classify_java_token(raw, m_convention)) {
            m_found.span.tokens.push_back(std::move(*token));
        }
    }

    void leaf(const Frame& frame, const std::vector<Frame>& path) {
        const char* type = frame.type;
        std::string spelling = text_of(frame.node);
        if (spelling.empty()) {
            return;
        }
        if (is(type, "ERROR")) {
            rescan(frame.node, spelling);
            return;
        }
        const Frame& parent = path.back();
        if (!ts_node_is_named(frame.node)) {
            if (is_word(spelling) || is(type, "@interface")) {
                emit(spelling, core::LexKind::keyword, core::NameKind::unknown, core::Form::plain,
                     core::Basis::spelling, frame.node);
            } else {
                emit(spelling, core::LexKind::punctuation, core::NameKind::unknown,
                     punctuation_form(spelling, frame, parent), core::Basis::syntax_tree,
                     frame.node);
            }
            return;
        }
        if (is(type, "identifier")) {
            core::Basis basis = core::Basis::syntax_tree;
            const core::NameKind kind = identifier_kind(spelling, frame, path, basis);
            emit(spelling, core::LexKind::identifier, kind, core::Form::plain, basis, frame.node);
            return;
        }
        if (is(type, "type_identifier")) {
            emit(spelling, core::LexKind::identifier, core::NameKind::type, core::Form::plain,
                 core::Basis::syntax_tree, frame.node);
            return;
        }
        if (is_any(type, {"this", "super", "true", "false", "null_literal", "void_type",
                          "boolean_type"}) ||
            core::is_java_keyword(spelling)) {
            emit(spelling, core::LexKind::keyword, core::NameKind::unknown, core::Form::plain,
                 core::Basis::spelling, frame.node);
            return;
        }
        const std::size_t length = std::strlen(type);
        if (length > 8 && std::strcmp(type + length - 8, "_literal") == 0) {
            emit(spelling, core::LexKind::literal, core::NameKind::unknown, core::Form::plain,
                 core::Basis::spelling, frame.node);
            return;
        }
        emit(spelling, is_word(spelling) ? core::LexKind::identifier : core::LexKind::punctuation,
             core::NameKind::value, core::Form::plain, core::Basis::spelling, frame.node);
    }

    // Text the parser could not place: the scanner splits it, and each piece counts by kind.
    void rescan(TSNode node, const std::string& text) {
        for (const JavaToken& token : scan_java(text).tokens) {
            core::RawToken raw;
            raw.spelling = token.spelling;
            raw.kind = token.kind;
            raw.name = core::NameKind::value;
            raw.basis = core::Basis::lexical;
            raw.line = line_of(node) + token.line - 1;
            if (auto counted = core::classify_java_token(raw, m_convention)) {
                m_found.span.tokens.push_back(std::move(*counted));
            }
        }
    }

    static core::Form punctuation_form(const std::string& s, const Frame& frame,
                                       const Frame& parent) {
        const char* p = parent.type;
        const bool type_list = is(p, "type_arguments") || is(p, "type_parameters");
        if (s == "<" && type_list) {
            return core::Form::template_open;
        }
        if (s == ">" && type_list) {
            return core::Form::pair_close;
        }
        if (s == "?" && is(p, "wildcard")) {
            return core::Form::wildcard;
        }
        if (s == ":" && is(p, "ternary_expression")) {
            return core::Form::pair_close;
        }
        if (s == "+" || s == "-") {
            return is(p, "unary_expression") ? core::Form::unary : core::Form::binary;
        }
        if (s == "++" || s == "--") {
            return frame.index == 0 ? core::Form::prefix : core::Form::postfix;
        }
        if (s == "&" && (is(p, "type_bound") || is(p, "cast_expression"))) {
            return core::Form::type_bound;
        }
        if (s == "|" && is(p, "catch_type")) {
            return core::Form::multi_catch;
        }
        if (s == "->" && is(p, "switch_rule")) {
            return core::Form::case_arrow;
        }
        return core::Form::plain;
    }

    core::NameKind identifier_kind(const std::string& spelling, const Frame& frame,
                                   const std::vector<Frame>& path, core::Basis& basis) const {
        const Frame& parent = path.back();
        const char* p = parent.type;
        const char* field = frame.field;
        if (is(p, "method_invocation") && is(field, "name")) {
            return core::NameKind::function;
        }
        if (is(p, "method_reference")) {
            if (frame.index > 0) {
                return core::NameKind::function;
            }
            return qualifier_kind(m_names, spelling, basis);
        }
        if (is_any(p, {"method_declaration", "constructor_declaration",
                       "compact_constructor_declaration"}) &&
            is(field, "name")) {
            return ts_node_eq(parent.node, m_function_node) ? core::NameKind::defined
                                                            : core::NameKind::function;
        }
        if (is_type_declaration(p) && is(field, "name")) {
            return core::NameKind::type;
        }
        if (is(p, "record_pattern") && frame.index == 0) {
            return core::NameKind::type;
        }
        const bool object =
            (is(p, "method_invocation") || is(p, "field_access")) && is(field, "object");
        bool inner_qualifier = false;
        if (is(p, "field_access") && is(field, "field") && path.size() >= 2) {
            const char* grand = path[path.size() - 2].type;
            inner_qualifier = (is(grand, "method_invocation") || is(grand, "field_access")) &&
                              is(parent.field, "object");
        }
        if (object || inner_qualifier) {
            return qualifier_kind(m_names, spelling, basis);
        }
        return core::NameKind::value;
    }

    void leave(const Frame& frame, TreeResult& result) {
        if (frame.scope) {
            m_types.pop_back();
            m_records.pop_back();
        }
        if (frame.function) {
            if (m_found.span.usr.empty()) {
                m_found.span.usr = "java:" + m_found.span.qualified_name + "()";
            }
            result.functions.push_back(std::move(m_found));
            m_found = FoundFunction{};
            m_function = false;
        }
    }

    const std::string& m_text;
    const core::Convention& m_convention;
    NameTable m_names;
    std::string m_package;
    std::vector<std::string> m_types; // enclosing types of the current position
    std::vector<TSNode> m_records;    // per enclosing type: its record node, or a null node
    std::vector<unsigned> m_child_counter{0};
    bool m_function = false;
    TSNode m_function_node{};
    FoundFunction m_found;
    unsigned m_body_start = 0;
};

} // namespace

TreeResult measure_with_tree(const SourceFile& file, const core::Convention& convention,
                             unsigned timeout_ms) {
    std::unique_ptr<TSParser, ParserDeleter> parser(ts_parser_new());
    TreeResult result;
    if (!parser || !ts_parser_set_language(parser.get(), tree_sitter_java())) {
        return result;
    }
    ts_parser_set_timeout_micros(parser.get(), static_cast<std::uint64_t>(timeout_ms) * 1000u);
    std::unique_ptr<TSTree, TreeDeleter> tree(
        ts_parser_parse_string(parser.get(), nullptr, file.content.data(),
                               static_cast<std::uint32_t>(file.content.size())));
    if (!tree) {
        return result;
    }
    result = TreeWalker(file.content, convention).run(tree.get());
    for (auto& problem : result.problems) {
        problem.path = file.path;
    }
    return result;
}

std::string tree_versions() {
    return "tree-sitter-java " TOLLGATE_JAVA_GRAMMAR_VERSION " (language ABI " +
           std::to_string(ts_language_version(tree_sitter_java())) + ")";
}

} // namespace tollgate::java
