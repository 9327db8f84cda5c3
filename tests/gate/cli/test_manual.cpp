// SPDX-License-Identifier: MIT
// The reference manual gate/cli/tollgate.1 against the binary: every command "tollgate --help"
// lists has a section, every option of every --help is in that section and every option the
// section lists exists (a global option every command accepts, such as -C, once under GLOBAL
// OPTIONS); every policy key of policies/README.md is described.
#include "support/temp_repo.hpp"

#include <algorithm>
#include <catch2/catch.hpp>
#include <iterator>
#include <map>
#include <regex>
#include <set>
#include <sstream>
#include <string>
#include <vector>

using tollgate::test::read_text;
using tollgate::test::run_tollgate;

namespace {

using OptionSet = std::set<std::string>;

const std::string k_manual = std::string(TOLLGATE_SOURCE_DIR) + "/gate/cli/tollgate.1";

std::vector<std::string> lines_of(const std::string& text) {
    std::vector<std::string> lines;
    std::istringstream in(text);
    for (std::string line; std::getline(in, line);) {
        lines.push_back(line);
    }
    return lines;
}

// Return the entries of a CLI11 help section ("Options:" or "Subcommands:"): the first column of
// each line indented by two spaces, up to the next unindented line.
std::vector<std::string> help_section(const std::string& help, const std::string& title) {
    std::vector<std::string> entries;
    bool inside = false;
    for (const std::string& line : lines_of(help)) {
        if (line == title) {
            inside = true;
        } else if (inside && (line.empty() || line[0] != ' ')) {
            inside = false;
        } else if (inside && line.size() > 2 && line[2] != ' ') {
            entries.push_back(line.substr(2, line.find("  ", 2) - 2));
        }
    }
    return entries;
}

// Return the options of a --help text: "-j,--jobs UINT=0" gives "-j" and "--jobs"; -h/--help,
// which every command has, is left out.
OptionSet help_options(const std::string& help) {
    OptionSet options;
    for (const std::string& entry : help_section(help, "Options:")) {
        std::istringstream names(entry.substr(0, entry.find(' ')));
        for (std::string name; std::getline(names, name, ',');) {
            if (name != "-h" && name != "--help") {
                options.insert(name);
            }
        }
    }
    return options;
}

// Return every command path ("check", "hook install", ...) reachable from `tollgate --help`,
// mapped to its --help text; a command with subcommands is replaced by them.
std::map<std::string, std::string> every_command() {
    std::map<std::string, std::string> commands;
    std::vector<std::string> pending;
    for (const std::string& name : help_section(run_tollgate("--help", ".").out, "Subcommands:")) {
        pending.push_back(name);
    }
    while (!pending.empty()) {
        const std::string path = pending.back();
        pending.pop_back();
        const auto help = run_tollgate(path + " --help", ".");
        REQUIRE(help.exit_code == 0);
        const auto children = help_section(help.out, "Subcommands:");
        for (const std::string& child : children) {
            pending.push_back(path + " " + child);
        }
        if (children.empty()) {
            commands[path] = help.out;
        }
    }
    return commands;
}

// Return the options listed in the manual section whose heading is `heading` (.SS or .SH): the
// option names on the line after each .TP, with troff's "\-" read as "-".
OptionSet manual_options(const std::string& manual, const std::string& heading, bool& found) {
    static const std::regex option(R"((?:\\-){1,2}[A-Za-z][A-Za-z0-9\\-]*)");
    OptionSet options;
    found = false;
    bool inside = false;
    bool after_tp = false;
    for (const std::string& line : lines_of(manual)) {
        if (line.rfind(".SS ", 0) == 0 || line.rfind(".SH ", 0) == 0) {
            inside = line == heading;
            found = found || inside;
            continue;
        }
        if (inside && after_tp) {
            for (auto it = std::sregex_iterator(line.begin(), line.end(), option);
                 it != std::sregex_iterator(); ++it) {
                options.insert(std::regex_replace(it->str(), std::regex(R"(\\-)"), "-"));
            }
        }
        after_tp = inside && line == ".TP";
    }
    options.erase("-h");
    options.erase("--help");
    return options;
}

} // namespace

TEST_CASE("the manual lists exactly the options of every command's --help", "[manual]") {
    const std::string manual = read_text(k_manual);
    REQUIRE_FALSE(manual.empty());
    const auto commands = every_command();
    // The commands DESIGN.md names, at least; a new one must be documented too.
    for (const char* expected : {"check", "measure", "explain", "snapshot", "policy",
                                 "hook install", "hook uninstall", "hook run"}) {
        CHECK(commands.count(expected) == 1);
    }
    // A global option every command accepts after its name too (-C) is documented once, under
    // GLOBAL OPTIONS, like -h/--help.
    const OptionSet global = help_options(run_tollgate("--help", ".").out);
    OptionSet shared = global;
    for (const auto& [path, help] : commands) {
        const OptionSet own = help_options(help);
        OptionSet kept;
        std::set_intersection(shared.begin(), shared.end(), own.begin(), own.end(),
                              std::inserter(kept, kept.begin()));
        shared = kept;
    }
    CHECK(shared.count("-C") == 1);
    CHECK(shared.count("--repo") == 1);
    for (const auto& [path, help] : commands) {
        bool found = false;
        const OptionSet documented = manual_options(manual, ".SS \"tollgate " + path + "\"", found);
        OptionSet own;
        for (const std::string& option : help_options(help)) {
            if (shared.count(option) == 0) {
                own.insert(option);
            }
        }
        INFO("command \"tollgate " << path << "\"");
        CHECK(found);
        CHECK(documented == own);
    }
    SECTION("the global options too") {
        bool found = false;
        const OptionSet documented = manual_options(manual, ".SH GLOBAL OPTIONS", found);
        CHECK(found);
        CHECK(documented == global);
    }
}

TEST_CASE("manual_options and help_options read their formats", "[manual]") {
    SECTION("a help line with a short and a long name gives both") {
        CHECK(help_options("Options:\n  -h,--help    Print\n  -j,--jobs UINT=0  Threads\n"
                           "  --base TEXT  Base\n\nExamples:\n  --not-an-option\n") ==
              OptionSet{"-j", "--jobs", "--base"});
    }
    SECTION("only the line after .TP in the named section counts") {
        bool found = false;
        const std::string text = ".SS \"tollgate x\"\nsee \\-\\-other\n.TP\n.BR \\-j \", \" "
                                 "\\-\\-jobs \" N\"\ntext \\-\\-ignored\n.SS \"tollgate y\"\n.TP\n"
                                 ".B \\-\\-why\n";
        CHECK(manual_options(text, ".SS \"tollgate x\"", found) == OptionSet{"-j", "--jobs"});
        CHECK(found);
        manual_options(text, ".SS \"tollgate z\"", found);
        CHECK_FALSE(found);
    }
}

TEST_CASE("the manual describes every policy key, rule kind and exit code", "[manual]") {
    const std::string manual = read_text(k_manual);
    const std::string schema = read_text(std::string(TOLLGATE_SOURCE_DIR) + "/policies/README.md");
    // Keys are the backticked first cells of the schema tables ("| `paths.include` / ...").
    static const std::regex key(R"(`([a-z][a-z0-9.-]*)`)");
    std::size_t keys = 0;
    for (const std::string& line : lines_of(schema)) {
        if (line.rfind("| `", 0) != 0) {
            continue;
        }
        const std::string cell = line.substr(1, line.find('|', 1) - 1);
        for (auto it = std::sregex_iterator(cell.begin(), cell.end(), key);
             it != std::sregex_iterator(); ++it) {
            ++keys;
            INFO("policy key or kind " << (*it)[1]);
            CHECK(manual.find((*it)[1].str()) != std::string::npos);
        }
    }
    CHECK(keys >= 12); // the schema and kind tables were read
    const std::size_t exit_status = manual.find(".SH EXIT STATUS");
    REQUIRE(exit_status != std::string::npos);
    for (const char* code : {"\n.B 0\n", "\n.B 1\n", "\n.B 2\n", "\n.B 3\n"}) {
        INFO("exit code" << code);
        CHECK(manual.find(code, exit_status) < manual.find(".SH ENVIRONMENT"));
    }
}
