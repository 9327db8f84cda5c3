// SPDX-License-Identifier: MIT
// Reading a file the user named on the command line (a policy, a compile database), with an
// error that says what is wrong with the path.
#pragma once

#include <string>

namespace tollgate {

// Return the bytes of the file at `path`, a `what` (a noun for messages: "policy file", "compile
// database") the user named. Throws UsageError `cannot read WHAT "PATH": REASON (REMEDY)` when it
// is a folder ("it is a folder"), missing or unreadable (the system's reason, lowercase); the
// remedy in parentheses is `remedy`, left out when empty.
std::string read_named_file(const std::string& what, const std::string& path,
                            const std::string& remedy = {});

} // namespace tollgate
