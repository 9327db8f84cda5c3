// SPDX-License-Identifier: MIT
// libclang handles owned by std::unique_ptr, and the one place CXString becomes std::string.
#pragma once

#include <clang-c/Index.h>
#include <memory>
#include <string>
#include <type_traits>

namespace tollgate::lexer {

struct IndexDeleter {
    void operator()(void* index) const { clang_disposeIndex(index); }
};
struct TranslationUnitDeleter {
    void operator()(CXTranslationUnit unit) const { clang_disposeTranslationUnit(unit); }
};
struct DiagnosticDeleter {
    void operator()(void* diagnostic) const { clang_disposeDiagnostic(diagnostic); }
};
struct SourceRangeListDeleter {
    void operator()(CXSourceRangeList* list) const { clang_disposeSourceRangeList(list); }
};

using IndexHandle = std::unique_ptr<void, IndexDeleter>;
using TranslationUnitHandle =
    std::unique_ptr<std::remove_pointer_t<CXTranslationUnit>, TranslationUnitDeleter>;
using DiagnosticHandle = std::unique_ptr<void, DiagnosticDeleter>;
using SourceRangeListHandle = std::unique_ptr<CXSourceRangeList, SourceRangeListDeleter>;

// The tokens of one range, disposed with the unit that made them.
class TokenArray {
public:
    TokenArray(CXTranslationUnit unit, CXSourceRange range) : m_unit(unit) {
        clang_tokenize(unit, range, &m_tokens, &m_count);
    }
    ~TokenArray() {
        if (m_tokens != nullptr) {
            clang_disposeTokens(m_unit, m_tokens, m_count);
        }
    }
    TokenArray(const TokenArray&) = delete;
    TokenArray& operator=(const TokenArray&) = delete;
    CXToken* data() const { return m_tokens; }
    unsigned size() const { return m_count; }

private:
    CXTranslationUnit m_unit = nullptr;
    CXToken* m_tokens = nullptr;
    unsigned m_count = 0;
};

// Return the text of `text` and dispose it; a null string gives an empty one.
inline std::string take_string(CXString text) {
    const char* chars = clang_getCString(text);
    std::string result = chars != nullptr ? chars : "";
    clang_disposeString(text);
    return result;
}

// Return the expansion offset of `location` and its file.
inline unsigned expansion_offset(CXSourceLocation location, CXFile* file = nullptr) {
    unsigned offset = 0;
    clang_getExpansionLocation(location, file, nullptr, nullptr, &offset);
    return offset;
}

} // namespace tollgate::lexer
