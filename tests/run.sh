#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# The test command: install what is missing, build with warnings as errors, run every test.
set -euo pipefail
cd "$(dirname "$0")/.."
TOLLGATE_CMAKE_ARGS="-DTOLLGATE_WERROR=ON ${TOLLGATE_CMAKE_ARGS:-}" bash .ci/build
cd build
ctest --output-on-failure -j"$(nproc)" "$@"
