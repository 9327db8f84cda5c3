// SPDX-License-Identifier: MIT
// The Java front end of a build without tree-sitter (TOLLGATE_JAVA=OFF): Java files are named and
// skipped, never guessed at.
#include "gate/java/java_front_end.hpp"

namespace tollgate::java {

bool java_available() {
    return false;
}

std::string java_status() {
    return "java: off (built with TOLLGATE_JAVA=OFF: .java files are skipped)";
}

std::string build_fingerprint(const core::Convention& convention) {
    return core::combined_fingerprint(convention, false);
}

lexer::FileFunctions lex_java_file(const SourceFile& file, const core::Convention&) {
    lexer::FileFunctions result;
    result.path = file.path;
    result.warnings.push_back(
        {file.path, 0,
         "java is off in this build: not measured (rebuild with -DTOLLGATE_JAVA=ON and "
         "libtree-sitter-dev)"});
    return result;
}

} // namespace tollgate::java
