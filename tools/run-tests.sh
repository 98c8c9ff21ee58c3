#!/bin/sh
# Runs test binaries one after another and prints a closing "<suite>: N passed, M failed" line that
# counts the tests inside them (cmocka's "[  PASSED  ] N test(s)." and "[  FAILED  ] N test(s),"
# lines; a binary that prints neither counts as one test). Exit 1 if any binary failed.
set -u
suite="$1"; shift
passed=0; failed=0; broken=0
output=$(mktemp)
for binary in "$@"; do
    echo "== $suite: $(basename "$binary")"
    "$binary" > "$output" 2>&1
    code=$?
    cat "$output"
    p=$(sed -n 's/^\[  PASSED  \] \([0-9]*\) test.*/\1/p' "$output" | awk '{s += $1} END {print s + 0}')
    f=$(sed -n 's/^\[  FAILED  \] \([0-9]*\) test.*/\1/p' "$output" | awk '{s += $1} END {print s + 0}')
    if [ "$p" -eq 0 ] && [ "$f" -eq 0 ]; then
        if [ "$code" -eq 0 ]; then p=1; else f=1; fi
    fi
    if [ "$code" -ne 0 ]; then
        broken=$((broken + 1)); echo "FAILED: $binary"
        [ "$f" -gt 0 ] || f=1
    fi
    passed=$((passed + p)); failed=$((failed + f))
done
rm -f "$output"
echo "$suite: $passed passed, $failed failed"
[ "$broken" -eq 0 ]
