// SPDX-License-Identifier: MIT
// Install and uninstall the pre-push hook script.
#include "gate/hook/hook_file.hpp"

#include "gate/common/errors.hpp"
#include "gate/common/output_file.hpp"
#include "gate/hook/process.hpp"

#include <filesystem>
#include <fstream>
#include <sstream>

namespace fs = std::filesystem;

namespace tollgate::hook {

namespace {

std::string quote_for_sh(const std::string& text) {
    std::string quoted = "'";
    for (char c : text) {
        quoted += c == '\'' ? std::string("'\\''") : std::string(1, c);
    }
    return quoted + "'";
}

std::string read_file(const fs::path& path) {
    std::ifstream in(path, std::ios::binary);
    std::ostringstream text;
    text << in.rdbuf();
    return text.str();
}

// Write `text` to `path` with the one writer of output files, executable (0755 less the umask).
void write_executable(const fs::path& path, const std::string& text) {
    write_output_file("hook", path.string(), text, 0755);
}

void move_file(const fs::path& from, const fs::path& to) {
    std::error_code error;
    fs::rename(from, to, error);
    if (error) {
        throw Failure("cannot rename \"" + from.string() + "\" to \"" + to.string() +
                      "\": " + error.message());
    }
}

bool exists_or_dangles(const fs::path& path) {
    return fs::symlink_status(path).type() != fs::file_type::not_found;
}

} // namespace

std::string hooks_folder() {
    const ProcessResult result =
        run_process({"git", "rev-parse", "--git-path", "hooks"}, Output::capture);
    std::string path = result.out;
    while (!path.empty() && (path.back() == '\n' || path.back() == '\r')) {
        path.pop_back();
    }
    if (result.exit_code != 0 || path.empty()) {
        throw UsageError("not in a git repository: \"" + fs::current_path().string() +
                         "\" (run \"tollgate hook\" inside the repository, or name it with -C "
                         "DIR)");
    }
    return fs::absolute(path).lexically_normal().string();
}

std::string hook_script(const std::string& binary, bool chained) {
    std::string script = "#!/bin/sh\n";
    script += k_hook_marker;
    script += "\n# Gates each push on the team's Tollgate policy; \"tollgate hook uninstall\" "
              "removes it.\n# Bypass it once with \"git push --no-verify\".\n";
    script += "tollgate=" + quote_for_sh(binary) + "\n";
    script += "if [ ! -x \"$tollgate\" ]; then tollgate=tollgate; fi\n";
    if (!chained) {
        script += "exec \"$tollgate\" hook run -- \"$@\"\n";
        return script;
    }
    // git writes the refs once on standard input: keep them for both hooks.
    script += std::string("refs=$(mktemp) || exit 1\n") + "trap 'rm -f \"$refs\"' EXIT\n" +
              "cat >\"$refs\"\n" + "\"$(dirname \"$0\")/" + k_chained_name +
              "\" \"$@\" <\"$refs\" || exit $?\n" + "\"$tollgate\" hook run -- \"$@\" <\"$refs\"\n";
    return script;
}

bool is_tollgate_hook(const std::string& path) {
    if (!fs::is_regular_file(path)) {
        return false;
    }
    return read_file(path).find(k_hook_marker) != std::string::npos;
}

std::string install_hook(const std::string& folder, const std::string& binary,
                         ExistingHook existing) {
    const fs::path dir(folder);
    std::error_code error;
    fs::create_directories(dir, error);
    if (error) {
        throw Failure("cannot create the hooks folder \"" + folder + "\": " + error.message());
    }
    const fs::path hook = dir / "pre-push";
    const fs::path chained = dir / k_chained_name;
    std::string summary;
    if (is_tollgate_hook(hook.string())) {
        const bool keep_chain = exists_or_dangles(chained);
        write_executable(hook, hook_script(binary, keep_chain));
        return "updated the tollgate pre-push hook \"" + hook.string() + "\"" +
               (keep_chain ? " (still calling \"" + chained.string() + "\" first)" : "");
    }
    if (exists_or_dangles(hook)) {
        switch (existing) {
        case ExistingHook::refuse:
            throw UsageError("a pre-push hook tollgate did not write exists: \"" + hook.string() +
                             "\" (keep it and call it first with --chain, or replace it with "
                             "--force)");
        case ExistingHook::chain:
            if (exists_or_dangles(chained)) {
                throw UsageError("a chained hook is kept already: \"" + chained.string() +
                                 "\" (move it away, then run \"tollgate hook install --chain\" "
                                 "again)");
            }
            move_file(hook, chained);
            write_executable(hook, hook_script(binary, true));
            return "installed the tollgate pre-push hook \"" + hook.string() +
                   "\"; it calls the earlier hook, kept as \"" + chained.string() + "\", first";
        case ExistingHook::replace:
            move_file(hook, dir / k_replaced_name);
            summary = " (the earlier hook is kept as \"" + (dir / k_replaced_name).string() + "\")";
            break;
        }
    }
    write_executable(hook, hook_script(binary, false));
    return "installed the tollgate pre-push hook \"" + hook.string() + "\"" + summary;
}

std::string uninstall_hook(const std::string& folder) {
    const fs::path dir(folder);
    const fs::path hook = dir / "pre-push";
    const fs::path chained = dir / k_chained_name;
    if (!exists_or_dangles(hook)) {
        return "no pre-push hook in \"" + folder + "\": nothing to remove";
    }
    if (!is_tollgate_hook(hook.string())) {
        throw UsageError("the pre-push hook \"" + hook.string() +
                         "\" was not written by tollgate (left as it is)");
    }
    std::error_code error;
    fs::remove(hook, error);
    if (error) {
        throw Failure("cannot remove \"" + hook.string() + "\": " + error.message());
    }
    if (exists_or_dangles(chained)) {
        move_file(chained, hook);
        return "removed the tollgate pre-push hook; the earlier hook is back at \"" +
               hook.string() + "\"";
    }
    return "removed the tollgate pre-push hook \"" + hook.string() + "\"";
}

} // namespace tollgate::hook
