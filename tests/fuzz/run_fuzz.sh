#!/bin/sh
# SPDX-License-Identifier: MIT
# Build a libFuzzer target with clang-14 (libFuzzer, ASan, UBSan) in its own build folder and run
# it for a bounded time, seeded with its kept regressions (and, for the policy loader, the ready
# policies). Any crash, timeout or out-of-memory input is copied to tests/fuzz/regressions/TARGET/
# for the unit tests to replay.
# Usage: tests/fuzz/run_fuzz.sh [policy|lexical|java] [SECONDS]   (default: policy, 60 seconds)
# Exit 0 when nothing was found; the last lines are libFuzzer's figures (executions, rate).
set -eu
target=${1:-policy}
seconds=${2:-60}
case "$target" in
policy) dict_option="-dict=$(cd "$(dirname "$0")" && pwd)/policy.dict" ;;
lexical) dict_option= ;;
java) dict_option="-dict=$(cd "$(dirname "$0")" && pwd)/java.dict" ;;
*)
    echo "run_fuzz: unknown target \"$target\" (policy, lexical or java)" >&2
    exit 2
    ;;
esac
root=$(cd "$(dirname "$0")/../.." && pwd)
build=${TOLLGATE_FUZZ_BUILD:-"$root/build-fuzz"}
kept_dir="$root/tests/fuzz/regressions/$target"

CC=clang-14 CXX=clang++-14 cmake -S "$root" -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo \
    -DTOLLGATE_FUZZ=ON >/dev/null
cmake --build "$build" --target "fuzz_$target" -j2

corpus="$build/fuzz-corpus-$target"
artifacts="$build/fuzz-artifacts-$target"
mkdir -p "$corpus" "$artifacts"
# What an earlier run found is already kept: only this run's findings are reported below.
rm -f "$artifacts"/crash-* "$artifacts"/timeout-* "$artifacts"/oom-*
if [ "$target" = policy ]; then
    cp "$root"/policies/*.yaml "$corpus/"
fi
if [ "$target" = java ]; then
    cp "$root"/tests/fixtures/java/*.java "$corpus/"
fi
for kept in "$kept_dir"/*; do
    case "$kept" in *README.md) ;; *) cp "$kept" "$corpus/" ;; esac
done

status=0
max_len=4096
if [ "$target" = java ]; then
    max_len=16384 # the Java seeds are whole files
fi
# shellcheck disable=SC2086 # the dictionary option is empty or one word
"$build/tests/fuzz/fuzz_$target" -max_total_time="$seconds" -max_len="$max_len" -timeout=10 \
    -rss_limit_mb=2048 -print_final_stats=1 $dict_option \
    -artifact_prefix="$artifacts/" "$corpus" || status=$?

found=0
for artifact in "$artifacts"/crash-* "$artifacts"/timeout-* "$artifacts"/oom-*; do
    [ -e "$artifact" ] || continue
    cp "$artifact" "$kept_dir/"
    echo "run_fuzz: kept $(basename "$artifact") in tests/fuzz/regressions/$target/" >&2
    found=1
done
if [ "$status" -ne 0 ] || [ "$found" -ne 0 ]; then
    echo "run_fuzz: the fuzzer found a problem (exit $status)" >&2
    exit 1
fi
echo "run_fuzz: fuzz_$target: no crash in $seconds seconds" >&2
