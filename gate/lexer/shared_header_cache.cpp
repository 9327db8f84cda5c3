// SPDX-License-Identifier: MIT
// Which shared precompiled headers one parser process builds and uses.
#include "gate/lexer/shared_header_cache.hpp"

#include "gate/common/fnv_digest.hpp"
#include "gate/lexer/pch_cache.hpp"
#include "gate/lexer/shared_headers.hpp"

namespace tollgate::lexer {

std::optional<std::string>
SharedHeaderCache::pch_for(const SourceFile& file, const std::vector<SourceFile>& headers,
                           const std::vector<std::string>& language_flags,
                           const std::vector<std::string>& other_args,
                           const std::vector<CXUnsavedFile>& unsaved, std::uint64_t& lines_key) {
    lines_key = 0;
    const std::optional<SharedIncludes> shared = shared_includes(file, headers);
    if (!shared) {
        return std::nullopt;
    }
    FnvDigest lines;
    for (const std::string& arg : language_flags) {
        lines.add_field(arg);
    }
    for (const std::string& arg : other_args) {
        lines.add_field(arg);
    }
    for (const std::string& line : shared->lines) {
        lines.add_field(line);
    }
    lines_key = lines.value();
    if (m_failed.count(lines_key) != 0) {
        return std::nullopt;
    }
    const std::uint64_t key = FnvDigest(lines).add_field(std::to_string(shared->digest)).value();
    if (++m_asked[key] < k_asks) {
        return std::nullopt;
    }
    std::string path = shared_header_pch(language_flags, other_args, *shared, unsaved, m_folder);
    if (path.empty()) {
        // Those headers did not compile alone (they need flags the file does not give, say):
        // later versions are not tried either, each try costs more than a parse.
        m_failed.insert(lines_key);
        return std::nullopt;
    }
    return path;
}

} // namespace tollgate::lexer
