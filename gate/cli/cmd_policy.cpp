// SPDX-License-Identifier: MIT
// `tollgate policy`: validate a policy file and print the effective policy.
#include "gate/cli/commands.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/policy/policy.hpp"

#include <filesystem>
#include <iostream>
#include <memory>

namespace tollgate {

namespace {

struct PolicyOptions {
    std::string file;      // positional FILE; empty: the repository's default file
    bool built_in = false; // --default: print the built-in policy with its comments
};

// Return the repository root above the current folder (the folder holding ".git"), or the
// current folder when it is not inside a repository.
std::filesystem::path repository_root() {
    namespace fs = std::filesystem;
    const fs::path start = fs::current_path();
    for (fs::path folder = start; !folder.empty(); folder = folder.parent_path()) {
        if (fs::exists(folder / ".git")) {
            return folder;
        }
        if (folder == folder.parent_path()) {
            break;
        }
    }
    return start;
}

int run_policy(const PolicyOptions& options) {
    if (options.built_in) {
        std::cout << policy::default_policy_text();
        return 0;
    }
    std::string path = options.file;
    if (path.empty()) {
        const auto candidate = repository_root() / policy::k_default_policy_path;
        if (!std::filesystem::exists(candidate)) {
            std::cerr << "tollgate: no " << policy::k_default_policy_path
                      << " at the repository root: the built-in default policy applies\n";
            std::cout << "# effective policy: built-in default\n"
                      << policy::describe_policy(policy::default_policy());
            return 0;
        }
        path = std::filesystem::relative(candidate).string();
    }
    const policy::Policy loaded = policy::load_policy_file(path);
    std::cerr << "tollgate: " << text::terminal_text(path) << " is a valid policy\n";
    std::cout << "# effective policy: " << text::terminal_text(path) << "\n"
              << policy::describe_policy(loaded);
    return 0;
}

} // namespace

void attach_policy(CLI::App& sub, const GlobalOptions& /*global*/, std::function<int()>& selected) {
    auto options = std::make_shared<PolicyOptions>();
    sub.description("Validate a policy file and print the effective policy, every default "
                    "written out. Errors name the file, line and column; exit 2 when the policy "
                    "is broken.");
    sub.add_option("file", options->file,
                   std::string("Policy file (default: ") + policy::k_default_policy_path +
                       " at the repository root, else the built-in default)");
    sub.add_flag("--default", options->built_in,
                 "Print the built-in default policy, with a comment on every key");
    sub.footer("Examples:\n"
               "  tollgate policy                          check .tollgate.yaml\n"
               "  tollgate policy policies/strict.yaml     check another file\n"
               "  tollgate policy --default > .tollgate.yaml   start from the built-in policy");
    sub.callback([options, &selected] { selected = [options] { return run_policy(*options); }; });
}

} // namespace tollgate
