#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Benchmark `tollgate snapshot` on Tollgate's own tree (the commit checked out here): files per
# second, peak memory of the whole process tree (tollgate and its parser processes) and CPU time,
# with 1 and 2 parser processes and a warm precompiled-header cache, plus 2 shards run at once and
# merged (equal to the whole run apart from the creation time). Prints the load average beside
# every figure.
# Run by hand after building: bash tests/bench/bench_snapshot_self.sh [build-dir]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=$(cd "${1:-$here/../../build}" && pwd)
tollgate=$build/gate/tollgate
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
export TOLLGATE_CACHE_DIR=$work/pch
cd "$here/../.."
files=$(git ls-files '*.c' '*.cc' '*.cpp' '*.cxx' '*.h' '*.hh' '*.hpp' '*.java' | wc -l)
echo "tree: $(git rev-parse --short HEAD), $files C/C++/Java files; cores: $(nproc)"
"$tollgate" snapshot -j 2 --out "$work/warm.json" 2>/dev/null # warms the precompiled headers

run() { # $1 label, rest: snapshot arguments
    local label=$1; shift
    local before start end
    before=$(uptime | sed 's/.*load average: //')
    start=$(date +%s.%N)
    python3 "$here/tree_peak.py" "$work/use" "$tollgate" snapshot "$@" 2>/dev/null
    end=$(date +%s.%N)
    python3 - "$label" "$start" "$end" "$work/use" "$files" "$before" \
        "$(uptime | sed 's/.*load average: //')" <<'PY'
import sys
label, start, end, use, files, before, after = sys.argv[1:]
seconds = float(end) - float(start)
mib, cpu, pss = open(use).read().split()
print(f"{label:<26} {seconds:7.2f} s  {int(files) / seconds:6.2f} files/s  cpu {float(cpu):7.2f} s"
      f"  peak {float(mib):7.1f} MiB (pss {float(pss):7.1f})  load {before} -> {after}")
PY
}
run "1 parser process" -j 1 --out "$work/one.json"
run "2 parser processes" -j 2 --out "$work/two.json"
start=$(date +%s.%N)
"$tollgate" snapshot -j 1 --shard 1/2 --out "$work/p1.json" 2>/dev/null &
"$tollgate" snapshot -j 1 --shard 2/2 --out "$work/p2.json" 2>/dev/null &
wait
"$tollgate" snapshot --merge "$work/p1.json" "$work/p2.json" --out "$work/merged.json" 2>/dev/null
end=$(date +%s.%N)
python3 -c "print(f'2 shards at once + merge    {$end - $start:7.2f} s  {$files / ($end - $start):6.2f} files/s')"
if diff <(grep -v '"created"' "$work/two.json") <(grep -v '"created"' "$work/merged.json") >/dev/null; then
    echo "merged snapshot: identical to the whole run apart from the time"
else
    echo "merged snapshot DIFFERS from the whole run"
    exit 1
fi
