#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""Generate a benchmark repository of Java files: N files of about L lines each (an invented
ground-station service), a base commit, and a head commit that edits a few methods in every file.

Invented code for benchmarking only."""
import os
import subprocess
import sys


def run(cmd, cwd):
    subprocess.run(cmd, cwd=cwd, check=True, stdout=subprocess.DEVNULL)


def method(i, m, variant):
    extra = ""
    if variant and m % 7 == 0:
        extra = (f"        if (values.size() > {m + 3}) {{\n"
                 f"            total += values.get({m % 3}) * {variant};\n"
                 f"        }}\n")
    return (f"    public int step{m}(int x, List<Integer> values) {{\n"
            f"        int total = x;\n"
            f"        for (int v : values) {{\n"
            f"            total += v > {m} ? v - {m} : v + {m};\n"
            f"        }}\n"
            f"{extra}"
            f"        Map<String, Integer> seen = new HashMap<>();\n"
            f"        seen.merge(\"step{m}\", total, Integer::sum);\n"
            f"        return seen.getOrDefault(\"step{m}\", 0) + counts.size();\n"
            f"    }}\n")


def source(i, methods, variant):
    parts = [f"package com.skyline.bench{i};\n", "import java.util.HashMap;",
             "import java.util.List;", "import java.util.Map;\n",
             f"public class Station{i} {{",
             "    private final Map<String, Integer> counts = new HashMap<>();\n",
             f"    public Station{i}(int seed) {{\n        counts.put(\"seed\", seed);\n    }}\n"]
    for m in range(methods):
        parts.append(method(i, m, variant))
    parts.append("}\n")
    return "\n".join(parts)


def main():
    repo, files, lines = sys.argv[1], int(sys.argv[2]), int(sys.argv[3])
    methods = max(1, lines // 12)
    os.makedirs(os.path.join(repo, "src"), exist_ok=True)
    run(["git", "init", "-q", "-b", "main"], repo)
    for variant in (0, 1):
        for i in range(files):
            with open(os.path.join(repo, "src", f"Station{i}.java"), "w") as out:
                out.write(source(i, methods, variant))
        run(["git", "add", "-A"], repo)
        run(["git", "-c", "user.name=bench", "-c", "user.email=bench@example.invalid", "commit",
             "-q", "-m", "head" if variant else "base"], repo)
    print(repo)


if __name__ == "__main__":
    main()
