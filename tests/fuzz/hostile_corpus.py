#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""Write a corpus of hostile C/C++ files for the full measuring path (tests/fuzz/run_corpus.sh).

Usage: hostile_corpus.py OUT_DIR [COUNT] [--seed=N] [--secret=PATH]

Deterministic for a seed. Kinds, in turn: random bytes, truncated real sources (this
repository's own and its lexer fixtures, cut at random points), deep nesting of every bracket,
template argument list and #if, huge lines and huge files, macro bombs (object-like and
function-like), unterminated literals and comments, odd encodings (NUL bytes, Latin-1, UTF-16,
BOM, CR-only line ends) and hostile include lines (host and device files, and PATH given with
--secret, by its absolute path and by a climb of ../ from the repository). Sizes stay under a
few MiB per file.
"""

import os
import random
import sys

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), "..", ".."))


def real_sources():
    found = []
    for folder in ("gate", "core", "tests/fixtures/lexer", "examples/skyline-sensors"):
        for base, _, files in os.walk(os.path.join(ROOT, folder)):
            for name in sorted(files):
                if name.endswith((".c", ".cpp", ".hpp", ".h")):
                    found.append(os.path.join(base, name))
    return sorted(found)


def garbage(rng):
    return bytes(rng.randrange(256) for _ in range(rng.randrange(1, 20000)))


def token_soup(rng):
    words = ["{", "}", "(", ")", "[", "]", "<", ">", ";", "::", "template", "class", "struct",
             "operator", "int", "f", "T", "#if X\n", "#else\n", "#endif\n", "#define M(x) x x\n",
             "\"", "'", "/*", "*/", "//", "\\\n", "R\"(", ")\"", "enum", "namespace", "=", ","]
    return " ".join(rng.choice(words) for _ in range(rng.randrange(10, 30000))).encode()


def truncated(rng, sources):
    data = open(rng.choice(sources), "rb").read()
    return data[: rng.randrange(1, max(2, len(data)))]


def nested(rng):
    depth = rng.choice([500, 2000, 20000])
    kind = rng.randrange(6)
    if kind == 0:
        return b"int f() { return " + b"(" * depth + b"1" + b")" * depth + b"; }\n"
    if kind == 1:
        return b"void f() " + b"{" * depth + b"}" * depth + b"\n"
    if kind == 2:
        return b"A" + b"<A" * depth + b">" * depth + b" x;\nint g() { return 0; }\n"
    if kind == 3:
        return b"int x = " + b"[" * depth + b"]" * depth + b";\nint g() { return 0; }\n"
    if kind == 4:
        return b"#if 1\n" * min(depth, 5000) + b"int f() { return 1; }\n" + \
            b"#endif\n" * min(depth, 5000)
    return b"int f() { return " + b"a ? " * depth + b"b" + b" : c" * depth + b"; }\n"


def huge(rng):
    kind = rng.randrange(4)
    if kind == 0:
        return b"int f(int a) { return " + b"a+" * 500000 + b"a; }\n"
    if kind == 1:
        return b"".join(b"int f%d(int a) { return a + %d; }\n" % (i, i) for i in range(40000))
    if kind == 2:
        return b"const char* s = \"" + b"x" * 2000000 + b"\";\nint g() { return 1; }\n"
    return b"int f() {\n" + b"  int v = 1;\n" * 150000 + b"  return v;\n}\n"


def macro_bomb(rng):
    levels = rng.choice([12, 20, 30])
    if rng.randrange(2) == 0:
        lines = [b"#define M0 x x"]
        lines += [b"#define M%d M%d M%d" % (i, i - 1, i - 1) for i in range(1, levels)]
        lines.append(b"int f() { int x = 0; return M%d; }" % (levels - 1))
    else:
        lines = [b"#define F0(a) a a"]
        lines += [b"#define F%d(a) F%d(F%d(a))" % (i, i - 1, i - 1) for i in range(1, levels)]
        lines.append(b"int f() { int x = 0; return F%d(x); }" % (levels - 1))
    return b"\n".join(lines) + b"\n"


def unterminated(rng):
    starts = [b"int f() { const char* s = \"abc", b"int f() { /* never closed ",
              b"int f() { char c = 'a", b"int f() { auto s = R\"delim(raw",
              b"#if 1\nint f() { return 1; }\n", b"int f() { return 1; \\\n"]
    return rng.choice(starts) * rng.randrange(1, 50)


def encoding(rng):
    body = b"int f(int a) { return a * 2; }\n"
    kind = rng.randrange(5)
    if kind == 0:
        return body.replace(b"a *", b"a\x00*") * 10
    if kind == 1:
        return b"// caf\xe9 r\xe9sum\xe9\nint f\xe9(int a) { return a; }\n" + body
    if kind == 2:
        return "int f(int a) { return a; }\n".encode("utf-16")
    if kind == 3:
        return b"\xef\xbb\xbf" + body.replace(b"\n", b"\r")
    return bytes(rng.randrange(128, 256) for _ in range(3000)) + body


SECRET = None


def includes(rng):
    if SECRET is not None and rng.randrange(2) == 0:
        climb = "../" * 30 + SECRET.lstrip("/")
        return ("#include \"%s\"\n#include \"%s\"\nint f() { return 1; }\n"
                % (SECRET, climb)).encode()
    targets = [b"\"/etc/passwd\"", b"\"../../../../../../etc/hostname\"", b"\"/dev/zero\"",
               b"\"/dev/urandom\"", b"\"/dev/stdin\"", b"</proc/self/environ>", b"\"/proc/self/mem\"",
               b"\"" + b"../" * 40 + b"etc/passwd\"", b"<" + b"x" * 5000 + b">"]
    chosen = rng.sample(targets, rng.randrange(1, 4))
    return b"".join(b"#include " + t + b"\n" for t in chosen) + b"int f() { return 1; }\n"


KINDS = [garbage, token_soup, truncated, nested, huge, macro_bomb, unterminated, encoding,
         includes]
EXTENSIONS = [".c", ".cpp", ".h", ".hpp", ".cc"]


def main():
    global SECRET
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    seed = 20261202
    for a in sys.argv[1:]:
        if a.startswith("--seed="):
            seed = int(a.split("=", 1)[1])
        elif a.startswith("--secret="):
            SECRET = os.path.abspath(a.split("=", 1)[1])
    if not args:
        sys.exit(__doc__)
    out = args[0]
    count = int(args[1]) if len(args) > 1 else 300
    rng = random.Random(seed)
    sources = real_sources()
    os.makedirs(out, exist_ok=True)
    for i in range(count):
        kind = KINDS[i % len(KINDS)]
        data = kind(rng, sources) if kind is truncated else kind(rng)
        name = "%03d_%s%s" % (i, kind.__name__, EXTENSIONS[rng.randrange(len(EXTENSIONS))])
        with open(os.path.join(out, name), "wb") as f:
            f.write(data)
    print("%d files in %s (seed %d)" % (count, out, seed))


if __name__ == "__main__":
    main()
