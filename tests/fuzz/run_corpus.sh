#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# The full measuring path on a corpus of hostile files (tests/fuzz/hostile_corpus.py: garbage,
# truncated, deeply nested, huge, macro bombs, odd encodings, includes of host and device files),
# committed into a scratch repository. Each file is measured alone from the object database, then
# one check gates them all with every report kind. A run passes when nothing crashes, hangs past
# the timeout or exits outside 0/1, every JSON and SARIF report parses, and no content of the
# host files the corpus includes (a planted secret outside the repository, /etc/passwd,
# /etc/hostname) reaches any output.
# Usage: bash tests/fuzz/run_corpus.sh [build-dir] [COUNT] (default build/, 300 files)
set -uo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=$(cd "${1:-$here/../../build}" && pwd)
count=${2:-300}
tollgate=$build/gate/tollgate
# The limit is processor time (ulimit -t, for tollgate and each of its parser processes), so a
# loaded machine cannot fail a file; wall time gets a ten times wider backstop against a process
# that hangs without computing.
limit=${TOLLGATE_CORPUS_TIMEOUT:-120}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT

# A host file outside the repository with a token that a parser quoting it would show.
token=tollgate_corpus_secret_$$_$RANDOM
printf '%s value;\n%s();\n' "$token" "$token" >"$work/secret.h"
python3 "$here/hostile_corpus.py" "$work/repo/src" "$count" --secret="$work/secret.h" >/dev/null
cd "$work/repo" || exit 2
git init -q . && git config user.email corpus@example.invalid && git config user.name corpus
git commit -q --allow-empty -m base
git add -A && git commit -q -m "hostile corpus"

# The token and lines of the host files the corpus includes: none may reach an output.
secrets=("$token")
while IFS= read -r line; do
    [ ${#line} -ge 8 ] && secrets+=("$line")
done < <(head -n 3 /etc/passwd; cat /etc/hostname 2>/dev/null)

failures=0
leaks=0
slowest=0
slowest_file=
check_leaks() { # $1: file to search
    local secret
    for secret in "${secrets[@]}"; do
        if grep -qF -- "$secret" "$1"; then
            echo "LEAK: $(basename "$1") quotes a line of a host file" >&2
            leaks=$((leaks + 1))
        fi
    done
}

start_all=$(date +%s.%N)
for file in src/*; do
    start=$(date +%s.%N)
    (ulimit -t "$limit" && exec timeout -s KILL $((limit * 10)) "$tollgate" measure --rev HEAD \
        --format json "$file") >"$work/out.json" 2>"$work/err.txt" </dev/null
    status=$?
    elapsed=$(python3 -c "print(round($(date +%s.%N) - $start, 2))")
    if python3 -c "import sys; sys.exit(0 if $elapsed > $slowest else 1)"; then
        slowest=$elapsed
        slowest_file=$file
    fi
    if [ "$status" -ne 0 ]; then
        echo "FAIL: measure $file: exit $status after ${elapsed}s: $(head -c 300 "$work/err.txt")" >&2
        failures=$((failures + 1))
    elif ! python3 -c "import json,sys; json.load(open(sys.argv[1]))" "$work/out.json" 2>/dev/null; then
        echo "FAIL: measure $file: the JSON output does not parse" >&2
        failures=$((failures + 1))
    fi
    check_leaks "$work/out.json"
    check_leaks "$work/err.txt"
done
measured=$(python3 -c "print(round($(date +%s.%N) - $start_all, 1))")

start=$(date +%s.%N)
(ulimit -t $((limit * 5)) && exec timeout -s KILL $((limit * 50)) "$tollgate" check --base HEAD~1 \
    --head HEAD --no-color --report json:"$work/check.json" --report markdown:"$work/check.md" \
    --report sarif:"$work/check.sarif" --report text:"$work/check.txt") \
    >"$work/check.out" 2>"$work/check.err" </dev/null
status=$?
checked=$(python3 -c "print(round($(date +%s.%N) - $start, 1))")
if [ "$status" -ne 0 ] && [ "$status" -ne 1 ]; then
    echo "FAIL: check: exit $status after ${checked}s: $(head -c 300 "$work/check.err")" >&2
    failures=$((failures + 1))
else
    for report in check.json check.sarif; do
        if ! python3 -c "import json,sys; json.load(open(sys.argv[1]))" "$work/$report"; then
            echo "FAIL: check: $report does not parse" >&2
            failures=$((failures + 1))
        fi
    done
fi
for output in check.json check.md check.sarif check.txt check.out check.err; do
    [ -e "$work/$output" ] && check_leaks "$work/$output"
done

echo "corpus: $count files; measure one by one: ${measured}s (slowest ${slowest}s: $slowest_file)"
echo "corpus: check of all files: exit $status in ${checked}s"
echo "corpus: $failures failures, $leaks leaks"
[ "$failures" -eq 0 ] && [ "$leaks" -eq 0 ]
