#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""Generate a benchmark repository with a first-parent history of N commits (default 300) on
`main`: F C++ source files with headers, where each commit edits one to three files (functions
grow, shrink or are added; now and then a header changes). Deterministic (fixed seed); written
with git fast-import, so it takes seconds.

With a fourth argument "heavy", the first commit also adds a header-only template library of
our own (include/heavy/, 30 headers of about 15,000 lines in all, class and function templates
over standard containers, instantiated in the headers) that
every source includes, as a heavy third-party library would be: parsing it dominates each file.

Invented code for benchmarking only.
Usage: gen_history.py DIR [COMMITS] [FILES] [heavy]"""
import random
import subprocess
import sys


def header(i, functions):
    lines = ["#pragma once", "#include <vector>", "", f"namespace gen{i} {{", ""]
    for name in functions:
        lines.append(f"int {name}(int x, const std::vector<int>& values);")
    lines += ["", f"}} // namespace gen{i}", ""]
    return "\n".join(lines)


def body(rng, size):
    lines = ["    int total = x;"]
    for k in range(size):
        op = rng.choice(["+", "-", "^", "*"])
        lines.append(f"    if (values.size() > {k}) {{ total = total {op} values[{k}] + {rng.randint(1, 99)}; }}")
        if k % 4 == 3:
            lines.append(f"    for (int i = 0; i < {k}; ++i) {{ total += i % {rng.randint(2, 9)}; }}")
    lines.append("    return total;")
    return lines


HEAVY_HEADERS = 30
HEAVY_TABLES = 24


def heavy_header(h):
    """One header of the generated header-only library: class templates and function templates."""
    lines = ["#pragma once", "#include <algorithm>", "#include <functional>", "#include <map>",
             "#include <string>", "#include <vector>"]
    if h > 0:
        lines.append(f'#include "heavy/part{h - 1}.hpp"')
    lines += ["", "namespace heavy {", ""]
    for k in range(HEAVY_TABLES):
        name = f"Table{h}_{k}"
        lines += [f"template <typename K, typename V> class {name} {{",
                  "public:",
                  "    void put(const K& key, const V& value) { m_items[key].push_back(value); }",
                  "    template <typename F> V fold(const K& key, V start, F f) const {",
                  "        auto it = m_items.find(key);",
                  "        if (it == m_items.end()) { return start; }",
                  "        for (const auto& v : it->second) { start = f(start, v); }",
                  "        return start;",
                  "    }",
                  "    std::size_t size() const { return m_items.size(); }",
                  "private:",
                  "    std::map<K, std::vector<V>> m_items;",
                  "};",
                  f"template <typename T> T blend{h}_{k}(const std::vector<T>& v, T w) {{",
                  "    T total{};",
                  "    std::for_each(v.begin(), v.end(), [&](const T& x) { total = total + x * w; });",
                  f"    return std::max(total, T{{{k}}});",
                  "}",
                  # Instantiated in the header, as libraries that ship common specialisations do:
                  # every file that includes it pays for the instantiation.
                  f"template class {name}<std::string, double>;",
                  f"template double blend{h}_{k}<double>(const std::vector<double>&, double);",
                  ""]
    lines += ["} // namespace heavy", ""]
    return "\n".join(lines)


def source(i, functions, sizes, seeds, heavy=False):
    lines = [f'#include "gen{i}.hpp"']
    if heavy:
        lines.append('#include "heavy/all.hpp"')
    lines += ["", f"namespace gen{i} {{", ""]
    for name in functions:
        rng = random.Random(seeds[name])
        lines.append(f"int {name}(int x, const std::vector<int>& values) {{")
        lines += body(rng, sizes[name])
        lines += ["}", ""]
    lines += [f"}} // namespace gen{i}", ""]
    return "\n".join(lines)


def main():
    out = sys.argv[1]
    commits = int(sys.argv[2]) if len(sys.argv) > 2 else 300
    files = int(sys.argv[3]) if len(sys.argv) > 3 else 20
    heavy = len(sys.argv) > 4 and sys.argv[4] == "heavy"
    rng = random.Random(20261201)
    subprocess.run(["git", "init", "-q", "-b", "main", out], check=True)
    state = {}
    for i in range(files):
        names = [f"step{i}_{k}" for k in range(rng.randint(6, 14))]
        state[i] = {"functions": names, "sizes": {n: rng.randint(1, 8) for n in names},
                    "seeds": {n: rng.randint(0, 10**9) for n in names}}
    stream = []
    mark = 0
    when = 1700000000

    def blob(text):
        data = text.encode()
        return b"data %d\n" % len(data) + data + b"\n"

    for c in range(commits):
        mark += 1
        when += 3600
        if c == 0:
            touched = list(range(files))
            message = "start"
        else:
            touched = rng.sample(range(files), rng.randint(1, 3))
            message = f"change {c}: files {', '.join(str(t) for t in touched)}"
        parts = [b"commit refs/heads/main\n", b"mark :%d\n" % mark,
                 b"committer Bench <bench@example.invalid> %d +0000\n" % when, blob(message)[:-1]]
        if c > 0:
            parts.append(b"from :%d\n" % (mark - 1))
        elif heavy:
            for h in range(HEAVY_HEADERS):
                parts.append(b"M 100644 inline include/heavy/part%d.hpp\n" % h + blob(heavy_header(h)))
            parts.append(b"M 100644 inline include/heavy/all.hpp\n" +
                         blob('#pragma once\n#include "heavy/part%d.hpp"\n' % (HEAVY_HEADERS - 1)))
        for i in touched:
            s = state[i]
            header_changed = c == 0
            if c > 0:
                for name in rng.sample(s["functions"], min(len(s["functions"]), rng.randint(1, 3))):
                    s["sizes"][name] = max(1, s["sizes"][name] + rng.choice([-2, -1, 1, 1, 2, 4]))
                    s["seeds"][name] = rng.randint(0, 10**9)
                if rng.random() < 0.2:
                    name = f"extra{i}_{c}"
                    s["functions"].append(name)
                    s["sizes"][name] = rng.randint(1, 10)
                    s["seeds"][name] = rng.randint(0, 10**9)
                    header_changed = True
            parts.append(b"M 100644 inline src/gen%d.cpp\n" % i + blob(source(i, s["functions"], s["sizes"], s["seeds"], heavy)))
            if header_changed:
                parts.append(b"M 100644 inline src/gen%d.hpp\n" % i + blob(header(i, s["functions"])))
        parts.append(b"\n")
        stream.append(b"".join(parts))
    subprocess.run(["git", "fast-import", "--quiet"], cwd=out, input=b"".join(stream), check=True)
    subprocess.run(["git", "checkout", "-q", "main"], cwd=out, check=True)
    print(f"{out}: {commits} commits, {files} source files")


if __name__ == "__main__":
    main()
