// SPDX-License-Identifier: MIT
// Which side of a change a value belongs to: the base revision or the head.
#pragma once

namespace tollgate {

// The two sides of a change: `base` (what the change starts from) and `head` (what it produces).
enum class Side { base, head };

} // namespace tollgate
