// SPDX-License-Identifier: MIT
// The Java front end: syntax tree first, the lexical scan for what the tree lost or must not see.
#include "gate/java/java_front_end.hpp"

#include "gate/java/java_lexical.hpp"
#include "gate/java/java_scan.hpp"
#include "gate/java/java_tree.hpp"

#include <algorithm>

namespace tollgate::java {

namespace {

// Measure the whole file lexically, with `reason` as the warning that says why.
lexer::FileFunctions measure_file_lexically(const SourceFile& file,
                                            const core::Convention& convention,
                                            const std::string& reason) {
    lexer::FileFunctions result;
    result.path = file.path;
    result.warnings.push_back({file.path, 0, reason});
    std::vector<FoundFunction> found = measure_lexically(scan_java(file.content), convention);
    result.lexically_recovered = static_cast<unsigned>(found.size());
    finish_functions(std::move(found), file.path, result);
    return result;
}

} // namespace

bool java_available() {
    return true;
}

std::string java_status() {
    return "java: on (" + tree_versions() + ", convention " + core::k_java_convention_name + ")";
}

std::string build_fingerprint(const core::Convention& convention) {
    return core::combined_fingerprint(convention, true);
}

lexer::FileFunctions lex_java_file(const SourceFile& file, const core::Convention& convention) {
    if (file.content.find('\0') != std::string::npos) {
        lexer::FileFunctions result;
        result.path = file.path;
        result.warnings.push_back(
            {file.path, 0, "binary content (a NUL byte) in a .java file: not measured"});
        return result;
    }
    if (file.content.size() > k_max_tree_bytes) {
        return measure_file_lexically(file, convention,
                                      "larger than " +
                                          std::to_string(k_max_tree_bytes / (1024 * 1024)) +
                                          " MiB: measured lexically, without a syntax tree");
    }
    if (!is_valid_utf8(file.content)) {
        return measure_file_lexically(file, convention,
                                      "not valid UTF-8: measured lexically, without a syntax tree");
    }
    TreeResult tree = measure_with_tree(file, convention, k_parse_timeout_ms);
    if (!tree.complete) {
        return measure_file_lexically(file, convention,
                                      "the parser gave up after " +
                                          std::to_string(k_parse_timeout_ms / 1000) +
                                          " s: measured lexically, without a syntax tree");
    }
    lexer::FileFunctions result;
    result.path = file.path;
    result.warnings = std::move(tree.problems);

    std::vector<FoundFunction> found = std::move(tree.functions);
    if (!tree.has_errors) {
        finish_functions(std::move(found), file.path, result);
        return result; // a tree without errors holds every function
    }
    // The lexical cross-check: definitions the tree lost to a syntax error are measured
    // lexically.
    const JavaScan scan = scan_java(file.content);
    const std::size_t from_tree = found.size();
    const NameTable names = lexical_names(scan.tokens);
    for (const LexicalFunction& function : scan_java_definitions(scan.tokens)) {
        const unsigned begin = scan.tokens[function.first].offset;
        const unsigned end = scan.tokens[function.body_close].offset;
        const bool known = std::any_of(
            found.begin(), found.begin() + static_cast<long>(from_tree),
            [&](const FoundFunction& f) { return begin < f.last_offset && f.first_offset <= end; });
        if (known) {
            continue;
        }
        FoundFunction item;
        item.span.qualified_name = function.qualified_name;
        item.span.signature = function.signature;
        item.span.potential_operands = function.potential_operands;
        item.span.start_line = scan.tokens[function.first].line;
        item.span.end_line = scan.tokens[function.body_close].line;
        item.span.mode = lexer::ExtentMode::lexical;
        const std::size_t first = convention.body_only ? function.body_open : function.first;
        item.span.tokens = classify_java_lexically(
            scan.tokens, first, function.body_close,
            function.has_name ? function.name : scan.tokens.size(), names, convention);
        item.first_offset = begin;
        item.last_offset = end;
        ++result.lexically_recovered;
        result.warnings.push_back({file.path, item.span.start_line,
                                   "function \"" + function.qualified_name +
                                       "\" measured lexically: the parser did not report it "
                                       "(check the syntax errors around it)"});
        found.push_back(std::move(item));
    }
    finish_functions(std::move(found), file.path, result);
    return result;
}

} // namespace tollgate::java
