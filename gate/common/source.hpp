// SPDX-License-Identifier: MIT
// Plain value types that pass source text between the walker and the lexer.
#pragma once

#include <cstdint>
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

// The default bound on the bytes of one file read for measuring: 16 MiB, above the largest
// hand-written or amalgamated C source commonly shipped (SQLite's single-file amalgamation is
// about 9 MB, from memory) and far below what fills a runner's memory. `--max-file-size` moves it.
inline constexpr std::uint64_t k_default_max_file_size = std::uint64_t{16} << 20;

// A file left unread because it is larger than the size limit; its size was asked of the file
// system or of git's object header, never by reading it.
struct OversizedFile {
    std::string path;       // repository-relative, '/' separated
    std::uint64_t size = 0; // its size in bytes

    bool operator==(const OversizedFile& other) const {
        return path == other.path && size == other.size;
    }
};

// A bound on the bytes read per file, and where the files over it are listed.
struct SizeLimit {
    std::uint64_t max_bytes = k_default_max_file_size; // 0: no bound
    std::vector<OversizedFile>* oversized = nullptr;   // receives each file left unread, if set

    // Return true when a file of `size` bytes is over the bound.
    bool refuses(std::uint64_t size) const { return max_bytes != 0 && size > max_bytes; }
};

// Return why a file of `size` bytes was left unread under `max_bytes`, for reports:
// "too large: 40.2 MiB, over the 16 MiB limit of --max-file-size".
std::string oversized_reason(std::uint64_t size, std::uint64_t max_bytes);

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
