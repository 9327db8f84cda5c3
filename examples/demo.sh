#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Build Tollgate (installing missing Debian packages) and measure the bundled demo sources.
set -euo pipefail
cd "$(dirname "$0")/.."
bash .ci/build >/dev/null
cd examples/skyline-sensors
echo "== tollgate measure (examples/skyline-sensors)"
../../build/gate/tollgate measure .
echo
echo "== tollgate explain src/fusion_filter.cpp:FusionFilter::update"
../../build/gate/tollgate explain src/fusion_filter.cpp:FusionFilter::update
