#!/usr/bin/env bash
# Runs the given make targets one after another, keeping a copy of their output in LOG, then adds up
# every "N passed, M failed" line they printed into one closing line over the whole run.
# Exit status: non-zero if any target failed.
set -uo pipefail
log="$1"; shift
mkdir -p "$(dirname "$log")"
: > "$log"
status=0
for target in "$@"; do
    make --no-print-directory "$target" 2>&1 | tee -a "$log"
    [ "${PIPESTATUS[0]}" -eq 0 ] || { status=1; echo "FAILED: make $target" | tee -a "$log"; }
done
# Suites print "<suite>: N passed, M failed"; binaries' own lines are summed by their suite line.
totals=$(grep -E '^[a-z][a-z -]*: [0-9]+ passed, [0-9]+ failed' "$log" |
         awk '{for (i = 1; i <= NF; i++) { if ($i == "passed,") p += $(i-1); if ($i == "failed" || $i == "failed,") f += $(i-1) }}
              END { printf "%d %d", p, f }')
passed=${totals% *}; failed=${totals#* }
[ "$status" -eq 0 ] || [ "$failed" -gt 0 ] || failed=1
echo "total: $passed passed, $failed failed"
exit "$status"
