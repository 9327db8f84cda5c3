// SPDX-License-Identifier: MIT
// Run one work loop on several threads: the pool behind parallel lexing and history replay.
#pragma once

#include <functional>

namespace tollgate {

// Run `work` on `threads` threads at once (inline when `threads` is 0 or 1) and return when
// every run has returned. `work` takes its items from a shared queue and must not throw.
void run_workers(unsigned threads, const std::function<void()>& work);

} // namespace tollgate
