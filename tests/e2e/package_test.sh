#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Package test (needs root, changes the system): build the .deb with CPack in BUILD_DIR, install
# it with apt-get (which pulls the runtime dependencies), check what it put in place, gate the demo
# repository with the installed binary, then remove the package again.
# Usage: tests/e2e/package_test.sh [BUILD_DIR]   (default: build; TOLLGATE_KEEP_PACKAGE=1 keeps it)
set -euo pipefail
root="$(cd "$(dirname "$0")/../.." && pwd)"
build="$(cd "${1:-$root/build}" && pwd)"
fail() { echo "package_test: FAIL: $*" >&2; exit 1; }

if [ "$(id -u)" -ne 0 ]; then
    echo "package_test: error: run as root (it installs and removes the tollgate package)" >&2
    exit 2
fi
if dpkg-query -W -f='${Status}' tollgate 2>/dev/null | grep -q "install ok installed"; then
    echo "package_test: error: a tollgate package is installed already (dpkg -r tollgate first)" >&2
    exit 2
fi

cmake --build "$build" -j"$(nproc)" --target tollgate >/dev/null
rm -f "$build"/tollgate_*.deb
(cd "$build" && cpack -G DEB >/dev/null)
deb=$(ls "$build"/tollgate_*.deb)
echo "package_test: built $deb ($(du -k "$deb" | cut -f1) KiB)"
dpkg-deb --info "$deb" | grep -E '^ (Package|Version|Architecture|Depends|Recommends|Installed-Size):'

cleanup() {
    if [ "${TOLLGATE_KEEP_PACKAGE:-0}" != 1 ]; then
        dpkg -r tollgate >/dev/null 2>&1 || true
    fi
}
trap cleanup EXIT
DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$deb" >/dev/null

version=$(/usr/bin/tollgate --version | head -n 1)
expected="tollgate $(sed -n 's/^project(tollgate VERSION \([0-9.]*\).*/\1/p' "$root/CMakeLists.txt")"
[ "$version" = "$expected" ] || fail "tollgate --version printed \"$version\", expected \"$expected\""
java_line=$(/usr/bin/tollgate --version | sed -n 2p)
case "$java_line" in
"java: on ("*) ;;
*) fail "tollgate --version says \"$java_line\", expected the Java front end on" ;;
esac
for file in /usr/share/man/man1/tollgate.1 \
    /usr/share/tollgate/policies/starter.yaml /usr/share/tollgate/policies/strict.yaml \
    /usr/share/tollgate/policies/legacy.yaml /usr/share/tollgate/policies/README.md \
    /usr/share/tollgate/ci-templates/github-actions.yml \
    /usr/share/tollgate/ci-templates/gitlab-ci.yml /usr/share/tollgate/ci-templates/Jenkinsfile \
    /usr/share/tollgate/ci-templates/tollgate-gate.sh /usr/share/tollgate/ci-templates/pre-push; do
    [ -f "$file" ] || fail "missing $file"
done
[ -x /usr/share/tollgate/ci-templates/tollgate-gate.sh ] || fail "tollgate-gate.sh is not executable"
if command -v man >/dev/null 2>&1; then
    man -l /usr/share/man/man1/tollgate.1 2>/dev/null | grep -q "tollgate hook install" ||
        fail "the installed man page does not render"
fi
/usr/bin/tollgate policy /usr/share/tollgate/policies/strict.yaml >/dev/null 2>&1 ||
    fail "the installed strict policy does not validate"

# The installed binary gates the demo repository as the built one does.
demo=$(mktemp -d)
bash "$root/examples/make_demo_repo.sh" "$demo/repo" 2>/dev/null
set +e
(cd "$demo/repo" && /usr/bin/tollgate check --base main --head filter-outliers >/dev/null 2>&1)
blocked=$?
(cd "$demo/repo" && TOLLGATE=/usr/bin/tollgate TOLLGATE_FETCH=no \
    /usr/share/tollgate/ci-templates/tollgate-gate.sh --base main --head crc-simplify \
    --out "$demo/out" >/dev/null 2>&1)
passed=$?
set -e
rm -rf "$demo"
[ "$blocked" = 1 ] || fail "the blocked demo change exited $blocked, expected 1"
[ "$passed" = 0 ] || fail "the passing demo change exited $passed, expected 0"
echo "package_test: ok: $version installed from $(basename "$deb"); demo gated 1 and 0"
