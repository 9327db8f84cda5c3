#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Benchmark `tollgate calibrate`: commits per second, blob parses against blob visits, speed-up
# from 1 to 2 threads, peak memory, cold against warm lexed-file cache. On a generated history of
# 300 commits (gen_history.py, invented code) and, when given, on a real repository.
# Run by hand after building: bash tests/bench/bench_calibrate.sh [build-dir] [real-repo [max]]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=${1:-$here/../../build}
real=${2:-}
real_max=${3:-100}
tollgate=$build/gate/tollgate
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
export TOLLGATE_CACHE_DIR=$work/pch # the precompiled-header cache, warmed once below

echo "machine: $(nproc) cores; load before: $(uptime | sed 's/.*load average: //')"

run() { # $1 label, $2 repo, $3 cache dir, rest: calibrate arguments
    local label=$1 repo=$2 cache=$3; shift 3
    local start end
    start=$(date +%s.%N)
    (cd "$repo" && /usr/bin/time -f "%M" -o "$work/mem" "$tollgate" calibrate --format json \
        --cache-dir "$cache" "$@" >"$work/out.json")
    end=$(date +%s.%N)
    python3 - "$label" "$start" "$end" "$work/out.json" "$work/mem" <<'PY'
import json, sys
label, start, end, out, mem = sys.argv[1:]
doc = json.load(open(out))
seconds = float(end) - float(start)
c = doc["cache"]
commits = len(doc["commits"])
peak = int(open(mem).read().split()[-1]) / 1024
print(f"{label:<40} {commits:4d} commits {seconds:7.2f} s {commits / seconds:7.2f} commits/s "
      f"parses {c['parses']:5d} / visits {c['visits']:5d} (distinct blobs {c['distinct_blobs']}) "
      f"peak {peak:6.1f} MiB")
open(sys.argv[4] + ".seconds", "w").write(str(seconds))
PY
}

bench_repo() { # $1 name, $2 repo, $3 max commits
    local name=$1 repo=$2 max=$3
    echo "== $name ($max commits) =="
    # Warm the precompiled standard headers once so that cold/warm compares the lexed-file cache.
    (cd "$repo" && "$tollgate" calibrate --max-commits 1 --cache-dir "$work/warmup-$name" \
        --format json >/dev/null)
    run "$name: 1 thread, cold cache" "$repo" "$work/c1-$name" -j 1 --max-commits "$max"
    one=$(cat "$work/out.json.seconds")
    run "$name: 2 threads, cold cache" "$repo" "$work/c2-$name" -j 2 --max-commits "$max"
    two=$(cat "$work/out.json.seconds")
    run "$name: 2 threads, warm cache" "$repo" "$work/c2-$name" -j 2 --max-commits "$max"
    python3 -c "print(f'speed-up 1 -> 2 threads (cold): {$one / $two:.2f}x')"
    echo "load after: $(uptime | sed 's/.*load average: //')"
}

python3 "$here/gen_history.py" "$work/gen" 300 20 >/dev/null
bench_repo generated "$work/gen" 300
if [ -n "$real" ]; then
    bench_repo "$(basename "$real")" "$real" "$real_max"
fi
