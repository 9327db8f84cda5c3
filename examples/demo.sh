#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Build Tollgate (installing missing Debian packages), build the invented "skyline-sensors" demo
# repository in a temporary folder, and gate its three pull requests: two the policy blocks (one
# in the C++ firmware, one in the Java ground station), one it passes. Keep the repository with
# TOLLGATE_DEMO_KEEP=1.
set -euo pipefail
root="$(cd "$(dirname "$0")/.." && pwd)"
bash "$root/.ci/build" >/dev/null
tollgate="$root/build/gate/tollgate"

demo="$(mktemp -d "${TMPDIR:-/tmp}/tollgate-demo-XXXXXX")"
if [ "${TOLLGATE_DEMO_KEEP:-0}" = 1 ]; then
    echo "(keeping the demo repository $demo)"
else
    trap 'rm -rf "$demo"' EXIT
fi
bash "$root/examples/make_demo_repo.sh" "$demo/skyline-sensors" 2>/dev/null
cd "$demo/skyline-sensors"

gate() {
    echo
    echo "== tollgate check --base main --head $1    ($2)"
    set +e
    "$tollgate" check --base main --head "$1"
    code=$?
    set -e
    echo "-> exit code $code"
}
echo "== the demo repository: $(git log --oneline --all | wc -l) commits, policy .tollgate.yaml on main"
git log --oneline --graph --all
gate filter-outliers "outlier handling written into the filter's update step"
gate crc-simplify "the CRC's inner branch folded into one expression"
gate decoder-resync "Java: resynchronisation written into the ground station's frame decoder"

echo
if [ "${TOLLGATE_DEMO_KEEP:-0}" != 1 ]; then
    echo "The demo repository is removed now; run with TOLLGATE_DEMO_KEEP=1 to keep it and try:"
else
    echo "Try next (in $demo/skyline-sensors):"
fi
echo "  $tollgate explain --rev filter-outliers src/fusion_filter.cpp:FusionFilter::update"
echo "  $tollgate check --base main --head filter-outliers --report markdown:-"
echo "  $tollgate explain --rev decoder-resync ground/src/com/skyline/ground/FrameDecoder.java:decode"
echo "  $tollgate policy"
