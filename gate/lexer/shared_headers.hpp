// SPDX-License-Identifier: MIT
// Shared headers: the #include lines at the top of a source file that many versions of it (and
// its neighbours) share, precompiled once with the standard headers so that a parse starts after
// them. A replay parses the same file at many revisions; when it includes a heavy header-only
// library, most of each parse was that library.
#pragma once

#include "gate/common/source.hpp"

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::lexer {

// The includes of one file that go into a precompiled header, and what keys that header.
struct SharedIncludes {
    std::vector<std::string> lines; // the #include lines, in the file's order, as written
    std::uint64_t digest = 0;       // of the lines and of every header of the revision they may
                                    // reach (path and content)
};

// Return the #include lines at the top of `file` that may be precompiled ahead of it, or nothing
// when there are none or there is any doubt. The lines are the leading run of `#include "x"` and
// `#include <x>` directives (blank lines, comments and `#pragma once` between them allowed), up to
// the first other directive or code. The file's own header (the first include, named like the
// file: widget.cpp and "widget.h") is left out, because it changes with the file; precompiling
// the others puts them before it, so it is left out only when it defines no macro besides its
// include guard. Every line that names a header of `headers` (matched by path suffix) needs that
// header to have an include guard or `#pragma once`, because the file includes it again after
// the precompiled header. The digest covers every header of `headers` that a chain of #include
// lines may reach from the lines (matched by path suffix, over-approximating how a compiler
// resolves them; an #include of a macro makes it cover every header).
std::optional<SharedIncludes> shared_includes(const SourceFile& file,
                                              const std::vector<SourceFile>& headers);

} // namespace tollgate::lexer
