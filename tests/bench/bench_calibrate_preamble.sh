#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Benchmark reuse of parsed headers in `tollgate calibrate`: a generated history (gen_history.py,
# invented code) whose sources all include a heavy header-only library of our own generation,
# replayed with every version parsed from scratch after the precompiled standard headers only
# (--preamble-units 0 --no-shared-headers), after its precompiled shared headers (the default),
# and with kept preambles (--preamble-units 32 --no-shared-headers), cold and warm lexed-file
# cache, 1 and 2 workers. Prints the ratios reuse/plain measured in the same run (target: <= 0.35
# cold), peak memory of the whole process tree, resident and proportional (target: <= 500 MiB),
# CPU time, the load average beside every figure, and whether the reports agree.
# Run by hand after building: bash tests/bench/bench_calibrate_preamble.sh [build-dir] [COMMITS] [FILES]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=$(cd "${1:-$here/../../build}" && pwd)
commits=${2:-300}
files=${3:-20}
tollgate=$build/gate/tollgate
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
export TOLLGATE_CACHE_DIR=$work/pch # precompiled standard headers, warmed once below

python3 "$here/gen_history.py" "$work/repo" "$commits" "$files" heavy
cd "$work/repo"
echo "cores: $(nproc); heavy library: $(cat include/heavy/*.hpp | wc -l) lines in $(ls include/heavy | wc -l) headers"
"$tollgate" calibrate --max-commits 1 --cache-dir "$work/warmup" --format json >/dev/null

run() { # $1 label, $2 cache dir, rest: calibrate arguments; prints a line, keeps seconds and cpu in $work/LABEL.s(.cpu)
    local label=$1 cache=$2; shift 2
    local before start end
    before=$(uptime | sed 's/.*load average: //')
    start=$(date +%s.%N)
    python3 "$here/tree_peak.py" "$work/peak" "$tollgate" calibrate --format json \
        --max-commits 0 --cache-dir "$cache" "$@" >"$work/$label.json"
    end=$(date +%s.%N)
    python3 - "$label" "$start" "$end" "$work/peak" "$work/$label.json" "$before" \
        "$(uptime | sed 's/.*load average: //')" "$work/$label.s" <<'PY'
import json, sys
label, start, end, peak, out, before, after, keep = sys.argv[1:]
seconds = float(end) - float(start)
mib, cpu, pss = open(peak).read().split()
c = json.load(open(out))["cache"]
print(f"{label:<22} {seconds:8.2f} s  cpu {float(cpu):8.2f} s  peak {float(mib):7.1f} MiB (pss {float(pss):7.1f})  "
      f"parses {c['parses']}/{c['visits']}  load {before} -> {after}")
open(keep, "w").write(str(seconds))
open(keep + ".cpu", "w").write(cpu)
PY
}
same() { # compare two reports apart from timings and cache counts
    python3 - "$work/$1.json" "$work/$2.json" <<'PY'
import json, sys
docs = [json.load(open(p)) for p in sys.argv[1:]]
for d in docs:
    for key in ("seconds", "threads", "cache"):
        d.pop(key)
print("reports identical" if docs[0] == docs[1] else "reports DIFFER")
PY
}
ratio() { # $1 label, $2 reuse label, $3 plain label: wall and CPU ratios (CPU is steadier under load)
    python3 -c "print(f'reuse/plain $1: wall {$(cat "$work/$2.s") / $(cat "$work/$3.s"):.2f}, cpu {$(cat "$work/$2.s.cpu") / $(cat "$work/$3.s.cpu"):.2f}')"
}

plain=(--preamble-units 0 --no-shared-headers)
preambles=(--preamble-units 32 --no-shared-headers)
shared=(--preamble-units 0)
for j in 1 2; do
    run "plain-j$j-cold" "$work/c-plain$j" -j "$j" "${plain[@]}"
    run "shared-j$j-cold" "$work/c-shared$j" -j "$j" "${shared[@]}"
    run "preambles-j$j-cold" "$work/c-pre$j" -j "$j" "${preambles[@]}"
    ratio "shared headers, $j worker(s), cold" "shared-j$j-cold" "plain-j$j-cold"
    ratio "preambles, $j worker(s), cold" "preambles-j$j-cold" "plain-j$j-cold"
    same "plain-j$j-cold" "shared-j$j-cold"
    same "plain-j$j-cold" "preambles-j$j-cold"
done
run plain-j2-warm "$work/c-plain2" -j 2 "${plain[@]}"
run shared-j2-warm "$work/c-shared2" -j 2 "${shared[@]}"
ratio "2 workers, warm (nothing to parse)" shared-j2-warm plain-j2-warm
