// SPDX-License-Identifier: MIT
// SARIF 2.1.0 output of a verdict, for code-scanning annotations on the changed lines.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/policy/policy.hpp"
#include "gate/policy/verdict.hpp"

#include <ostream>
#include <string>

namespace tollgate::report {

// Write `verdict` as a SARIF 2.1.0 log with one run: every rule of `policy` in tool.driver.rules,
// one result per finding ("error" when blocking, "warning" otherwise; tolerated findings
// carry baselineState "unchanged"), located on the function's head lines relative to the
// repository root (uriBaseId "SRCROOT"). A budget finding is placed on the in-scope function of
// `report` whose measure grew most; with no such function it has no location. A verdict without
// findings writes a valid log with an empty result list.
void write_sarif(std::ostream& out, const delta::ChangeReport& report,
                 const policy::Verdict& verdict, const policy::Policy& policy);

// Return `path` as a relative URI reference: "/" kept, every byte outside RFC 3986's unreserved
// set percent-encoded ("src/my file.c" -> "src/my%20file.c").
std::string path_to_uri(const std::string& path);

} // namespace tollgate::report
