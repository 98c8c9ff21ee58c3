#!/bin/sh
# Runs test binaries one after another, prints each one's cmocka summary, and a
# closing "N passed, N failed" line over all of them.  Exit 1 if any failed.
set -u
suite="$1"; shift
passed=0; failed=0
for binary in "$@"; do
    echo "== $suite: $(basename "$binary")"
    if "$binary"; then passed=$((passed + 1)); else failed=$((failed + 1)); echo "FAILED: $binary"; fi
done
echo "$suite: $passed passed, $failed failed"
[ "$failed" -eq 0 ]
