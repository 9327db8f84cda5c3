#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Benchmark `tollgate check` on a generated change of 10 Java files of about 500 lines, against
# two floors measured in the same run: git's own work for the change (diff with rename detection,
# reading the 20 blobs) and the Java front end alone on the same 20 blobs (tollgate_java_parse).
# The goal: a Java check is dominated by git and process start, not by parsing.
# Run by hand after building: bash tests/bench/bench_java_check.sh [build-dir]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=$(cd "${1:-$here/../../build}" && pwd)
tollgate=$build/gate/tollgate
parse_tool=$build/tests/tollgate_java_parse
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT

python3 "$here/gen_java_change.py" "$work/repo" 10 500 >/dev/null
cd "$work/repo"
echo "generated: $(git ls-files | wc -l) files, $(cat src/*.java | wc -l) lines of .java in head"
echo "load average: $(cut -d' ' -f1-3 /proc/loadavg)"
mkdir -p "$work/base" "$work/head"
git archive HEAD~1 | tar -x -C "$work/base"
git archive HEAD | tar -x -C "$work/head"

seconds() { # run the command 5 times, print the best wall time in seconds
    local best=999
    for _ in 1 2 3 4 5; do
        local start end
        start=$(date +%s.%N)
        "$@" >/dev/null 2>&1 || true
        end=$(date +%s.%N)
        best=$(python3 -c "print(min($best, $end - $start))")
    done
    echo "$best"
}
git_work() {
    git diff -M -U0 HEAD~1 HEAD >/dev/null
    git ls-tree -r HEAD~1 src | awk '{print $3}' | git cat-file --batch >/dev/null
    git ls-tree -r HEAD src | awk '{print $3}' | git cat-file --batch >/dev/null
}

check=$(seconds "$tollgate" check --base HEAD~1 --head HEAD)
check1=$(seconds "$tollgate" check --base HEAD~1 --head HEAD -j 1)
git_floor=$(seconds git_work)
version=$(seconds "$tollgate" --version)
parse=999
for _ in 1 2 3 4 5; do # best of five, as for the commands above
    parse_line=$("$parse_tool" "$work"/base/src/*.java "$work"/head/src/*.java)
    parse=$(python3 -c "print(min($parse, $(echo "$parse_line" | awk '{print $2}')))")
done
functions=$(echo "$parse_line" | awk '{print $3}')

printf '%-52s %7.3f s\n' "check, 10 Java files changed, all cores" "$check"
printf '%-52s %7.3f s\n' "check, 10 Java files changed, 1 thread" "$check1"
printf '%-52s %7.3f s\n' "floor: git diff -M -U0 + reading the 20 blobs" "$git_floor"
printf '%-52s %7.3f s\n' "floor: tollgate --version (process start)" "$version"
printf '%-52s %7.3f s   (%s functions)\n' "Java front end alone, 20 blobs, 1 thread" "$parse" "$functions"
python3 -c "print(f'parsing share of check (1 thread): {100 * $parse / $check1:.1f}%')"
python3 -c "print(f'ratio check (all cores) / (git floor + process start): {$check / ($git_floor + $version):.2f}')"
