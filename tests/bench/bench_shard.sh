#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Benchmark sharded calibrate and snapshot: N = 1, 2 and 4 shards run as separate processes at
# once on this machine (each with its own cold cache, as separate CI runners), then the merge.
# Prints the wall time, the total CPU time of every shard and the merge (user + system, parser
# processes included), the load average, and whether the merged result equals the single run.
# Run by hand after building: bash tests/bench/bench_shard.sh [build-dir] [COMMITS] [FILES]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=$(cd "${1:-$here/../../build}" && pwd)
commits=${2:-300}
files=${3:-20}
tollgate=$build/gate/tollgate
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
export TOLLGATE_CACHE_DIR=$work/pch
python3 "$here/gen_history.py" "$work/repo" "$commits" "$files"
cd "$work/repo"
"$tollgate" calibrate --max-commits 1 --cache-dir "$work/warmup" --format json >/dev/null
echo "cores: $(nproc)"

single_calibrate=""
single_snapshot=""
for n in 1 2 4; do
    before=$(uptime | sed 's/.*load average: //')
    start=$(date +%s.%N)
    for k in $(seq 1 "$n"); do
        python3 "$here/tree_peak.py" "$work/cal-$n-$k.use" "$tollgate" calibrate --max-commits 0 \
            -j 1 --shard "$k/$n" --cache-dir "$work/cache-$n-$k" >"$work/cal-$n-$k.json" &
    done
    wait
    for k in $(seq 1 "$n"); do
        python3 "$here/tree_peak.py" "$work/snap-$n-$k.use" "$tollgate" snapshot -j 1 \
            --shard "$k/$n" --out "$work/snap-$n-$k.json" 2>/dev/null &
    done
    wait
    python3 "$here/tree_peak.py" "$work/merge-$n.use" sh -c \
        "'$tollgate' calibrate --format json --merge '$work'/cal-$n-*.json >'$work/merged-$n.json' &&
         '$tollgate' snapshot --merge '$work'/snap-$n-*.json --out '$work/msnap-$n.json' 2>/dev/null"
    end=$(date +%s.%N)
    python3 - "$n" "$start" "$end" "$before" "$(uptime | sed 's/.*load average: //')" "$work" <<'PY'
import glob, sys
n, start, end, before, after, work = sys.argv[1:]
cpu = sum(float(open(p).read().split()[1]) for p in glob.glob(f"{work}/*-{n}-*.use") + [f"{work}/merge-{n}.use"])
merge = float(open(f"{work}/merge-{n}.use").read().split()[1])
print(f"N={n}: wall {float(end) - float(start):7.2f} s  total cpu {cpu:7.2f} s (merge {merge:.2f} s)"
      f"  load {before} -> {after}")
PY
    if [ "$n" = 1 ]; then
        single_calibrate=$work/merged-1.json
        single_snapshot=$work/msnap-1.json
        # The single run: one whole calibrate and one whole snapshot, not sharded.
        "$tollgate" calibrate --format json --max-commits 0 -j 1 --cache-dir "$work/cache-1-1" >"$work/whole.json"
        "$tollgate" snapshot -j 1 --out "$work/whole-snapshot.json" 2>/dev/null
    fi
    python3 - "$work/merged-$n.json" "$work/whole.json" "$work/msnap-$n.json" "$work/whole-snapshot.json" "$n" <<'PY'
import json, re, sys
merged, whole, msnap, wsnap, n = sys.argv[1:]
docs = [json.load(open(p)) for p in (merged, whole)]
for d in docs:
    for key in ("seconds", "threads"):
        d.pop(key)
    d["cache"] = {k: d["cache"][k] for k in ("visits", "distinct_blobs")}
blank = lambda p: re.sub(r'"created": "[^"]*"', '"created": ""', open(p).read())
print(f"N={n}: merged calibrate {'equals' if docs[0] == docs[1] else 'DIFFERS FROM'} the single run;"
      f" merged snapshot {'equals' if blank(msnap) == blank(wsnap) else 'DIFFERS FROM'} the single run"
      " (apart from the creation time)")
PY
done
