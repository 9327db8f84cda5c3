#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Benchmark `tollgate check` on a generated change of 10 C++ files of about 500 lines (classes
# declared in headers) against the floor measured in the same run: the same 20 blobs parsed by
# bare libclang with naive settings (full parse, no precompiled header, one thread).
# Run by hand after building: bash tests/bench/bench_check.sh [build-dir]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
build=$(cd "${1:-$here/../../build}" && pwd)
tollgate=$build/gate/tollgate
naive=$build/tests/tollgate_naive_parse
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT

python3 "$here/gen_change.py" "$work/repo" 10 500 >/dev/null
cd "$work/repo"
echo "generated: $(git ls-files | wc -l) files, $(cat src/*.cpp | wc -l) lines of .cpp in head"

# The 20 blobs (10 .cpp files on each side), extracted for the floor.
mkdir -p "$work/base/src" "$work/head/src"
git archive HEAD~1 | tar -x -C "$work/base"
git archive HEAD | tar -x -C "$work/head"
floor=$("$naive" -I "$work/base/src" "$work"/base/src/*.cpp | awk '{print $2}')
floor_head=$("$naive" -I "$work/head/src" "$work"/head/src/*.cpp | awk '{print $2}')
floor=$(python3 -c "print($floor + $floor_head)")

cache=$work/cache
measure() { # $1 label, rest: command
    local label=$1; shift
    local start end
    start=$(date +%s.%N)
    /usr/bin/time -f "%M" -o "$work/mem" "$@" >/dev/null
    end=$(date +%s.%N)
    python3 -c "print(f'{\"$label\":<52} {($end - $start):7.3f} s   peak {int(open(\"$work/mem\").read().split()[-1])/1024:6.1f} MiB')"
    python3 -c "print($end - $start)" >"$work/last"
}
measure "check, cold PCH cache, all cores" "$tollgate" check --base HEAD~1 --cache-dir "$cache"
measure "check, warm PCH cache, all cores" "$tollgate" check --base HEAD~1 --cache-dir "$cache"
warm=$(cat "$work/last")
measure "check, warm PCH cache, 1 thread" "$tollgate" check --base HEAD~1 --cache-dir "$cache" -j 1
measure "check, no PCH, all cores" "$tollgate" check --base HEAD~1 --no-pch-cache
"$tollgate" snapshot --rev HEAD~1 --out "$work/base-snapshot.json" --cache-dir "$cache" 2>/dev/null
"$tollgate" snapshot --rev HEAD --out "$work/head-snapshot.json" --cache-dir "$cache" 2>/dev/null
# The base is always parsed; a snapshot of the base is compared on every touched function (the
# spot-check), one of another commit only tolerates existing findings. The difference between the two is the
# comparison, the difference to "warm PCH cache, all cores" the snapshot's loading.
measure "check, warm PCH, snapshot of the base (checked)" "$tollgate" check --base HEAD~1 --cache-dir "$cache" --baseline "$work/base-snapshot.json"
checked=$(cat "$work/last")
measure "check, warm PCH, snapshot of another commit" "$tollgate" check --base HEAD~1 --cache-dir "$cache" --baseline "$work/head-snapshot.json"
other=$(cat "$work/last")
# For comparison, an older tollgate that took the base from the snapshot unchecked (set
# TOLLGATE_UNCHECKED to its binary, e.g. a build of the commit before the spot-check).
if [ -n "${TOLLGATE_UNCHECKED:-}" ]; then
    measure "older tollgate, base from the snapshot unchecked" "$TOLLGATE_UNCHECKED" check --base HEAD~1 --cache-dir "$cache" --baseline "$work/base-snapshot.json"
fi
printf '%-52s %7.3f s\n' "floor: bare libclang, 20 blobs, naive" "$floor"
python3 -c "print(f'ratio check (warm, all cores) / floor: {$warm / $floor:.3f}  (goal <= 0.25)')"
python3 -c "print(f'ratio check with a checked snapshot of the base / without a snapshot: {$checked / $warm:.3f}')"
python3 -c "print(f'ratio check with a checked snapshot of the base / with one of another commit: {$checked / $other:.3f}')"

# The cost of isolation: the same warm check with parser processes (the default) and with the
# unsafe in-process switch, interleaved so both see the same load; the median of 7 runs each.
seconds() { # rest: command; prints its wall-clock seconds
    local start end
    start=$(date +%s.%N)
    "$@" >/dev/null 2>&1 || true
    end=$(date +%s.%N)
    python3 -c "print($end - $start)"
}
isolated=()
in_process=()
for _ in 1 2 3 4 5 6 7; do
    isolated+=("$(seconds "$tollgate" check --base HEAD~1 --cache-dir "$cache")")
    in_process+=("$(TOLLGATE_UNSAFE_PARSE_IN_PROCESS=1 seconds "$tollgate" check --base HEAD~1 --cache-dir "$cache")")
done
python3 - "${isolated[*]}" "${in_process[*]}" <<'PY'
import statistics, sys
isolated = [float(x) for x in sys.argv[1].split()]
in_process = [float(x) for x in sys.argv[2].split()]
a, b = statistics.median(isolated), statistics.median(in_process)
print(f"{'check, warm, parser processes (median of 7)':<44} {a:7.3f} s")
print(f"{'check, warm, in-process, unsafe (median of 7)':<44} {b:7.3f} s")
print(f"ratio parser processes / in-process: {a / b:.3f}  (goal < 1.10)")
PY
echo "load average: $(cut -d' ' -f1-3 /proc/loadavg)"
