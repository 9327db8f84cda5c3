// SPDX-License-Identifier: MIT
// Which shared precompiled headers (shared_headers.hpp) one parser process builds and uses: how
// often each was asked for, and which include lines never to try.
#pragma once

#include "gate/common/source.hpp"

#include <clang-c/Index.h>
#include <cstdint>
#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

namespace tollgate::lexer {

class SharedHeaderCache {
public:
    // Keep shared precompiled headers in `folder`; empty (the default): never.
    void set_folder(std::string folder) { m_folder = std::move(folder); }
    bool enabled() const { return !m_folder.empty(); }

    // Return the shared precompiled header of `file` among the revision's `headers`, once the
    // same one has been asked for k_asks times, or nothing (then the standard headers alone
    // serve). `language_flags` and `other_args` are the parse's arguments (pch_cache.hpp);
    // `lines_key` is set to what identifies the file's shared lines and flags (0: it has none).
    std::optional<std::string> pch_for(const SourceFile& file,
                                       const std::vector<SourceFile>& headers,
                                       const std::vector<std::string>& language_flags,
                                       const std::vector<std::string>& other_args,
                                       const std::vector<CXUnsavedFile>& unsaved,
                                       std::uint64_t& lines_key);

    // Never build for `lines_key` again in this process (its headers showed errors).
    void refuse(std::uint64_t lines_key) { m_failed.insert(lines_key); }

    // A shared header is precompiled on its third request: building costs about two plain
    // parses, and on real histories most include sets come back once or twice (a googletest
    // history spent more on builds it used once than it saved).
    static constexpr unsigned k_asks = 3;

private:
    std::string m_folder;
    std::map<std::uint64_t, unsigned> m_asked; // how often each shared header was asked for
    std::set<std::uint64_t> m_failed;          // include lines and flags not to build
};

} // namespace tollgate::lexer
