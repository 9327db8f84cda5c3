// SPDX-License-Identifier: MIT
// Plain value types that pass source text between the walker and the lexer.
#pragma once

#include <string>
#include <vector>

namespace tollgate {

// One file's bytes as stored at a revision (or in the working tree).
struct SourceFile {
    std::string path;    // path relative to the repository root, '/' separated
    std::string content; // the file's bytes, unmodified (BOM, CRLF and all)

    bool operator==(const SourceFile& other) const {
        return path == other.path && content == other.content;
    }
};

// Return the extension of `path`'s last component, lowercased and with its dot (".cpp"), or
// empty when it has none.
std::string lower_extension(const std::string& path);

// Return true when `path` has an extension Tollgate measures as C or C++ (.c .cc .cpp .cxx .c++
// .h .hh .hpp .hxx .inl .ipp .tpp, case-insensitive).
bool is_c_family_path(const std::string& path);

// Return true when `path` has the extension Tollgate measures as Java (.java, case-insensitive).
bool is_java_path(const std::string& path);

// Return true when `path` is a file some front end measures: C/C++ (is_c_family_path) or Java
// (is_java_path). A Java file is still listed when this build has no Java front end, so that the
// run can say so.
bool is_measured_path(const std::string& path);

// Return true when `path` is a header (.h .hh .hpp .hxx .inl .ipp .tpp), supplied to the parser
// as an in-memory file.
bool is_header_path(const std::string& path);

} // namespace tollgate
