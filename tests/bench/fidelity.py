#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""Compare `tollgate check`'s touched functions with an independent oracle, commit by commit.

For each of the last K first-parent commits C of a repository (with its first parent P), both
sides say which function definitions the change P..C touched, as a set of (side, file, last line
of the definition):

- tollgate: every function side `check --base P --head C --report json` reports, kept when its
  extent [line, end_line] holds a changed line of its side;
- the oracle: Universal Ctags' function definitions (kind f, with their end line) of each changed
  C/C++ file at P and at C, kept when their extent holds a changed line of their side.

The changed lines of both come from git's own `git diff -U0 -M P C`. The oracle's extent starts at
the line ctags names (the function's name) and reaches up over the lines that continue the same
declaration above it (a return type or template header on lines of their own: lines that are not
blank, comments or directives, and do not end in ";", "{" or "}"), and ends at ctags' end line.
Definitions nested in another definition (members of local classes) belong to the outer one, as
in Tollgate's convention, and lambdas are no functions of their own. Inactive #if branches are
examined (ctags' CPreProcessor:if0). The test macros of common C++ test frameworks (TEST,
TEST_F, TEST_CASE, MATCHER, ACTION, ...) are told to ctags as the function headers they expand
to.

Prints per commit the counts, every disagreement, and the totals: agreement |T n O| / |T u O| and
recall |T n O| / |O| (T tollgate's set, O the oracle's).
"""

import json
import os
import re
import subprocess
import sys
import tempfile

HEADERS = {".h", ".hh", ".hpp", ".hxx", ".inl", ".ipp", ".tpp"}
SOURCES = {".c", ".cc", ".cpp", ".cxx", ".c++"}


def ext_of(path):
    return os.path.splitext(path)[1].lower()


def is_c_family(path):
    return ext_of(path) in HEADERS or ext_of(path) in SOURCES


def git(repo, *args, binary=False):
    out = subprocess.run(["git", "-C", repo, *args], check=True, capture_output=True).stdout
    return out if binary else out.decode("utf-8", "replace")


def changed_lines(repo, base, head):
    """Return {(base_path, head_path): (deleted base lines, added head lines)} for C/C++ files."""
    diff = git(repo, "diff", "-U0", "-M", "--no-color", "--no-ext-diff", base, head)
    files = {}
    current = None
    base_path = head_path = None
    for line in diff.split("\n"):
        if line.startswith("diff --git "):
            current = None
            base_path = head_path = None
        elif line.startswith("--- "):
            base_path = None if line == "--- /dev/null" else line[6:]
        elif line.startswith("+++ "):
            head_path = None if line == "+++ /dev/null" else line[6:]
            paths = [p for p in (base_path, head_path) if p]
            if paths and all(is_c_family(p) for p in paths):
                current = (base_path, head_path)
                files[current] = (set(), set())
            else:
                current = None
        elif line.startswith("@@") and current is not None:
            m = re.match(r"@@ -(\d+)(?:,(\d+))? \+(\d+)(?:,(\d+))? @@", line)
            b_start, b_count = int(m.group(1)), int(m.group(2) or "1")
            h_start, h_count = int(m.group(3)), int(m.group(4) or "1")
            files[current][0].update(range(b_start, b_start + b_count))
            files[current][1].update(range(h_start, h_start + h_count))
    return files


# The test macros of common C++ test frameworks, told to ctags as the function headers they
# expand to (a macro invocation followed by a body is a function).
TEST_MACROS = [
    "-D", "TEST(a,b)=void oracle_test()",
    "-D", "TEST_F(a,b)=void oracle_test()",
    "-D", "TEST_P(a,b)=void oracle_test()",
    "-D", "TYPED_TEST(a,b)=void oracle_test()",
    "-D", "TYPED_TEST_P(a,b)=void oracle_test()",
    "-D", "TEST_CASE(...)=void oracle_test()",
    "-D", "TEST_CASE_METHOD(...)=void oracle_test()",
    "-D", "SCENARIO(...)=void oracle_test()",
    "-D", "MATCHER(...)=void oracle_test()",
    "-D", "MATCHER_P(...)=void oracle_test()",
    "-D", "MATCHER_P2(...)=void oracle_test()",
    "-D", "MATCHER_P3(...)=void oracle_test()",
    "-D", "ACTION(...)=void oracle_test()",
    "-D", "ACTION_P(...)=void oracle_test()",
    "-D", "ACTION_P2(...)=void oracle_test()",
]

DECLARATION_END = re.compile(r"[;{}]\s*$")


def declaration_start(lines, name_line):
    """Return the first line of the declaration whose name ctags put on `name_line`."""
    start = name_line
    while start > 1:
        text = lines[start - 2].strip()
        if (not text or text.startswith(("//", "/*", "*", "#")) or text.endswith("*/")
                or DECLARATION_END.search(text) or text.endswith(":")):
            break
        start -= 1
    return start


def oracle_functions(content, path):
    """Return [(first line, last line, name)] of the function definitions ctags finds."""
    language = "C" if ext_of(path) == ".c" else "C++"
    with tempfile.NamedTemporaryFile("wb", suffix=ext_of(path) or ".h", delete=False) as f:
        f.write(content)
        name = f.name
    try:
        out = subprocess.run(
            ["ctags", "--output-format=json", "--fields=+ne", "--kinds-C=f", "--kinds-C++=f",
             "--language-force=" + language, "--param-CPreProcessor:if0=true", *TEST_MACROS,
             "-o", "-", name],
            check=True, capture_output=True).stdout.decode("utf-8", "replace")
    finally:
        os.unlink(name)
    lines = content.decode("utf-8", "replace").split("\n")
    found = []
    for row in out.splitlines():
        tag = json.loads(row)
        if tag.get("_type") != "tag" or "end" not in tag or tag["name"].startswith("__anon"):
            continue  # lambdas are not functions of their own
        found.append((declaration_start(lines, tag["line"]), tag["end"], tag["name"]))
    # Nested definitions belong to the enclosing one.
    outer = []
    for f in sorted(found, key=lambda t: (t[0], -t[1])):
        if outer and f[0] >= outer[-1][0] and f[1] <= outer[-1][1]:
            continue
        outer.append(f)
    return outer


def meets(first, last, lines):
    return any(first <= n <= last for n in lines)


def oracle_set(repo, base, head, files):
    touched = {}
    for (base_path, head_path), (deleted, added) in files.items():
        for side, rev, path, lines in (("base", base, base_path, deleted),
                                       ("head", head, head_path, added)):
            if path is None or not lines:
                continue
            content = git(repo, "show", f"{rev}:{path}", binary=True)
            for first, last, name in oracle_functions(content, path):
                if meets(first, last, lines):
                    touched[(side, path, last)] = (name, first)
    return touched


def tollgate_set(repo, tollgate, policy, base, head, files, jobs):
    with tempfile.NamedTemporaryFile("r", suffix=".json", delete=False) as f:
        report_path = f.name
    try:
        run = subprocess.run(
            [tollgate, "check", "--base", base, "--head", head, "--policy", policy, "--report",
             "json:" + report_path, "--no-color", "-j", str(jobs)],
            cwd=repo, capture_output=True)
        if run.returncode not in (0, 1):
            return None, run.stderr.decode("utf-8", "replace").strip()
        report = json.load(open(report_path))
    finally:
        os.unlink(report_path)
    lines_of = {}
    for (base_path, head_path), (deleted, added) in files.items():
        if base_path:
            lines_of[("base", base_path)] = deleted
        if head_path:
            lines_of[("head", head_path)] = added
    touched = {}
    for f in report["functions"]:
        for side in ("base", "head"):
            s = f[side]
            if s is None:
                continue
            lines = lines_of.get((side, s["file"]), set())
            if meets(s["line"], s["end_line"], lines):
                touched[(side, s["file"], s["end_line"])] = (f["function"], s["line"])
    return touched, None


def main():
    if len(sys.argv) < 3:
        sys.exit("usage: fidelity.py REPO TOLLGATE [K] [JOBS]")
    # check runs inside REPO: a relative path to the binary is taken from here.
    repo, tollgate = sys.argv[1], os.path.abspath(sys.argv[2])
    k = int(sys.argv[3]) if len(sys.argv) > 3 else 30
    jobs = int(sys.argv[4]) if len(sys.argv) > 4 else 2
    with tempfile.NamedTemporaryFile("w", suffix=".yaml", delete=False) as f:
        # No rules and no baseline: the repository's own policy and snapshots play no part.
        f.write("tollgate-policy: 1\nrules: []\n")
        policy = f.name
    commits = git(repo, "rev-list", "--first-parent", f"--max-count={k}", "HEAD").split()
    both = only_t = only_o = 0
    failures = 0
    for commit in commits:
        parents = git(repo, "rev-list", "--parents", "-n", "1", commit).split()[1:]
        if not parents:
            continue
        base = parents[0]
        files = changed_lines(repo, base, commit)
        if not files:
            continue
        oracle = oracle_set(repo, base, commit, files)
        mine, error = tollgate_set(repo, tollgate, policy, base, commit, files, jobs)
        subject = git(repo, "log", "-1", "--format=%s", commit).strip()[:60]
        if mine is None:
            failures += 1
            print(f"{commit[:7]} check failed: {error}")
            continue
        common = set(mine) & set(oracle)
        extra, missing = set(mine) - set(oracle), set(oracle) - set(mine)
        both += len(common)
        only_t += len(extra)
        only_o += len(missing)
        print(f"{commit[:7]} {len(files):3} files  tollgate {len(mine):4}  oracle {len(oracle):4}"
              f"  agree {len(common):4}  {subject}")
        for key in sorted(extra):
            name, first = mine[key]
            print(f"    only tollgate: {key[0]} {key[1]}:{first}-{key[2]} {name}")
        for key in sorted(missing):
            name, first = oracle[key]
            print(f"    only oracle:   {key[0]} {key[1]}:{first}-{key[2]} {name}")
    os.unlink(policy)
    union = both + only_t + only_o
    agreement = both / union if union else 1.0
    recall = both / (both + only_o) if both + only_o else 1.0
    print(f"commits: {len(commits)}, check failures: {failures}")
    print(f"touched function sides: both {both}, only tollgate {only_t}, only oracle {only_o}")
    print(f"agreement {100 * agreement:.2f}%  recall {100 * recall:.2f}%")


if __name__ == "__main__":
    main()
