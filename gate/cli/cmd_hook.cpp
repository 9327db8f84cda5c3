// SPDX-License-Identifier: MIT
// `tollgate hook`: install or remove the pre-push hook, and run it for git's pre-push protocol.
#include "gate/cli/commands.hpp"
#include "gate/cli/options.hpp"
#include "gate/cli/run_cli.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/hook/hook_file.hpp"
#include "gate/hook/pre_push.hpp"
#include "gate/hook/process.hpp"
#include "gate/walker/repository.hpp"

#include <filesystem>
#include <iostream>
#include <iterator>
#include <memory>
#include <sstream>

namespace tollgate {

namespace {

struct HookOptions {
    bool force = false;         // install --force
    bool chain = false;         // install --chain
    std::string binary;         // install --binary
    std::string remote;         // run REMOTE
    std::string url;            // run URL
    std::string policy_path;    // run --policy
    unsigned jobs = 0;          // run --jobs
    IsolationOptions isolation; // run --parse-timeout, --parse-memory
};

// Open the repository around the current folder, for its errors: none outside a repository
// (with the -C hint), git's words for one owned by another user.
void require_repository() {
    walker::Repository::open(std::filesystem::current_path().string());
}

int run_install(const HookOptions& options) {
    require_repository();
    const hook::ExistingHook existing = options.chain   ? hook::ExistingHook::chain
                                        : options.force ? hook::ExistingHook::replace
                                                        : hook::ExistingHook::refuse;
    const std::string binary = options.binary.empty() ? hook::self_executable() : options.binary;
    // One string, built before anything is written: a refusal leaves no dangling prefix.
    std::cerr << ("tollgate: " +
                  text::terminal_text(hook::install_hook(hook::hooks_folder(), binary, existing)) +
                  "\n");
    return static_cast<int>(ExitCode::pass);
}

int run_uninstall() {
    require_repository();
    std::cerr << ("tollgate: " + text::terminal_text(hook::uninstall_hook(hook::hooks_folder())) +
                  "\n");
    return static_cast<int>(ExitCode::pass);
}

// Judge one planned ref with `tollgate check` run as a child of this very binary, so the hook
// and the pipeline gate with the same code; return check's exit code. Its table goes to stderr.
int check_ref(const hook::RefPlan& plan, const HookOptions& options) {
    std::vector<std::string> argv = {
        hook::self_executable(), "check", "--base", plan.base, "--head", plan.head};
    if (!options.policy_path.empty()) {
        argv.insert(argv.end(), {"--policy", options.policy_path});
    }
    argv.insert(argv.end(), {"--jobs", std::to_string(options.jobs)});
    argv.insert(argv.end(), {"--parse-timeout", std::to_string(options.isolation.parse_timeout),
                             "--parse-memory", std::to_string(options.isolation.parse_memory)});
    // The table is for the person pushing: it goes to stderr, which git leaves on the terminal.
    return hook::run_process(argv, hook::Output::to_stderr).exit_code;
}

int run_pre_push(const HookOptions& options) {
    const std::string input{std::istreambuf_iterator<char>(std::cin),
                            std::istreambuf_iterator<char>()};
    const auto refs = hook::parse_pushed_refs(input);
    int worst = static_cast<int>(ExitCode::pass);
    // Ref and remote names come from git's input and arguments: made visible on the terminal.
    using text::terminal_text;
    for (const hook::PushedRef& ref : refs) {
        const hook::RefPlan plan = hook::plan_ref(ref, options.remote);
        const std::string ref_name = terminal_text(ref.remote_ref);
        if (plan.action == hook::RefAction::skip) {
            std::cerr << "tollgate: " << ref_name << ": nothing to judge ("
                      << terminal_text(plan.reason) << ")\n";
            continue;
        }
        std::cerr << "tollgate: " << ref_name << ": judging "
                  << terminal_text(plan.base.substr(0, 7)) << ".."
                  << terminal_text(plan.head.substr(0, 7))
                  << " (base: " << terminal_text(plan.reason) << ")\n";
        const int code = check_ref(plan, options);
        if (code == static_cast<int>(ExitCode::blocked)) {
            std::cerr << "tollgate: the policy blocks the push of " << ref_name << " to \""
                      << terminal_text(options.remote) << "\"\n";
        } else if (code != static_cast<int>(ExitCode::pass)) {
            std::cerr << "tollgate: " << ref_name << " could not be judged (exit " << code << ")\n";
        }
        // Errors (2, 3) outrank a block (1): nothing was judged there.
        if (code > worst) {
            worst = code;
        }
    }
    if (worst != static_cast<int>(ExitCode::pass)) {
        std::cerr << "tollgate: push stopped (bypass the hook once with \"git push "
                     "--no-verify\")\n";
    }
    return worst;
}

} // namespace

void attach_hook(CLI::App& sub, const GlobalOptions& /*global*/, std::function<int()>& selected) {
    auto options = std::make_shared<HookOptions>();
    sub.description("Install or remove the repository's pre-push hook (the hooks folder git "
                    "reports, so core.hooksPath is honoured), or run it: the hook judges every "
                    "pushed ref with \"tollgate check\" and blocks the push when the policy "
                    "does.");
    sub.require_subcommand(1);

    CLI::App* install = sub.add_subcommand("install", "Write the pre-push hook");
    install->description("Write the pre-push hook calling this tollgate binary. A hook tollgate "
                         "did not write is left alone unless --chain or --force is given.");
    auto* chain = install->add_flag(
        "--chain", options->chain,
        "Keep an existing hook as pre-push.tollgate-chained and call it first, with the same "
        "input");
    install
        ->add_flag("--force", options->force,
                   "Replace an existing hook (kept as pre-push.tollgate-replaced)")
        ->excludes(chain);
    install->add_option("--binary", options->binary,
                        "Tollgate binary the hook calls (default: this one; \"tollgate\" on PATH "
                        "when it is gone)");
    install->callback(
        [options, &selected] { selected = [options] { return run_install(*options); }; });

    CLI::App* uninstall = sub.add_subcommand("uninstall", "Remove the pre-push hook");
    uninstall->description("Remove the pre-push hook tollgate wrote and put a chained hook back; "
                           "a hook tollgate did not write is left alone (exit 2).");
    uninstall->callback([&selected] { selected = [] { return run_uninstall(); }; });

    CLI::App* run = sub.add_subcommand("run", "Run the pre-push hook (git calls it)");
    run->description("Read git's pre-push input (LOCAL-REF LOCAL-SHA REMOTE-REF REMOTE-SHA per "
                     "line) and judge each pushed ref with \"tollgate check\": an update from "
                     "the remote's commit, a new branch from its merge base with the remote's "
                     "default branch; deleted refs are skipped. Exit 1 when the policy blocks a "
                     "ref.");
    run->add_option("remote", options->remote, "Name of the remote (git's first argument)")
        ->required();
    run->add_option("url", options->url, "URL of the remote (git's second argument)");
    run->add_option("--policy", options->policy_path,
                    "Policy file (default: .tollgate.yaml of each base commit)");
    add_jobs_option(*run, options->jobs);
    add_isolation_options(*run, options->isolation);
    run->callback(
        [options, &selected] { selected = [options] { return run_pre_push(*options); }; });

    sub.footer("Examples:\n"
               "  tollgate hook install            write .git/hooks/pre-push\n"
               "  tollgate hook install --chain    keep the current hook and call it first\n"
               "  tollgate hook uninstall          remove it, restoring a chained hook\n"
               "  git push --no-verify             push once without the hook");
}

} // namespace tollgate
