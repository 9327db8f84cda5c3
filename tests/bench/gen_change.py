#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""Generate a benchmark repository: N C++ files of about L lines each with their classes declared
in headers, a base commit, and a head commit that edits a few functions in every file.

Invented code for benchmarking only."""
import os
import subprocess
import sys


def run(cmd, cwd):
    subprocess.run(cmd, cwd=cwd, check=True, stdout=subprocess.DEVNULL)


def header(i, methods):
    lines = ["#pragma once", "#include <string>", "#include <vector>", "#include <map>", "",
             f"namespace bench{i} {{", "", f"class Station{i} {{", "public:",
             f"    explicit Station{i}(int seed);"]
    for m in range(methods):
        lines.append(f"    int step{m}(int x, const std::vector<int>& values) const;")
    lines += ["    std::string label() const;", "private:", "    int m_seed;",
              "    std::map<std::string, int> m_counts;", "};", "", f"}} // namespace bench{i}", ""]
    return "\n".join(lines)


def source(i, methods, variant):
    lines = [f'#include "station{i}.hpp"', "#include <algorithm>", "", f"namespace bench{i} {{", "",
             f"Station{i}::Station{i}(int seed) : m_seed(seed) {{}}", ""]
    for m in range(methods):
        extra = ""
        if variant and m % 7 == 0:
            extra = ("        if (total > x * 3) {\n            total -= values.size() > 2 ? values[1] : 0;\n"
                     "        }\n")
        lines += [
            f"int Station{i}::step{m}(int x, const std::vector<int>& values) const {{",
            "    int total = m_seed;",
            "    for (std::size_t k = 0; k < values.size(); ++k) {",
            f"        total += values[k] * {m + 1} - x;",
            extra.rstrip("\n") if extra else "        total ^= static_cast<int>(k);",
            "    }",
            f"    if (total % {m + 2} == 0) {{",
            "        total = std::max(total, x);",
            "    }",
            "    return total;",
            "}",
            "",
        ]
    lines += [f"std::string Station{i}::label() const {{",
              f'    return "station-{i}-" + std::to_string(m_seed);', "}", "",
              f"}} // namespace bench{i}", ""]
    return "\n".join(lines)


def main():
    if len(sys.argv) < 2:
        print("usage: gen_change.py DIR [FILES] [LINES]", file=sys.stderr)
        return 2
    root = sys.argv[1]
    files = int(sys.argv[2]) if len(sys.argv) > 2 else 10
    lines = int(sys.argv[3]) if len(sys.argv) > 3 else 500
    methods = max(1, lines // 12)
    os.makedirs(os.path.join(root, "src"), exist_ok=True)
    run(["git", "init", "-q", "-b", "main"], root)
    run(["git", "config", "user.name", "Bench"], root)
    run(["git", "config", "user.email", "bench@example.invalid"], root)
    for variant in (False, True):
        for i in range(files):
            with open(os.path.join(root, "src", f"station{i}.hpp"), "w") as f:
                f.write(header(i, methods))
            with open(os.path.join(root, "src", f"station{i}.cpp"), "w") as f:
                f.write(source(i, methods, variant))
        run(["git", "add", "-A"], root)
        run(["git", "commit", "-q", "-m", "head" if variant else "base"], root)
    return 0


if __name__ == "__main__":
    sys.exit(main())
