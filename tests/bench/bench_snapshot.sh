#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Benchmark `tollgate snapshot` on a generated tree of FILES .cpp files and FILES headers of about
# LINES lines (tests/bench/gen_change.py, classes declared in headers): files per second and peak
# memory, one thread against all cores, with a warm precompiled-header cache. Prints the machine's
# load beside the figures, since other work shares the cores; "cpu" is user + system time, and its
# ratio to the wall time shows how many cores the run actually got.
# Run by hand after building: bash tests/bench/bench_snapshot.sh [build-dir] [FILES] [LINES]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=${1:-$here/../../build}
files=${2:-300}
lines=${3:-200}
tollgate=$build/gate/tollgate
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT

python3 "$here/gen_change.py" "$work/repo" "$files" "$lines" >/dev/null
cd "$work/repo"
total=$(git ls-files | wc -l)
echo "generated: $total C/C++ files ($(git ls-files '*.cpp' | wc -l) .cpp, $(git ls-files '*.hpp' | wc -l) headers), $(cat src/*.cpp | wc -l) lines of .cpp"
echo "cores: $(nproc)"

cache=$work/cache
run() { # $1 label, rest: tollgate arguments
    local label=$1; shift
    local load_before load_after start end
    load_before=$(uptime | sed 's/.*load average: //')
    start=$(date +%s.%N)
    /usr/bin/time -f "%U %S %M" -o "$work/mem" "$tollgate" snapshot --cache-dir "$cache" "$@" \
        2>"$work/err" || { cat "$work/err"; exit 1; }
    end=$(date +%s.%N)
    load_after=$(uptime | sed 's/.*load average: //')
    python3 - "$label" "$start" "$end" "$work/mem" "$total" "$load_before" "$load_after" <<'EOF'
import sys
label, start, end, mem, total, before, after = sys.argv[1:]
seconds = float(end) - float(start)
user, system, peak_kib = open(mem).read().split()[-3:]
cpu = float(user) + float(system)
peak = int(peak_kib) / 1024
print(f"{label:<34} {seconds:7.2f} s  {int(total) / seconds:6.1f} files/s  cpu {cpu:6.1f} s"
      f" (x{cpu / seconds:.2f})  peak {peak:6.1f} MiB  load {before} -> {after}")
EOF
}
run "cold PCH cache, all cores (-j 0)" -j 0 --out "$work/cold.json"
run "warm PCH cache, 1 thread (-j 1)" -j 1 --out "$work/one.json"
run "warm PCH cache, all cores (-j 0)" -j 0 --out "$work/all.json"
functions=$(python3 -c "import json; print(json.load(open('$work/all.json'))['function_count'])")
echo "functions in the snapshot: $functions; snapshot size: $(du -h "$work/all.json" | cut -f1)"
if diff <(grep -v '"created"' "$work/one.json") <(grep -v '"created"' "$work/all.json") >/dev/null; then
    echo "-j 1 and -j 0 snapshots: identical apart from the time"
else
    echo "-j 1 and -j 0 snapshots DIFFER"
    exit 1
fi
