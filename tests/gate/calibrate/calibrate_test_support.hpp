// SPDX-License-Identifier: MIT
// Test support for calibrate: a scripted history whose policy findings are known by construction.
#pragma once

#include "support/temp_repo.hpp"

#include <filesystem>
#include <fstream>
#include <string>

namespace tollgate::test {

// The commits of the scripted history, oldest first on the first-parent chain.
struct ScriptedHistory {
    std::string root;  // "start": f is one line
    std::string grow;  // "grow f": f gains a loop and branches (effort more than doubles)
    std::string add;   // "add g": a new function of volume above 100
    std::string tweak; // "tweak f": one literal of f changes
    std::string merge; // "merge side": a --no-ff merge whose side branch added h (volume > 100)
};

// A policy that blocks effort growth above 50% and warns for added functions of volume above 100.
inline const char* k_scripted_policy = R"(tollgate-policy: 1
rules:
  - id: effort-growth
    kind: growth
    measure: effort
    max-increase-percent: 50
    level: blocking
  - id: new-function-volume
    kind: added-ceiling
    measure: volume
    ceiling: 100
    level: warning
)";

// Build the scripted history in `dir` (an empty folder) and return its commit ids.
inline ScriptedHistory make_scripted_history(const std::string& dir) {
    ScriptedHistory h;
    init_repo(dir);
    const auto write = [&](const std::string& path, const std::string& text) {
        const auto full = std::filesystem::path(dir) / path;
        std::filesystem::create_directories(full.parent_path());
        std::ofstream out(full, std::ios::binary | std::ios::trunc);
        out << text;
    };
    write("src/a.c", "int f(int x) { return x + 1; }\n");
    h.root = commit_all(dir, "start");
    const std::string grown = "int f(int x) {\n"
                              "    int total = 0;\n"
                              "    for (int i = 0; i < x; ++i) {\n"
                              "        if (i % 3 == 0) { total += i * 2; } else { total -= i; }\n"
                              "    }\n"
                              "    return total + x + 1;\n"
                              "}\n";
    write("src/a.c", grown);
    h.grow = commit_all(dir, "grow f");
    const std::string g = "\nint g(int a, int b) {\n"
                          "    int r = a * b + a - b;\n"
                          "    while (r > 100) { r = r / 2 + a % 7; }\n"
                          "    return r;\n"
                          "}\n";
    write("src/a.c", grown + g);
    h.add = commit_all(dir, "add g");
    std::string tweaked = grown;
    tweaked.replace(tweaked.find("x + 1;"), 6, "x + 5;");
    write("src/a.c", tweaked + g);
    h.tweak = commit_all(dir, "tweak f");
    git("checkout -q -b side", dir);
    write("src/b.c", "int h(int a, int b) {\n"
                     "    int q = a * b - a + b;\n"
                     "    while (q > 50) { q = q / 3 + b % 5; }\n"
                     "    return q;\n"
                     "}\n");
    commit_all(dir, "add h on a side branch");
    git("checkout -q main", dir);
    git("merge -q --no-ff -m \"merge side\" side", dir);
    h.merge = git("rev-parse HEAD", dir);
    while (!h.merge.empty() && (h.merge.back() == '\n' || h.merge.back() == ' ')) {
        h.merge.pop_back();
    }
    return h;
}

} // namespace tollgate::test
