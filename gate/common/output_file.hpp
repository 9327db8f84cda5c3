// SPDX-License-Identifier: MIT
// The one place that writes the files a command produces (reports, snapshots, policies, pages):
// whole or not at all, and a failure names the path and the system's reason.
#pragma once

#include <string>

namespace tollgate {

// Environment variable of a test hook: when set to a number of seconds, write_output_file sleeps
// that long after the temporary file is written and synced and before it is renamed over the
// target, so that a test can kill the writer at the worst moment. For tests only.
inline constexpr const char* k_pause_before_rename_variable = "TOLLGATE_TEST_PAUSE_BEFORE_RENAME";

// Check, before any work, that a `what` (a noun for messages: "report", "snapshot", "policy",
// "HTML page") can be written to `path`: missing folders are created and a temporary file is made
// and removed beside it. Throws Failure `cannot write WHAT "PATH": REASON` (the system's reason,
// lowercase, and a remedy in parentheses where one is plain) when it cannot.
void check_writable(const std::string& what, const std::string& path);

// Write `content` to `path` atomically: a temporary file in the same folder (named
// ".NAME.tollgate-tmp-PID-XXXXXX"), written, flushed and fsynced with permissions `mode` less the
// umask, then renamed over `path` and the folder fsynced; a killed writer leaves the previous
// file intact. Creates missing folders and removes temporary files of that pattern left by
// writers that no longer run. Throws Failure as check_writable does, also for a folder at `path`.
void write_output_file(const std::string& what, const std::string& path, const std::string& content,
                       unsigned mode = 0666);

} // namespace tollgate
