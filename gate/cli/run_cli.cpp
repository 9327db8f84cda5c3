// SPDX-License-Identifier: MIT
// The one place where exceptions become exit codes.
#include "gate/cli/run_cli.hpp"

#include "gate/cli/commands.hpp"
#include "gate/common/errors.hpp"

#include <CLI/CLI.hpp>
#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <exception>
#include <spdlog/sinks/stdout_color_sinks.h>
#include <spdlog/spdlog.h>
#include <string>
#include <unistd.h>

namespace tollgate {

namespace {

constexpr const char* k_directory_help =
    "Run as if tollgate was started in DIR (paths given on the command line are then taken from "
    "there); accepted before or after the command, and repeatable: each DIR is taken from the one "
    "before, as git's -C";

// Add -C/--repo to `app` and to every command below it, appending to `directories`.
void add_directory_option(CLI::App& app, std::vector<std::string>& directories) {
    app.add_option_function<std::string>(
           "-C,--repo", [&directories](const std::string& dir) { directories.push_back(dir); },
           k_directory_help)
        ->type_name("DIR")
        ->multi_option_policy(CLI::MultiOptionPolicy::TakeAll);
    for (CLI::App* sub : app.get_subcommands([](CLI::App*) { return true; })) {
        add_directory_option(*sub, directories);
    }
}

// Change to each -C folder in turn. Throws UsageError naming the folder and the reason.
void enter_directories(const std::vector<std::string>& directories) {
    for (const std::string& dir : directories) {
        if (::chdir(dir.c_str()) != 0) {
            const int error = errno;
            std::string reason = std::strerror(error);
            if (!reason.empty()) {
                reason[0] = static_cast<char>(std::tolower(static_cast<unsigned char>(reason[0])));
            }
            throw UsageError("cannot run in \"" + dir + "\" (-C): " + reason);
        }
    }
}

// Return true when `message` ends with a remedy in parentheses already.
bool has_remedy(const std::string& message) {
    return !message.empty() && message.back() == ')';
}

} // namespace

int run_cli(int argc, char** argv) {
    CLI::App app{"tollgate: gate C/C++ changes on the Halstead measures of the functions they "
                 "touch",
                 "tollgate"};
    app.require_subcommand(1);
    app.set_version_flag("--version", std::string("tollgate ") + TOLLGATE_VERSION);
    GlobalOptions global;
    app.add_flag("-v,--verbose", global.verbose, "Log what each stage does on stderr");
    app.footer("Exit codes: 0 pass, 1 blocked by the policy, 2 usage or configuration error, "
               "3 repository or parsing failure.\nRun \"tollgate COMMAND --help\" for a "
               "command's options and an example.");

    std::function<int()> selected;
    for (const CommandEntry& entry : command_table()) {
        CLI::App* sub = app.add_subcommand(entry.name, entry.summary);
        entry.attach(*sub, global, selected);
    }
    add_directory_option(app, global.directories);

    try {
        app.parse(argc, argv);
    } catch (const CLI::CallForHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForAllHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForVersion& e) {
        return app.exit(e);
    } catch (const CLI::ParseError& e) {
        // Tollgate's own checks name the accepted values; CLI11's own messages get the hint.
        std::fprintf(stderr, "tollgate: error: %s%s\n", e.what(),
                     has_remedy(e.what()) ? "" : " (run \"tollgate --help\")");
        return static_cast<int>(ExitCode::usage);
    }

    auto logger = spdlog::stderr_color_st("tollgate");
    logger->set_pattern("tollgate: %l: %v");
    logger->set_level(global.verbose ? spdlog::level::debug : spdlog::level::warn);
    spdlog::set_default_logger(logger);

    try {
        enter_directories(global.directories);
        return selected ? selected() : static_cast<int>(ExitCode::usage);
    } catch (const UsageError& e) {
        // A broken policy carries one message per line; each gets the prefix.
        const std::string text = e.what();
        for (std::size_t start = 0; start <= text.size();) {
            const std::size_t end = std::min(text.find('\n', start), text.size());
            std::fprintf(stderr, "tollgate: error: %s\n", text.substr(start, end - start).c_str());
            start = end + 1;
        }
        return static_cast<int>(ExitCode::usage);
    } catch (const Failure& e) {
        std::fprintf(stderr, "tollgate: error: %s%s\n", e.what(),
                     global.verbose || has_remedy(e.what()) ? ""
                                                            : " (run with --verbose for details)");
        return static_cast<int>(ExitCode::failure);
    } catch (const std::exception& e) {
        std::fprintf(stderr, "tollgate: internal error: %s (run with --verbose and report it)\n",
                     e.what());
        return static_cast<int>(ExitCode::failure);
    }
}

} // namespace tollgate
