// SPDX-License-Identifier: MIT
// The one place where exceptions become exit codes.
#include "gate/cli/run_cli.hpp"

#include "gate/cli/commands.hpp"
#include "gate/common/errors.hpp"
#include "gate/java/java_front_end.hpp"

#include <CLI/CLI.hpp>
#include <algorithm>
#include <cstdio>
#include <exception>
#include <spdlog/sinks/stdout_color_sinks.h>
#include <spdlog/spdlog.h>
#include <string>

namespace tollgate {

int run_cli(int argc, char** argv) {
    CLI::App app{"tollgate: gate C/C++ changes on the Halstead measures of the functions they "
                 "touch",
                 "tollgate"};
    app.require_subcommand(1);
    app.set_version_flag("--version",
                         std::string("tollgate ") + TOLLGATE_VERSION + "\n" + java::java_status());
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

    try {
        app.parse(argc, argv);
    } catch (const CLI::CallForHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForAllHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForVersion& e) {
        return app.exit(e);
    } catch (const CLI::ParseError& e) {
        std::fprintf(stderr, "tollgate: error: %s (run \"tollgate --help\")\n", e.what());
        return static_cast<int>(ExitCode::usage);
    }

    auto logger = spdlog::stderr_color_st("tollgate");
    logger->set_pattern("tollgate: %l: %v");
    logger->set_level(global.verbose ? spdlog::level::debug : spdlog::level::warn);
    spdlog::set_default_logger(logger);

    try {
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
                     global.verbose ? "" : " (run with --verbose for details)");
        return static_cast<int>(ExitCode::failure);
    } catch (const std::exception& e) {
        std::fprintf(stderr, "tollgate: internal error: %s (run with --verbose and report it)\n",
                     e.what());
        return static_cast<int>(ExitCode::failure);
    }
}

} // namespace tollgate
