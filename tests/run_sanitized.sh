#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# The whole test suite under AddressSanitizer, LeakSanitizer and UndefinedBehaviorSanitizer: build
# into build-asan with TOLLGATE_SANITIZE=ON and run every test. Each test, and every tollgate
# binary it starts, runs with the options and suppression files of tests/sanitizers/ (compiled
# into the sanitized binaries by sanitizer_options.cpp); any report fails the test. libclang and
# libgit2 are Debian's builds, not instrumented: memory errors inside them go unseen, their leaks
# do not (LeakSanitizer watches every allocation).
# Usage: bash tests/run_sanitized.sh [ctest arguments]; TOLLGATE_JOBS sets the parallelism
# (default: the number of cores).
set -euo pipefail
cd "$(dirname "$0")/.."
jobs=${TOLLGATE_JOBS:-$(nproc)}
start=$(date +%s)
# -O1 and line tables only: the usual optimisation for ASan, and about half the compile time of
# -O2 -g on these template-heavy headers, with symbolized reports all the same. No -Werror here:
# GCC 12 misreports "maybe-uninitialized" inside libstdc++'s <regex> at -O1 with ASan, and the
# regular build (tests/run.sh) already holds our code to no warnings.
TOLLGATE_BUILD_DIR=build-asan TOLLGATE_JOBS=$jobs TOLLGATE_BUILD_TYPE=None \
    TOLLGATE_COMPILE_FLAGS="-O1 -g1" \
    TOLLGATE_CMAKE_ARGS="-DTOLLGATE_SANITIZE=ON -DTOLLGATE_WERROR=OFF ${TOLLGATE_CMAKE_ARGS:-}" \
    bash .ci/build
built=$(date +%s)
(cd build-asan && ctest --output-on-failure -j"$jobs" "$@")
end=$(date +%s)
echo "tollgate: sanitized suite green: build $((built - start)) s, tests $((end - built)) s" >&2
