#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Tollgate gate for any CI system: fetch enough history, run "tollgate check" between a base and
# a head, write the Markdown, SARIF and JSON reports, and exit with check's code (0 pass,
# 1 blocked, 2 usage or policy error, 3 failure).
#
# Usage: tollgate-gate.sh [--base REV] [--head REV] [--out DIR] [--baseline FILE] [--advisory]
#                         [-- EXTRA CHECK OPTIONS...]
# Environment (each optional; an option given on the command line wins):
#   TOLLGATE          the tollgate binary (default: "tollgate" on PATH)
#   TOLLGATE_BASE     base revision (default: check's own, the merge base with the default branch)
#   TOLLGATE_HEAD     head revision (default: HEAD)
#   TOLLGATE_OUT      folder for the reports (default: tollgate-report)
#   TOLLGATE_BASELINE the snapshot the pipeline keeps (default: baselines/snapshot.json when the
#                     job restored one); passed with --baseline
#   TOLLGATE_ADVISORY "yes": report what would block and pass (start here, then drop it)
#   TOLLGATE_FETCH    "no" to never fetch (default: unshallow a shallow clone, fetch a missing base)
# Copy it into the repository (or call it from /usr/share/tollgate/ci-templates) from any job.
set -uo pipefail

tollgate=${TOLLGATE:-tollgate}
base=${TOLLGATE_BASE:-}
head=${TOLLGATE_HEAD:-HEAD}
out=${TOLLGATE_OUT:-tollgate-report}
fetch=${TOLLGATE_FETCH:-yes}
baseline=${TOLLGATE_BASELINE:-}
advisory=${TOLLGATE_ADVISORY:-no}
extra=()

usage() {
    sed -n '3,18p' "$0" | sed 's/^# \{0,1\}//' >&2
    exit "$1"
}

while [ $# -gt 0 ]; do
    case $1 in
    --base) [ $# -ge 2 ] || usage 2; base=$2; shift 2 ;;
    --head) [ $# -ge 2 ] || usage 2; head=$2; shift 2 ;;
    --out) [ $# -ge 2 ] || usage 2; out=$2; shift 2 ;;
    --baseline) [ $# -ge 2 ] || usage 2; baseline=$2; shift 2 ;;
    --advisory) advisory=yes; shift ;;
    --) shift; extra=("$@"); break ;;
    -h | --help) usage 0 ;;
    *) echo "tollgate-gate: error: unknown option \"$1\" (see --help)" >&2; exit 2 ;;
    esac
done

# Revisions come from the CI system (a pull request's branch name may be anyone's choice): one
# that begins with "-" would be read as an option by git, so it is refused, and every git call
# below ends its options with --end-of-options before a value from outside.
for value in "$base" "$head"; do
    case $value in
    -*)
        echo "tollgate-gate: error: revision \"$value\" begins with \"-\" (give a commit id or a" \
            "branch name)" >&2
        exit 2
        ;;
    esac
done

if ! command -v "$tollgate" >/dev/null 2>&1; then
    echo "tollgate-gate: error: cannot run \"$tollgate\" (install the tollgate .deb with" \
        "\"apt-get install ./tollgate_*.deb\", or set TOLLGATE)" >&2
    exit 3
fi
if ! git rev-parse --git-dir >/dev/null 2>&1; then
    echo "tollgate-gate: error: not in a git repository: \"$PWD\"" >&2
    exit 2
fi
cd "$(git rev-parse --show-toplevel)" || exit 3

# A CI checkout is often shallow: the merge base and the base commit need the history.
if [ "$fetch" != no ]; then
    if [ "$(git rev-parse --is-shallow-repository)" = true ]; then
        git fetch --quiet --unshallow || echo "tollgate-gate: warning: git fetch --unshallow failed" >&2
    fi
    if [ -n "$base" ] && ! git cat-file -e --end-of-options "$base^{commit}" 2>/dev/null; then
        git fetch --quiet --end-of-options origin "$base" ||
            echo "tollgate-gate: warning: cannot fetch base \"$base\"" >&2
    fi
fi

mkdir -p "$out"
args=(check "--head=$head"
    --report "markdown:$out/tollgate.md"
    --report "sarif:$out/tollgate.sarif"
    --report "json:$out/tollgate.json"
    --report text:-)
if [ -n "$base" ]; then
    args+=("--base=$base")
fi
# The snapshot the default branch's job wrote and this job restored (check refuses one the
# change itself added or changed, and notes when it is of another commit than the base).
if [ -z "$baseline" ] && [ -f baselines/snapshot.json ]; then
    baseline=baselines/snapshot.json
fi
if [ -n "$baseline" ]; then
    args+=("--baseline=$baseline")
fi
if [ "$advisory" = yes ]; then
    args+=(--advisory)
fi
"$tollgate" "${args[@]}" "${extra[@]}"
code=$?
case $code in
0) echo "tollgate-gate: the change passes the policy (reports in $out/)" >&2 ;;
1) echo "tollgate-gate: the policy blocks the change (reports in $out/)" >&2 ;;
*) echo "tollgate-gate: tollgate check failed with exit code $code (nothing judged)" >&2 ;;
esac
exit "$code"
