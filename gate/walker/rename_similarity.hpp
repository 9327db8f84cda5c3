// SPDX-License-Identifier: MIT
// A rename similarity metric for libgit2 that follows git's own estimate, so renames match git's.
#pragma once

#include "gate/walker/libgit2_api.hpp"

#include <cstddef>
#include <string_view>

namespace tollgate::walker {

// Return how similar `base` and `head` are, in whole percent (0-100), the way git estimates it:
// both are cut into chunks (a line, or 64 bytes when a line is longer; a CR before LF is not
// counted), the bytes of chunks found on both sides are "copied", and the score is copied bytes
// over the larger size. Returns 0 when the sizes differ too much to reach `threshold` percent, and
// 0 when both are empty.
unsigned estimate_similarity(std::string_view base, std::string_view head, unsigned threshold);

// Return a libgit2 similarity metric computing estimate_similarity with `threshold` (which must
// outlive every git_diff_find_similar call that uses the metric).
git_diff_similarity_metric make_similarity_metric(const unsigned* threshold);

} // namespace tollgate::walker
