// SPDX-License-Identifier: MIT
// The tree-sitter path of the Java front end (tree-sitter is used only here and in
// java_tree.cpp): functions and classified tokens from a syntax tree.
#pragma once

#include "gate/common/source.hpp"
#include "gate/java/java_names.hpp"
#include "tollgate/core/convention.hpp"

#include <string>
#include <vector>

namespace tollgate::java {

// What the syntax tree of one file gave.
struct TreeResult {
    bool complete = false;                   // false when the parser gave up (time limit)
    bool has_errors = false;                 // the tree holds syntax errors or missing tokens
    std::vector<FoundFunction> functions;    // methods, constructors and initializers with tokens
    std::vector<lexer::LexWarning> problems; // syntax errors (at most a few, then a count)
};

// Parse `file` with tree-sitter's Java grammar (at most `timeout_ms` milliseconds) and return
// every method, constructor, compact constructor and initializer block with a body that is not
// inside another one, with tokens classified under java/1 and `convention`'s switches.
// Lambdas, anonymous and local classes belong to the enclosing function; members of nested
// classes and of enum constants' bodies are functions of their own. Never throws for bad source.
TreeResult measure_with_tree(const SourceFile& file, const core::Convention& convention,
                             unsigned timeout_ms);

// Return the versions this path is built with, e.g. "tree-sitter-java 0.23.5 (language ABI 14)".
std::string tree_versions();

} // namespace tollgate::java
