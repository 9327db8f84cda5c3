// SPDX-License-Identifier: MIT
// Test support for calibrate: a scripted 60-commit history of a small project that bundles a
// third-party test framework in a vendored folder (its own licence and build file).
#pragma once

#include "support/temp_repo.hpp"

#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

namespace tollgate::test {

// The vendored folder of the scripted history.
inline const char* k_vendored_folder = "tests/vendor/minicheck";

// Write the source of the project's file after `step` edits: six functions, each grown by the
// edits that picked it (edit i picks function i % 6 and adds 1 + (7 i) % 5 statements, and every
// eleventh edit adds a loop), so the growth per commit varies from a few percent to several-fold.
inline std::string engine_source(int step) {
    std::string text;
    for (int k = 0; k < 6; ++k) {
        text += "int stage" + std::to_string(k) + "(int x, int y) {\n";
        text +=
            "    int acc = x * " + std::to_string(k + 2) + " + y - " + std::to_string(k) + ";\n";
        text += "    if (acc > y) { acc = acc - y * 3; } else { acc = acc + x; }\n";
        for (int i = 1; i <= step; ++i) {
            if (i % 6 != k) {
                continue;
            }
            const int statements = 1 + (7 * i) % 5;
            for (int s = 0; s < statements; ++s) {
                text += "    acc = acc * " + std::to_string(s + 3) + " + (x ^ " +
                        std::to_string(i) + ") - y / " + std::to_string(s + 1) + ";\n";
            }
            if (i % 11 == 0) {
                text += "    for (int j = 0; j < x; ++j) { if (j % 4 == 1) { acc += j * y; } "
                        "else { acc -= j; } }\n";
            }
        }
        text += "    return acc;\n}\n\n";
    }
    return text;
}

// Write the vendored framework's runner after `step` edits: every third edit adds a long
// function, which would dominate the history if it were counted.
inline std::string vendored_source(int step) {
    std::string text = "int mc_run(int n) { return n + 1; }\n";
    for (int i = 3; i <= step; i += 3) {
        text += "\nint mc_case" + std::to_string(i) + "(int a, int b, int c) {\n    int r = 0;\n";
        for (int s = 0; s < 12; ++s) {
            text += "    if (a > " + std::to_string(s) + ") { r += a * b - c / " +
                    std::to_string(s + 1) + "; } else { r -= b + c * " + std::to_string(s) +
                    "; }\n";
        }
        text += "    return r;\n}\n";
    }
    return text;
}

// Build the history in `dir` (an empty folder): a root commit and 60 edits; return the commit
// ids, oldest first.
inline std::vector<std::string> make_sixty_commit_history(const std::string& dir) {
    init_repo(dir);
    const auto write = [&](const std::string& path, const std::string& text) {
        const auto full = std::filesystem::path(dir) / path;
        std::filesystem::create_directories(full.parent_path());
        std::ofstream out(full, std::ios::binary | std::ios::trunc);
        out << text;
    };
    const std::string vendored = k_vendored_folder;
    write(vendored + "/LICENSE", "Permission is granted to use this scripted test framework.\n");
    write(vendored + "/CMakeLists.txt", "add_library(minicheck runner.c)\n");
    write(vendored + "/runner.c", vendored_source(0));
    write("src/engine.c", engine_source(0));
    std::vector<std::string> commits = {commit_all(dir, "start")};
    for (int i = 1; i <= 60; ++i) {
        write("src/engine.c", engine_source(i));
        if (i % 3 == 0) {
            write(vendored + "/runner.c", vendored_source(i));
        }
        commits.push_back(commit_all(dir, "edit " + std::to_string(i)));
    }
    return commits;
}

} // namespace tollgate::test
