// SPDX-License-Identifier: MIT
// The pre-push hook file: where it lives, the script tollgate writes, install and uninstall.
#pragma once

#include <string>

namespace tollgate::hook {

// The line that marks a hook script as written by tollgate.
inline constexpr const char* k_hook_marker =
    "# tollgate-hook: written by \"tollgate hook install\"";
// The name an existing hook is kept under when tollgate chains it.
inline constexpr const char* k_chained_name = "pre-push.tollgate-chained";
// The name an existing hook is kept under when `--force` replaces it.
inline constexpr const char* k_replaced_name = "pre-push.tollgate-replaced";

// What to do with a pre-push hook tollgate did not write.
enum class ExistingHook {
    refuse,  // stop with a usage error (the default)
    chain,   // keep it under k_chained_name and call it first
    replace, // keep a copy under k_replaced_name and write ours
};

// Return the hooks folder of the repository around the current folder, as git reports it (so
// core.hooksPath is honoured), made absolute. Throws UsageError outside a repository, Failure
// when git cannot be run.
std::string hooks_folder();

// Return the script text of the hook calling `binary`; `chained` adds the call of the kept hook
// first, with the same standard input and arguments.
std::string hook_script(const std::string& binary, bool chained);

// Return true when the file at `path` is a hook tollgate wrote (it holds k_hook_marker); false
// when it is missing or someone else's.
bool is_tollgate_hook(const std::string& path);

// Write the pre-push hook calling `binary` into `folder` (created when missing). An earlier
// tollgate hook is rewritten (keeping its chain); another hook is refused, chained or replaced as
// `existing` says. Return a one-line summary of what was done. Throws UsageError when another
// hook is in the way and `existing` is refuse, or when a chained hook is already kept; Failure
// when a file cannot be written.
std::string install_hook(const std::string& folder, const std::string& binary,
                         ExistingHook existing);

// Remove the pre-push hook tollgate wrote in `folder` and put a chained hook back in its place.
// Return a one-line summary. Throws UsageError when the pre-push hook is not tollgate's (it is
// left alone); a missing hook is not an error (the summary says so).
std::string uninstall_hook(const std::string& folder);

} // namespace tollgate::hook
