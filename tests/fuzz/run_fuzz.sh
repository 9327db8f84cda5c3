#!/bin/sh
# SPDX-License-Identifier: MIT
# Build the policy-loader fuzzer with clang-14 (libFuzzer, ASan, UBSan) in its own build folder
# and run it for a bounded time, seeded with policies/*.yaml and the kept regressions. Any crash,
# timeout or out-of-memory input is copied to tests/fuzz/regressions/ for the unit test to replay.
# Usage: tests/fuzz/run_fuzz.sh [SECONDS] (default 60). Exit 0 when nothing was found.
set -eu
seconds=${1:-60}
root=$(cd "$(dirname "$0")/../.." && pwd)
build=${TOLLGATE_FUZZ_BUILD:-"$root/build-fuzz"}

CC=clang-14 CXX=clang++-14 cmake -S "$root" -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo \
    -DTOLLGATE_FUZZ=ON >/dev/null
cmake --build "$build" --target fuzz_policy -j2

corpus="$build/fuzz-corpus"
artifacts="$build/fuzz-artifacts"
mkdir -p "$corpus" "$artifacts"
cp "$root"/policies/*.yaml "$corpus/"
for kept in "$root"/tests/fuzz/regressions/*; do
    case "$kept" in *README.md) ;; *) cp "$kept" "$corpus/" ;; esac
done

status=0
"$build/tests/fuzz/fuzz_policy" -max_total_time="$seconds" -max_len=4096 -timeout=10 \
    -rss_limit_mb=2048 -print_final_stats=1 -dict="$root/tests/fuzz/policy.dict" \
    -artifact_prefix="$artifacts/" "$corpus" || status=$?

found=0
for artifact in "$artifacts"/crash-* "$artifacts"/timeout-* "$artifacts"/oom-*; do
    [ -e "$artifact" ] || continue
    cp "$artifact" "$root/tests/fuzz/regressions/"
    echo "run_fuzz: kept $(basename "$artifact") in tests/fuzz/regressions/" >&2
    found=1
done
if [ "$status" -ne 0 ] || [ "$found" -ne 0 ]; then
    echo "run_fuzz: the fuzzer found a problem (exit $status)" >&2
    exit 1
fi
echo "run_fuzz: no crash in $seconds seconds" >&2
