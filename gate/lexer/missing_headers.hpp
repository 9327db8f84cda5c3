// SPDX-License-Identifier: MIT
// Diagnostics summarised per missing header: one warning for each header not found, instead of
// the same "file not found" and the errors that follow it on every file of every run.
#pragma once

#include "gate/lexer/function_span.hpp"

#include <string>
#include <vector>

namespace tollgate::lexer {

// Warnings with the consequences of missing headers folded together.
struct WarningSummary {
    std::vector<LexWarning> warnings; // what to show, in the order of the input
    bool headers_missing = false;     // at least one included header was not found
};

// Return `warnings` with every "'NAME' file not found" diagnostic replaced by one warning per
// missing header NAME, at its first includer, naming how many files include it; the parser's
// other error messages of the files that miss a header are left out and counted in the warning
// of the first header each file misses (a missing header's declarations make later code
// unreadable). The lexer's own warnings (functions measured lexically, extents from brace
// matching) are kept. Without a missing header the warnings come back unchanged.
WarningSummary summarise_missing_headers(const std::vector<LexWarning>& warnings);

// Return the sentence said once per run when headers were missing: how to supply include
// folders.
std::string include_folder_hint();

} // namespace tollgate::lexer
