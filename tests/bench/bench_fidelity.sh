#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Fidelity of `tollgate check`'s touched functions on a real history: over the last K
# first-parent commits of REPO, compare check's touched set with an independent oracle
# (Universal Ctags' function extents + `git diff -U0`), print every disagreement, the agreement
# |T n O| / |T u O| and the recall |T n O| / |O|. Goal: both at least 99%.
# Needs universal-ctags (apt-get install universal-ctags). REPO is only read.
# Run by hand after building: bash tests/bench/bench_fidelity.sh REPO [K] [build-dir]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
if [ $# -lt 1 ]; then
    echo "usage: bash tests/bench/bench_fidelity.sh REPO [K] [build-dir]" >&2
    exit 2
fi
repo=$(cd "$1" && pwd)
k=${2:-30}
build=$(cd "${3:-$here/../../build}" && pwd)
if ! ctags --version 2>/dev/null | grep -q "Universal Ctags"; then
    echo "bench_fidelity: Universal Ctags is needed (apt-get install universal-ctags)" >&2
    exit 2
fi
echo "repository: $repo, last $k first-parent commits; load average: $(cut -d' ' -f1-3 /proc/loadavg)"
python3 "$here/fidelity.py" "$repo" "$build/gate/tollgate" "$k" 2
