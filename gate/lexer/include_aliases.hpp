// SPDX-License-Identifier: MIT
// Quoted includes that climb folders ("../x.h"): libclang finds in-memory headers only under the
// exact path it builds, so each such include is given its header under that path too.
#pragma once

#include "gate/common/source.hpp"

#include <string>
#include <vector>

namespace tollgate::lexer {

// Return the extra headers that let `#include "../x.h"` (any quoted include with a ".."
// component) in the files of `files` find the header of `headers` it names: for an includer in
// folder D, and for each folder I of `include_dirs`, the include's path joined to that folder as
// libclang joins it ("D/../x.h"), holding one line that includes the header at the normalised
// path under k_virtual_root (so #pragma once sees one file). Only headers of the revision are
// named; a path that climbs out of the repository, or holds a quote, backslash or newline, is
// left alone. Each alias appears once, in path order.
std::vector<SourceFile> parent_include_aliases(const std::vector<SourceFile>& files,
                                               const std::vector<SourceFile>& headers,
                                               const std::vector<std::string>& include_dirs);

} // namespace tollgate::lexer
