#!/bin/sh
# SPDX-License-Identifier: MIT
# Check the kept tree-sitter-java grammar against the npm registry, or replace it with another
# pinned version. The tarball's sha512 is checked against the pinned integrity before it is used.
# Usage: refresh_grammar.sh --check
#        refresh_grammar.sh VERSION sha512-INTEGRITY
set -eu
here=$(cd "$(dirname "$0")" && pwd)
pinned_version=0.23.5
pinned_integrity=sha512-Yju7oQ0Xx7GcUT01mUglPP+bYfvqjNCGdxqigTnew9nLGoII42PNVP3bHrYeMxswiCRM0yubWmN5qk+zsg0zMA==

mode=check
version=$pinned_version
integrity=$pinned_integrity
if [ "${1:-}" != "--check" ] && [ $# -eq 2 ]; then
    mode=replace
    version=$1
    integrity=$2
elif [ "${1:-}" != "--check" ]; then
    echo "usage: refresh_grammar.sh --check | VERSION sha512-INTEGRITY" >&2
    exit 2
fi

work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
(cd "$work" && npm pack --silent "tree-sitter-java@$version" >/dev/null)
tarball="$work/tree-sitter-java-$version.tgz"
actual="sha512-$(openssl dgst -sha512 -binary "$tarball" | base64 -w0)"
if [ "$actual" != "$integrity" ]; then
    echo "refresh_grammar: tree-sitter-java@$version has integrity $actual, expected $integrity" >&2
    exit 1
fi
tar -xzf "$tarball" -C "$work"

status=0
for pair in "src/parser.c:src/parser.c" "src/tree_sitter/parser.h:src/tree_sitter/parser.h" \
    "LICENSE:LICENSE"; do
    from="$work/package/${pair%%:*}"
    to="$here/${pair#*:}"
    if [ "$mode" = replace ]; then
        mkdir -p "$(dirname "$to")"
        cp "$from" "$to"
        echo "refresh_grammar: $(sha256sum "$to" | cut -d' ' -f1)  ${pair#*:}"
    elif ! cmp -s "$from" "$to"; then
        echo "refresh_grammar: ${pair#*:} differs from tree-sitter-java@$version" >&2
        status=1
    fi
done
if [ "$mode" = check ] && [ "$status" -eq 0 ]; then
    echo "refresh_grammar: the kept grammar is tree-sitter-java@$version ($integrity)"
fi
exit $status
