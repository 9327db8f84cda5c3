// SPDX-License-Identifier: MIT
// Precompiled standard headers: built once per libclang version, language and flags, reused.
#include "gate/lexer/pch_cache.hpp"

#include "gate/common/fnv_digest.hpp"
#include "gate/lexer/clang_handles.hpp"

#include <atomic>
#include <cerrno>
#include <cstdint>
#include <cstdio>
#include <fcntl.h>
#include <filesystem>
#include <fstream>
#include <map>
#include <mutex>
#include <spdlog/spdlog.h>
#include <sstream>
#include <sys/file.h>
#include <thread>
#include <unistd.h>

namespace tollgate::lexer {

namespace {

namespace fs = std::filesystem;

constexpr const char* k_c_headers[] = {"stdio.h",  "stdlib.h",  "string.h", "stdint.h",
                                       "stddef.h", "stdbool.h", "math.h",   "ctype.h",
                                       "errno.h",  "limits.h",  "assert.h"};

constexpr const char* k_cxx_headers[] = {
    "vector",     "string",   "map",           "memory",    "algorithm", "iostream",
    "functional", "optional", "unordered_map", "utility",   "cstdint",   "cstring",
    "cstdlib",    "cstdio",   "cmath",         "array",     "set",       "unordered_set",
    "deque",      "list",     "sstream",       "stdexcept", "tuple",     "type_traits",
    "limits",     "iterator", "numeric",       "chrono",    "mutex",     "atomic",
    "cassert",    "cstddef",  "string_view",   "variant",   "fstream",   "thread"};

std::mutex g_mutex;
std::map<std::string, std::string> g_known; // base path -> path, empty when it could not be built
std::atomic<unsigned> g_builds{0};

// An exclusive flock on a file, held for the object's life (no lock when the file cannot be made).
class FolderLock {
public:
    explicit FolderLock(const std::string& path)
        : m_fd(::open(path.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0644)) {
        while (m_fd >= 0 && ::flock(m_fd, LOCK_EX) != 0 && errno == EINTR) {
        }
    }
    ~FolderLock() {
        if (m_fd >= 0) {
            ::close(m_fd); // releases the lock
        }
    }
    FolderLock(const FolderLock&) = delete;
    FolderLock& operator=(const FolderLock&) = delete;

private:
    int m_fd;
};

bool is_cxx(const std::vector<std::string>& flags) {
    for (std::size_t i = 0; i + 1 < flags.size(); ++i) {
        if (flags[i] == "-x") {
            return flags[i + 1] == "c++";
        }
    }
    return true;
}

std::string prefix_text(bool cxx) {
    std::ostringstream out;
    out << "// Tollgate's precompiled standard headers (generated).\n";
    if (cxx) {
        for (const char* header : k_cxx_headers) {
            out << "#if __has_include(<" << header << ">)\n#include <" << header << ">\n#endif\n";
        }
    } else {
        for (const char* header : k_c_headers) {
            out << "#if __has_include(<" << header << ">)\n#include <" << header << ">\n#endif\n";
        }
    }
    return out.str();
}

// The arguments that precompile a header for parses with `flags` and then `more`: the language
// of `-x` as a header, warnings off.
std::vector<std::string> header_arguments(const std::vector<std::string>& flags, bool cxx,
                                          const std::vector<std::string>& more) {
    std::vector<std::string> args;
    for (std::size_t i = 0; i < flags.size(); ++i) {
        if (flags[i] == "-x" && i + 1 < flags.size()) {
            args.push_back("-x");
            args.push_back(cxx ? "c++-header" : "c-header");
            ++i;
            continue;
        }
        args.push_back(flags[i]);
    }
    args.push_back("-w");
    args.insert(args.end(), more.begin(), more.end());
    return args;
}

// Build the header at `path` from the prefix at `prefix_path` with `flags` and then `more`
// arguments, over the in-memory `unsaved` files; return true on success.
bool build(const std::vector<std::string>& flags, bool cxx, const std::string& prefix_path,
           const std::string& path, const std::vector<std::string>& more = {},
           const std::vector<CXUnsavedFile>& unsaved = {}) {
    const std::vector<std::string> args = header_arguments(flags, cxx, more);
    std::vector<const char*> argv;
    for (const std::string& arg : args) {
        argv.push_back(arg.c_str());
    }
    IndexHandle index(clang_createIndex(0, 0));
    CXTranslationUnit raw = nullptr;
    const CXErrorCode code = clang_parseTranslationUnit2(
        index.get(), prefix_path.c_str(), argv.data(), static_cast<int>(argv.size()),
        const_cast<CXUnsavedFile*>(unsaved.data()), static_cast<unsigned>(unsaved.size()),
        CXTranslationUnit_ForSerialization | CXTranslationUnit_DetailedPreprocessingRecord, &raw);
    TranslationUnitHandle unit(raw);
    if (code != CXError_Success || !unit) {
        spdlog::debug("precompiled header: parse of \"{}\" failed with code {}", prefix_path,
                      static_cast<int>(code));
        return false;
    }
    const unsigned count = clang_getNumDiagnostics(unit.get());
    for (unsigned i = 0; i < count; ++i) {
        DiagnosticHandle diagnostic(clang_getDiagnostic(unit.get(), i));
        if (clang_getDiagnosticSeverity(diagnostic.get()) >= CXDiagnostic_Error) {
            spdlog::debug("precompiled header: {}",
                          take_string(clang_getDiagnosticSpelling(diagnostic.get())));
            return false;
        }
    }
    // Write under a temporary name, then rename: a killed run leaves no half-written header.
    std::ostringstream temporary;
    temporary << path << ".tmp." << ::getpid() << "."
              << std::hash<std::thread::id>{}(std::this_thread::get_id());
    const int saved = clang_saveTranslationUnit(unit.get(), temporary.str().c_str(),
                                                clang_defaultSaveOptions(unit.get()));
    if (saved != CXSaveError_None) {
        spdlog::debug("precompiled header: save to \"{}\" failed with code {}", temporary.str(),
                      saved);
        std::error_code ignored;
        fs::remove(temporary.str(), ignored);
        return false;
    }
    std::error_code error;
    fs::rename(temporary.str(), path, error);
    if (error) {
        spdlog::debug("precompiled header: rename to \"{}\" failed: {}", path, error.message());
        fs::remove(temporary.str(), error);
        return false;
    }
    ++g_builds;
    return true;
}

// Write `text` to `prefix_path` unless it holds it already (a precompiled header records and
// checks its input files, so the prefix lives on disk); false when it cannot be written.
bool write_prefix(const std::string& prefix_path, const std::string& text) {
    std::ifstream existing(prefix_path, std::ios::binary);
    std::ostringstream current;
    current << existing.rdbuf();
    if (existing && current.str() == text) {
        return true;
    }
    existing.close();
    const std::string temporary = prefix_path + ".tmp." + std::to_string(::getpid());
    std::ofstream out(temporary, std::ios::binary | std::ios::trunc);
    out << text;
    out.close();
    std::error_code error;
    fs::rename(temporary, prefix_path, error);
    if (!out || error) {
        spdlog::debug("precompiled header: cannot write \"{}\"", prefix_path);
        return false;
    }
    return true;
}

// Return `base`.pch: remembered for this process, reused when on disk, else built from `text`
// (written to `base`.hpp or .h) with `flags`, `more` and `unsaved` (see build) while holding
// `base`.lock, so that parser processes sharing the folder build it once. Return an empty string
// when it cannot be built, and remember that too. Call with g_mutex held.
std::string reuse_or_build(const std::string& base, const std::string& text,
                           const std::vector<std::string>& flags,
                           const std::vector<std::string>& more,
                           const std::vector<CXUnsavedFile>& unsaved) {
    if (auto found = g_known.find(base); found != g_known.end()) {
        return found->second;
    }
    std::string& result = g_known[base];
    const std::string path = base + ".pch";
    std::error_code error;
    const fs::path folder = fs::path(base).parent_path();
    fs::create_directories(folder, error);
    if (error) {
        spdlog::debug("precompiled header: cannot create \"{}\": {}", folder.string(),
                      error.message());
        return result;
    }
    if (fs::exists(path, error)) {
        result = path;
        return result;
    }
    // Parser processes share the folder: one builds, the others wait and then reuse its file.
    const FolderLock folder_lock(base + ".lock");
    if (fs::exists(path, error)) {
        result = path;
        return result;
    }
    const bool cxx = is_cxx(flags);
    const std::string prefix_path = base + (cxx ? ".hpp" : ".h");
    if (write_prefix(prefix_path, text) && build(flags, cxx, prefix_path, path, more, unsaved)) {
        result = path;
    }
    return result;
}

} // namespace

std::string precompiled_header(const std::vector<std::string>& language_flags,
                               const std::string& cache_dir) {
    if (cache_dir.empty()) {
        return {};
    }
    std::string key = take_string(clang_getClangVersion());
    for (const std::string& flag : language_flags) {
        key += '\x1f' + flag;
    }
    char name[32];
    std::snprintf(name, sizeof name, "%016llx", static_cast<unsigned long long>(fnv_digest(key)));
    std::lock_guard<std::mutex> lock(g_mutex);
    const std::string base = (fs::path(cache_dir) / (std::string("tollgate-std-") + name)).string();
    return reuse_or_build(base, prefix_text(is_cxx(language_flags)), language_flags, {}, {});
}

std::string shared_header_pch(const std::vector<std::string>& language_flags,
                              const std::vector<std::string>& other_args,
                              const SharedIncludes& shared,
                              const std::vector<CXUnsavedFile>& unsaved,
                              const std::string& folder) {
    if (folder.empty()) {
        return {};
    }
    FnvDigest key;
    key.add_field(take_string(clang_getClangVersion()));
    for (const std::string& flag : language_flags) {
        key.add_field(flag);
    }
    key.add_field("\x1e");
    for (const std::string& arg : other_args) {
        key.add_field(arg);
    }
    key.add_field(std::to_string(shared.digest));
    char name[48];
    std::snprintf(name, sizeof name, "tollgate-shared-%016llx",
                  static_cast<unsigned long long>(key.value()));
    std::string text = prefix_text(is_cxx(language_flags));
    text += "// The file's shared headers.\n";
    for (const std::string& line : shared.lines) {
        text += line + '\n';
    }
    std::lock_guard<std::mutex> lock(g_mutex);
    return reuse_or_build((fs::path(folder) / name).string(), text, language_flags, other_args,
                          unsaved);
}

// True when libclang refused the precompiled header `unit` was parsed with (a fatal error
// about it), or gave no unit at all.
bool pch_refused(CXTranslationUnit unit) {
    if (unit == nullptr) {
        return true;
    }
    for (unsigned i = 0; i < clang_getNumDiagnostics(unit); ++i) {
        DiagnosticHandle diagnostic(clang_getDiagnostic(unit, i));
        if (clang_getDiagnosticSeverity(diagnostic.get()) != CXDiagnostic_Fatal) {
            continue;
        }
        const std::string text = take_string(clang_getDiagnosticSpelling(diagnostic.get()));
        if (text.find("precompiled") != std::string::npos ||
            text.find("PCH") != std::string::npos || text.find("AST file") != std::string::npos) {
            return true;
        }
    }
    return false;
}

void discard_precompiled_header(const std::string& path) {
    std::lock_guard<std::mutex> lock(g_mutex);
    for (auto& [key, known] : g_known) {
        if (known == path) {
            known.clear();
        }
    }
    std::error_code ignored;
    fs::remove(path, ignored);
}

unsigned precompiled_header_builds() {
    return g_builds.load();
}

} // namespace tollgate::lexer
