// SPDX-License-Identifier: MIT
// What a reviewer reads first: the verdict's findings grouped per function, blocking ones first,
// and the compiler diagnostics summed up; shared by the terminal and Markdown renderers.
#pragma once

#include "gate/delta/function_delta.hpp"
#include "gate/policy/verdict.hpp"

#include <cstddef>
#include <string>
#include <vector>

namespace tollgate::report {

// Where one function stands with the policy.
enum class Standing {
    blocks, // at least one finding blocks the change
    warns,  // findings, none blocking (warnings, grandfathered ceilings)
    clear,  // no finding
};

// The findings of one function, or of the whole change (budget rules), grouped.
struct FunctionFindings {
    std::string function;    // qualified name; empty for the whole change
    std::string signature;   // parameter types; empty for the whole change
    std::string path;        // head path (base path when removed); empty for the whole change
    unsigned start_line = 0; // first line; 0 for the whole change
    const delta::FunctionDelta* delta = nullptr;  // the report's function, when it has it
    std::vector<const policy::Finding*> findings; // in the verdict's order (blocking first)
    Standing standing = Standing::warns;          // blocks or warns
};

// The change in the order a reviewer reads it: every function with a blocking finding, then
// every function with warnings only, then the other touched functions.
struct ReadingOrder {
    std::vector<FunctionFindings> blocking; // in report order; findings on no function of the
                                            // report after them, the whole change's last
    std::vector<FunctionFindings> warning;  // in the same order
    std::vector<const delta::FunctionDelta*> others; // no finding, in report order
};

// Group `verdict`'s findings per function of `report` (matched by name, path and first line)
// and order everything for reading. Every finding lands in exactly one group; pointers refer
// into `report` and `verdict`, which must outlive the result.
ReadingOrder order_for_reading(const delta::ChangeReport& report, const policy::Verdict& verdict);

// Return the standing of `group` for a table row: `Standing::clear` when `group` is null.
Standing standing_of(const FunctionFindings* group);

// Return `finding`'s message without the location its group already shows (the leading
// "PATH:LINE: NAME(SIGNATURE): " or "the change: "), e.g. "effort +6,949 (+278%) exceeds the
// limit +100% by 178 points (rule "effort-growth", blocking)"; the whole message otherwise.
std::string finding_detail(const policy::Finding& finding);

// Return the command that shows why `function` (a name, or a line number) of `path` measures
// as it does, its argument quoted for a POSIX shell when it needs it:
// `tollgate explain 'src/a b.c:f'`. Quoting keeps a copied command from running anything the
// names hold.
std::string explain_command(const std::string& path, const std::string& function);

// One header the parser could not find, and the warnings it caused.
struct MissingHeader {
    std::string header;             // as the include line spells it
    std::size_t warnings = 0;       // warnings naming it
    std::vector<std::string> files; // files that include it, sorted, each once
};

// The compiler diagnostics of a change, summed up.
struct DiagnosticsSummary {
    std::size_t warnings = 0;                   // every warning, "N more errors" lines counted as N
    std::size_t files = 0;                      // distinct files with a warning
    std::vector<MissingHeader> missing_headers; // most warnings first, then by header
    std::vector<const delta::ChangeWarning*> rest; // warnings about no missing header
};

// Return the header a diagnostic says was not found: the lexer's `include "x.h" not found (...)`
// or clang's "'x.h' file not found" (also after the lexer's "in "HEADER": " prefix), or empty.
std::string missing_header_of(const std::string& message);

// Sum up `warnings`: counts, and the missing headers grouped.
DiagnosticsSummary summarise_diagnostics(const std::vector<delta::ChangeWarning>& warnings);

// Return "48 parse warnings in 12 files" (one way of writing numbers: group_thousands).
std::string diagnostics_count_text(const DiagnosticsSummary& summary);

// Return the sentence said once when headers were missing: how to supply include folders.
std::string include_folder_hint();

// Return one sentence on how to give a compile database, when `report` has files measured
// without compile flags and parse warnings that one might cure (with --include-dir named when
// headers were missing); include_folder_hint() when only headers were missing; empty otherwise.
std::string compile_database_hint(const delta::ChangeReport& report,
                                  const DiagnosticsSummary& summary);

// Return "1 function" or "2 functions": the count with thousands separators and the noun.
std::string count_text(std::size_t count, const char* one, const char* many);

} // namespace tollgate::report
