// SPDX-License-Identifier: MIT
// The one place where exceptions become exit codes.
#include "gate/cli/run_cli.hpp"

#include "gate/cli/commands.hpp"
#include "gate/common/errors.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/java/java_front_end.hpp"
#include "gate/lexer/lex_worker.hpp"
#include "gate/policy/policy.hpp"

#include <CLI/CLI.hpp>
#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <exception>
#include <memory>
#include <spdlog/formatter.h>
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

// Log lines as "tollgate: LEVEL: MESSAGE", the message made visible: logs quote paths and names.
class VisibleFormatter : public spdlog::formatter {
public:
    void format(const spdlog::details::log_msg& message, spdlog::memory_buf_t& out) override {
        const auto level = spdlog::level::to_string_view(message.level);
        const std::string line =
            "tollgate: " + std::string(level.data(), level.size()) + ": " +
            text::terminal_text(std::string_view(message.payload.data(), message.payload.size())) +
            "\n";
        out.append(line.data(), line.data() + line.size());
    }
    std::unique_ptr<spdlog::formatter> clone() const override {
        return std::make_unique<VisibleFormatter>();
    }
};

} // namespace

int run_cli(int argc, char** argv) {
    // The parser process is this executable with a hidden first argument (never in --help).
    if (argc >= 2 && std::string(argv[1]) == lexer::k_worker_command) {
        return lexer::run_lex_worker(argc, argv);
    }
    CLI::App app{"tollgate: gate C/C++ changes on the Halstead measures of the functions they "
                 "touch",
                 "tollgate"};
    app.require_subcommand(1);
    app.set_version_flag("--version",
                         std::string("tollgate ") + TOLLGATE_VERSION + "\n" + java::java_status());
    GlobalOptions global;
    app.add_flag("-v,--verbose", global.verbose, "Log what each stage does on stderr");
    // "-v" after the command ("tollgate check -v", as check's diagnostics line says) works too.
    app.fallthrough();
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
        std::fprintf(stderr, "tollgate: error: %s%s\n", text::terminal_text(e.what()).c_str(),
                     has_remedy(e.what()) ? "" : " (run \"tollgate --help\")");
        return static_cast<int>(ExitCode::usage);
    }

    auto logger = spdlog::stderr_color_st("tollgate");
    logger->set_formatter(std::make_unique<VisibleFormatter>());
    logger->set_level(global.verbose ? spdlog::level::debug : spdlog::level::warn);
    spdlog::set_default_logger(logger);

    try {
        enter_directories(global.directories);
        return selected ? selected() : static_cast<int>(ExitCode::usage);
    } catch (const policy::PolicyError& e) {
        // A broken policy carries one message per fault; each gets its line and the prefix.
        for (const auto& message : e.messages()) {
            std::fprintf(stderr, "tollgate: error: %s\n", text::terminal_text(message).c_str());
        }
        return static_cast<int>(ExitCode::usage);
    } catch (const UsageError& e) {
        // Messages quote paths, names and revisions: a line break or escape sequence among them
        // is shown, never obeyed, so every message stays one line.
        std::fprintf(stderr, "tollgate: error: %s\n", text::terminal_text(e.what()).c_str());
        return static_cast<int>(ExitCode::usage);
    } catch (const Failure& e) {
        std::fprintf(stderr, "tollgate: error: %s%s\n", text::terminal_text(e.what()).c_str(),
                     global.verbose || has_remedy(e.what()) ? ""
                                                            : " (run with --verbose for details)");
        return static_cast<int>(ExitCode::failure);
    } catch (const std::exception& e) {
        std::fprintf(stderr, "tollgate: internal error: %s (run with --verbose and report it)\n",
                     text::terminal_text(e.what()).c_str());
        return static_cast<int>(ExitCode::failure);
    }
}

} // namespace tollgate
