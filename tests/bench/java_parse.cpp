// SPDX-License-Identifier: MIT
// Benchmark helper: the Java front end alone (tree-sitter parse, lexical cross-check, classify) on
// the files named on the command line, one thread, no git. Prints "files seconds".
#include "gate/java/java_front_end.hpp"

#include <chrono>
#include <cstdio>
#include <fstream>
#include <sstream>

int main(int argc, char** argv) {
    std::vector<tollgate::SourceFile> files;
    for (int i = 1; i < argc; ++i) {
        std::ifstream in(argv[i], std::ios::binary);
        std::ostringstream text;
        text << in.rdbuf();
        files.push_back({argv[i], text.str()});
    }
    const auto start = std::chrono::steady_clock::now();
    std::size_t functions = 0;
    for (const auto& file : files) {
        functions += tollgate::java::lex_java_file(file, {}).functions.size();
    }
    const std::chrono::duration<double> took = std::chrono::steady_clock::now() - start;
    std::printf("%zu %.4f %zu\n", files.size(), took.count(), functions);
    return 0;
}
