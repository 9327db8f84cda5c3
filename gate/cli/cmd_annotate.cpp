// SPDX-License-Identifier: MIT
// `tollgate annotate`: keep one comment with the check's Markdown report on the pull/merge
// request. A comment that cannot be posted is a warning; the exit code stays the gate's.
#include "gate/annotate/annotate.hpp"
#include "gate/annotate/comment_body.hpp"
#include "gate/annotate/read_check_report.hpp"
#include "gate/cli/commands.hpp"
#include "gate/cli/number_options.hpp"
#include "gate/cli/run_cli.hpp"
#include "gate/common/errors.hpp"
#include "gate/hook/process.hpp"

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <iostream>
#include <memory>
#include <unistd.h>

namespace tollgate {

namespace {

// The environment variable that holds the token unless --token-env names another.
const char* const k_default_token_variable = "TOLLGATE_ANNOTATE_TOKEN";

struct AnnotateOptions {
    std::string from;                                      // --from
    std::vector<std::string> check_arguments;              // after "--"
    std::string platform;                                  // --platform
    annotate::Target target;                               // --api-url, --repository, --number
    std::string token_variable = k_default_token_variable; // --token-env
    std::string slot = "gate";                             // --slot
    std::string artifact_url;                              // --artifact-url
    std::string link_template;                             // --link-template
    std::size_t markdown_rows = 10;                        // --markdown-rows
    bool line_notes = false;                               // --line-notes
    std::size_t body_limit = 0;                            // --body-limit
    unsigned timeout = 30;                                 // --timeout
    std::string ca_file;                                   // --ca-file
    bool dry_run = false;                                  // --dry-run
};

bool valid_variable_name(const std::string& name) {
    if (name.empty() || std::isdigit(static_cast<unsigned char>(name[0])) != 0) {
        return false;
    }
    for (const char c : name) {
        if (std::isalnum(static_cast<unsigned char>(c)) == 0 && c != '_') {
            return false;
        }
    }
    return true;
}

void validate(const AnnotateOptions& options) {
    if (!options.from.empty() && !options.check_arguments.empty()) {
        throw UsageError("give either --from REPORT or check's options after \"--\", not both");
    }
    if (!options.platform.empty() && !annotate::parse_platform(options.platform)) {
        throw UsageError("unknown platform \"" + options.platform +
                         "\" (expected github, gitlab, gitea or forgejo)");
    }
    if (!annotate::valid_slot(options.slot)) {
        throw UsageError("slot \"" + options.slot +
                         "\" should be 1 to 64 letters, digits, dots, dashes or underscores");
    }
    if (!valid_variable_name(options.token_variable)) {
        // The value is not repeated: it may be a token given here by mistake.
        throw UsageError("--token-env takes the name of an environment variable (letters, "
                         "digits and underscores); the token itself never goes on the command "
                         "line");
    }
    if (!options.ca_file.empty() && !std::filesystem::is_regular_file(options.ca_file)) {
        throw UsageError("CA file \"" + options.ca_file + "\" does not exist");
    }
    if (options.body_limit != 0 && options.body_limit < 1000) {
        throw UsageError("--body-limit should be 0 (the platform's limit) or at least 1000 bytes");
    }
}

// A temporary file removed when this goes out of scope.
class TemporaryReport {
public:
    TemporaryReport() {
        const char* folder = std::getenv("TMPDIR");
        std::string pattern = std::string(folder != nullptr && *folder != '\0' ? folder : "/tmp") +
                              "/tollgate-annotate-XXXXXX";
        const int fd = ::mkstemp(pattern.data());
        if (fd < 0) {
            throw Failure("cannot create a temporary file for the check's report");
        }
        ::close(fd);
        m_path = pattern;
    }
    ~TemporaryReport() {
        std::error_code ec;
        std::filesystem::remove(m_path, ec);
    }
    TemporaryReport(const TemporaryReport&) = delete;
    TemporaryReport& operator=(const TemporaryReport&) = delete;
    const std::string& path() const { return m_path; }

private:
    std::string m_path;
};

// Return the link template that points at the platform's file view, or empty.
std::string platform_link_template(const annotate::Target& target) {
    if (target.web_url.empty() || !target.platform) {
        return {};
    }
    switch (*target.platform) {
    case annotate::Platform::github:
        return target.web_url + "/blob/{commit}/{path}#L{line}";
    case annotate::Platform::gitlab:
        return target.web_url + "/-/blob/{commit}/{path}#L{line}";
    case annotate::Platform::gitea:
        return target.web_url + "/src/commit/{commit}/{path}#L{line}";
    }
    return {};
}

std::string describe(const annotate::Target& target) {
    const bool gitlab = target.platform && *target.platform == annotate::Platform::gitlab;
    return (gitlab ? "merge request " : "pull request ") + target.repository +
           (gitlab ? "!" : "#") + target.number + " (" + annotate::platform_name(*target.platform) +
           ")";
}

// Return the line that says what a run did to the comment (and the line notes).
std::string summarise(const annotate::AnnotateResult& result, const annotate::Target& target,
                      bool line_notes) {
    std::string line;
    switch (result.action) {
    case annotate::CommentAction::none:
        line = "no comment posted: the change touches no C/C++ function";
        break;
    case annotate::CommentAction::unchanged:
        line = "comment " + result.comment_id + " on " + describe(target) + " is up to date";
        break;
    default:
        line = std::string("comment ") +
               (result.comment_id.empty() ? "" : result.comment_id + " ") +
               annotate::action_name(result.action) + " on " + describe(target);
    }
    if (result.cut) {
        line += "; the report was cut to fit the platform's size limit";
    }
    if (result.duplicates > 0) {
        line += "; " + std::to_string(result.duplicates) +
                " later comment(s) with the same marker were left as they are";
    }
    if (line_notes) {
        line += "; line notes: " + std::to_string(result.notes_created) + " created, " +
                std::to_string(result.notes_updated) + " updated";
    }
    return line;
}

// Post or update the comment; every failure becomes a warning on stderr.
void post(const annotate::CheckedChange& change, const AnnotateOptions& options,
          const std::string& token) {
    annotate::Target given = options.target;
    if (!options.platform.empty()) {
        given.platform = annotate::parse_platform(options.platform);
    }
    given.artifact_url = options.artifact_url;
    try {
        const annotate::Target target =
            annotate::detect_target(given, annotate::process_environment());
        annotate::AnnotateSettings settings;
        settings.slot = options.slot;
        settings.body_limit = options.body_limit;
        settings.line_notes = options.line_notes;
        settings.artifact_url = target.artifact_url;
        settings.render.markdown_rows = options.markdown_rows;
        settings.render.link_template =
            options.link_template.empty() ? platform_link_template(target) : options.link_template;
        if (token.empty()) {
            throw annotate::PostError("the environment variable " + options.token_variable +
                                      " holds no token");
        }
        annotate::HttpSettings http;
        http.timeout = std::chrono::seconds(options.timeout);
        http.connect_timeout = std::min(http.timeout, std::chrono::milliseconds(10000));
        http.ca_file = options.ca_file;
        http.secret = token;
        http.user_agent = std::string("tollgate/") + TOLLGATE_VERSION;
        if (const char* backoff = std::getenv("TOLLGATE_TEST_BACKOFF_MS")) {
            http.backoff = std::chrono::milliseconds(std::strtol(backoff, nullptr, 10));
        }
        annotate::HttpClient client(http);
        annotate::ForgeApi api(target, client, token);
        const annotate::AnnotateResult result =
            annotate::annotate_change(change.report, change.verdict, api, settings);
        const std::string line = summarise(result, target, options.line_notes);
        std::cerr << annotate::redact("tollgate: " + line + "\n", token);
        for (const auto& warning : result.warnings) {
            std::cerr << annotate::redact("tollgate: warning: " + warning + "\n", token);
        }
    } catch (const annotate::PostError& e) {
        std::cerr << annotate::redact(
            std::string("tollgate: warning: no comment posted: ") + e.what() + "\n", token);
    } catch (const std::exception& e) {
        std::cerr << annotate::redact(
            std::string("tollgate: warning: no comment posted: internal error: ") + e.what() +
                " (run with --verbose and report it)\n",
            token);
    }
}

void print_dry_run(const annotate::CheckedChange& change, const AnnotateOptions& options) {
    annotate::Target target = options.target;
    if (!options.platform.empty()) {
        target.platform = annotate::parse_platform(options.platform);
    }
    const annotate::Platform platform = target.platform.value_or(annotate::Platform::github);
    report::RenderOptions render;
    render.markdown_rows = options.markdown_rows;
    render.link_template = options.link_template;
    if (change.report.functions.empty() && change.verdict.findings.empty()) {
        std::cout << annotate::compose_now_passes(change.report, options.slot);
    } else {
        std::cout << annotate::compose_comment(change.report, change.verdict, render, options.slot,
                                               options.body_limit > 0
                                                   ? options.body_limit
                                                   : annotate::comment_body_limit(platform),
                                               options.artifact_url)
                         .text;
    }
    std::cout.flush();
}

// Return the token from the environment variable `name`, and remove the variable from this
// process's environment, so that no child (check parses the change's hostile sources) inherits it.
std::string take_token(const std::string& name) {
    const char* value = std::getenv(name.c_str());
    const std::string token = value == nullptr ? std::string() : value;
    ::unsetenv(name.c_str());
    return token;
}

int run_annotate(const AnnotateOptions& options, const GlobalOptions& global) {
    validate(options);
    const std::string token = take_token(options.token_variable);
    if (!options.from.empty()) {
        const annotate::CheckedChange change = annotate::read_check_report(options.from);
        options.dry_run ? print_dry_run(change, options) : post(change, options, token);
        return static_cast<int>(ExitCode::pass);
    }
    // Run check as a child of this very binary, with its report also written as JSON for us.
    const TemporaryReport json;
    std::vector<std::string> argv = {hook::self_executable()};
    if (global.verbose) {
        argv.push_back("--verbose");
    }
    argv.push_back("check");
    argv.insert(argv.end(), options.check_arguments.begin(), options.check_arguments.end());
    argv.insert(argv.end(), {"--report", "json:" + json.path()});
    const int code = hook::run_process(argv, hook::Output::inherit).exit_code;
    if (code != static_cast<int>(ExitCode::pass) && code != static_cast<int>(ExitCode::blocked)) {
        std::cerr << "tollgate: warning: no comment posted: check judged nothing (exit " << code
                  << ")\n";
        return code;
    }
    try {
        const annotate::CheckedChange change = annotate::read_check_report(json.path());
        options.dry_run ? print_dry_run(change, options) : post(change, options, token);
    } catch (const UsageError& e) {
        std::cerr << "tollgate: warning: no comment posted: " << e.what() << "\n";
    }
    return code;
}

} // namespace

void attach_annotate(CLI::App& sub, const GlobalOptions& global, std::function<int()>& selected) {
    auto options = std::make_shared<AnnotateOptions>();
    sub.description(
        "Keep one comment with the change's Markdown report on its pull/merge request (GitHub, "
        "GitLab, Gitea/Forgejo): created on the first run, found again by a hidden marker and "
        "edited in place, collapsed to one \"now passes\" line when the change no longer "
        "touches a function. The platform and the request are read from the CI's environment. "
        "The token is read from the environment variable TOLLGATE_ANNOTATE_TOKEN (or the one "
        "--token-env names). A comment that cannot be posted is a warning: with --from the exit "
        "code is 0, otherwise it is check's.");
    sub.add_option("--from", options->from,
                   "JSON report of a check (\"tollgate check --report json:PATH\"); without it, "
                   "check runs with the options given after \"--\"");
    sub.add_option("--platform", options->platform,
                   "github, gitlab, gitea or forgejo (default: from the CI's environment)");
    sub.add_option("--api-url", options->target.api_url,
                   "API root, e.g. https://gitlab.example/api/v4 (default: from the CI's "
                   "environment)");
    sub.add_option("--repository", options->target.repository,
                   "OWNER/NAME, or a GitLab project id or path (default: from the CI's "
                   "environment)");
    sub.add_option("--number", options->target.number,
                   "Pull request number or merge request iid (default: from the CI's "
                   "environment)")
        // Up to 2^53 - 1, the largest whole number a JSON reader keeps exactly (RFC 8259, 6).
        ->check(whole_number(1, (std::uint64_t{1} << 53) - 1));
    sub.add_option("--token-env", options->token_variable,
                   "Name of the environment variable that holds the API token")
        ->capture_default_str();
    sub.add_option("--slot", options->slot,
                   "Name of the comment, so that several gates can keep one each")
        ->capture_default_str();
    sub.add_option("--artifact-url", options->artifact_url,
                   "Where the full report is kept, linked when the comment is cut to the size "
                   "limit (default: the CI run's page)");
    sub.add_option("--link-template", options->link_template,
                   "Link file:line cells as check does (default: the platform's file view)");
    sub.add_option("--markdown-rows", options->markdown_rows,
                   "Rows of the table shown before the rest is folded")
        ->check(whole_number(0, 100000))
        ->capture_default_str();
    sub.add_flag("--line-notes", options->line_notes,
                 "Also put a note on the first line of each function with a blocking finding "
                 "(GitHub review comments, GitLab diff threads)");
    sub.add_option("--body-limit", options->body_limit,
                   "Largest comment in bytes (default 0: the platform's documented limit)")
        ->check(whole_number(0, std::uint64_t{1} << 30))
        ->capture_default_str();
    sub.add_option("--timeout", options->timeout, "Seconds one request may take")
        ->check(whole_number(1, 600))
        ->capture_default_str();
    sub.add_option("--ca-file", options->ca_file,
                   "PEM file of the CA certificates to trust instead of the system's");
    sub.add_flag("--dry-run", options->dry_run,
                 "Print the comment's body on stdout instead of posting it");
    sub.add_option("check-options", options->check_arguments,
                   "After \"--\": the options of the check to run");
    sub.footer("Examples:\n"
               "  tollgate annotate --from tollgate-report/tollgate.json\n"
               "  tollgate annotate -- --base origin/main --report markdown:delta.md\n"
               "  tollgate annotate --platform gitlab --api-url https://gitlab.example/api/v4 "
               "--repository 42 --number 7 --from check.json");
    sub.callback([options, &global, &selected] {
        selected = [options, &global] { return run_annotate(*options, global); };
    });
}

} // namespace tollgate
