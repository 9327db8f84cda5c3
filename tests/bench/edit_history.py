#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""Build a scratch git history from a real source tree: the tree as the first commit, then a
series of commits, each making one kind of edit a developer makes to a few of its real C/C++
files (seeded, so the same tree gives the same history).

Usage: edit_history.py SOURCE_TREE REPO [COMMITS] [SEED]

The edits are found in the text alone (no parser is asked where functions are): a statement
added or deleted in an indented block (also in a Windows-only #if branch, inactive on Linux),
a return value edited, comments reworded, a region's indentation changed, a function moved under
`#if 0`, a parameter type edited, a namespace renamed, a macro definition edited, a function
appended or removed (a block from a line at column 0 that ends in "{" to the next line "}"), and a
test appended to a test file.
"""

import os
import random
import re
import shutil
import subprocess
import sys

EXTENSIONS = (".c", ".cc", ".cpp", ".cxx", ".h", ".hh", ".hpp")


def git(repo, *args):
    subprocess.run(["git", "-C", repo, *args], check=True, capture_output=True)


def sources(repo):
    found = []
    for folder, _, names in os.walk(repo):
        if "/.git" in folder:
            continue
        for name in names:
            if name.endswith(EXTENSIONS):
                found.append(os.path.relpath(os.path.join(folder, name), repo))
    return sorted(found)


def read(repo, path):
    with open(os.path.join(repo, path), encoding="utf-8", errors="surrogateescape") as f:
        return f.read().split("\n")


def write(repo, path, lines):
    with open(os.path.join(repo, path), "w", encoding="utf-8", errors="surrogateescape") as f:
        f.write("\n".join(lines))


def blocks(lines):
    """Return (first, last) line indexes of blocks from a column-0 line ending in "{" to "}"."""
    found = []
    start = None
    for i, line in enumerate(lines):
        if start is None and re.match(r"^[A-Za-z_].*\)\s*(const\s*)?\{\s*$", line) \
                and not line.startswith(("namespace", "class", "struct", "enum", "extern")):
            start = i
        elif start is not None and line == "}":
            # A template header on the lines above belongs to the function.
            while start > 0 and lines[start - 1].startswith("template"):
                start -= 1
            found.append((start, i))
            start = None
        elif start is not None and re.match(r"^[A-Za-z_#]", line):
            start = None
    return found


def add_statement(lines, rng):
    spots = [i for i, l in enumerate(lines) if re.match(r"^ {2,}\S.*;\s*$", l)
             and not l.strip().startswith(("//", "return", "case", "break"))]
    if not spots:
        return False
    i = rng.choice(spots)
    indent = re.match(r"^ *", lines[i]).group(0)
    lines.insert(i + 1, indent + "static_cast<void>(0);  // scratch edit")
    return True


def delete_statement(lines, rng):
    spots = [i for i, l in enumerate(lines) if re.match(r"^ {4,}[a-z_][\w:.>-]*\(.*\);\s*$", l)]
    if not spots:
        return False
    del lines[rng.choice(spots)]
    return True


def edit_return(lines, rng):
    spots = [i for i, l in enumerate(lines) if re.match(r"^ +return (true|false|0|1);\s*$", l)]
    if not spots:
        return False
    i = rng.choice(spots)
    lines[i] = lines[i].replace("return ", "return !!(", 1).replace(";", ");", 1)
    return True


def edit_inactive(lines, rng):
    """Add a statement inside a Windows-only branch (inactive when building on Linux)."""
    stack = []
    spots = []
    for i, line in enumerate(lines):
        text = line.strip()
        if text.startswith("#if"):
            windows = bool(re.search(r"GTEST_OS_WINDOWS|_MSC_VER|_WIN32", text))
            stack.append(windows and "!" not in text and not text.startswith("#ifndef"))
        elif text.startswith(("#else", "#elif")) and stack:
            stack[-1] = False
        elif text.startswith("#endif") and stack:
            stack.pop()
        elif any(stack) and re.match(r"^ {2,}\S.*;\s*$", line) and "return" not in line:
            spots.append(i)
    if not spots:
        return False
    i = rng.choice(spots)
    indent = re.match(r"^ *", lines[i]).group(0)
    lines.insert(i + 1, indent + "static_cast<void>(0);  // scratch edit, Windows only")
    return True


def reword_comment(lines, rng):
    spots = [i for i, l in enumerate(lines) if re.match(r"^\s*// \w", l)]
    if not spots:
        return False
    i = rng.choice(spots)
    lines[i] = lines[i] + " (reworded)"
    return True


def reindent(lines, rng):
    spots = blocks(lines)
    if not spots:
        return False
    first, last = rng.choice(spots)
    for i in range(first + 1, last):
        if lines[i].startswith("  "):
            lines[i] = lines[i][2:]
    return True


def disable_function(lines, rng):
    spots = blocks(lines)
    if not spots:
        return False
    first, last = rng.choice(spots)
    lines.insert(last + 1, "#endif  // scratch edit")
    lines.insert(first, "#if 0  // scratch edit")
    return True


def edit_parameter(lines, rng):
    spots = [(f, l) for f, l in blocks(lines) if re.search(r"\(.*\bint\b", lines[f])]
    if not spots:
        return False
    first, _ = rng.choice(spots)
    lines[first] = re.sub(r"\bint\b", "long", lines[first], count=1)
    return True


def rename_namespace(lines, rng):
    spots = [i for i, l in enumerate(lines) if re.match(r"^namespace \w+ \{", l)]
    if not spots:
        return False
    i = rng.choice(spots)
    name = re.match(r"^namespace (\w+)", lines[i]).group(1)
    lines[i] = lines[i].replace(name, name + "_v2", 1)
    return True


def edit_macro(lines, rng):
    spots = [i for i, l in enumerate(lines) if re.match(r"^#\s*define \w+ \S", l)]
    if not spots:
        return False
    i = rng.choice(spots)
    lines[i] = lines[i] + "  /* scratch edit */"
    lines.insert(i, "#define SCRATCH_EDIT_" + str(rng.randrange(1000)) + " 1")
    return True


def append_function(lines, rng):
    n = rng.randrange(1000)
    lines.extend(["", f"static int scratch_helper_{n}(int value) {{",
                  "  int total = 0;", "  for (int i = 0; i < value; ++i) {",
                  "    total += i % 3 == 0 ? i : -i;", "  }", "  return total;", "}", ""])
    return True


def remove_function(lines, rng):
    spots = blocks(lines)
    if not spots:
        return False
    first, last = rng.choice(spots)
    del lines[first:last + 1]
    return True


def append_test(lines, rng):
    if not any(l.startswith(("TEST(", "TEST_F(")) for l in lines):
        return False
    n = rng.randrange(1000)
    lines.extend(["", f"TEST(ScratchEditTest, Added{n}) {{", f"  EXPECT_EQ({n}, {n});", "}", ""])
    return True


EDITS = [add_statement, delete_statement, edit_return, reword_comment, reindent,
         disable_function, edit_parameter, rename_namespace, edit_macro, append_function,
         remove_function, append_test, edit_inactive]


def main():
    if len(sys.argv) < 3:
        sys.exit("usage: edit_history.py SOURCE_TREE REPO [COMMITS] [SEED]")
    tree, repo = sys.argv[1], sys.argv[2]
    commits = int(sys.argv[3]) if len(sys.argv) > 3 else 36
    rng = random.Random(int(sys.argv[4]) if len(sys.argv) > 4 else 11)
    shutil.copytree(tree, repo)
    git(repo, "init", "-q", "-b", "main")
    git(repo, "config", "user.email", "bench@example.invalid")
    git(repo, "config", "user.name", "bench")
    git(repo, "add", "-A")
    git(repo, "commit", "-q", "-m", "import " + os.path.basename(os.path.normpath(tree)))
    files = sources(repo)
    for n in range(commits):
        edit = EDITS[n % len(EDITS)]
        changed = []
        wanted = rng.randint(1, 6)
        for path in rng.sample(files, len(files)):
            if len(changed) == wanted:
                break
            lines = read(repo, path)
            if edit(lines, rng):
                write(repo, path, lines)
                changed.append(path)
        if not changed:
            continue
        git(repo, "add", "-A")
        git(repo, "commit", "-q", "-m", f"{edit.__name__.replace('_', ' ')}: {', '.join(changed)}")
    print(f"{repo}: {commits + 1} commits over {len(files)} C/C++ files")


if __name__ == "__main__":
    main()
