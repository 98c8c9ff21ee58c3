#!/bin/sh
# Runs each libFuzzer harness for SECONDS seconds on its committed seed corpus
# (tests/fuzz/corpus/<harness>/, read only) plus a scratch corpus under build/fuzz/corpus/, and
# prints the executions and the outcome of each, then "fuzz: N passed, M failed".
# A crash, a leak, a timeout (10 s for one input) or an assertion of tests/fuzz/reply_check.h
# fails the harness; the input that did it is saved under build/fuzz/artifacts/.
# usage: fuzz-run.sh BIN_DIR SECONDS HARNESS...
set -u
bin_dir="$1"; seconds="$2"; shift 2
passed=0; failed=0
mkdir -p build/fuzz/artifacts
for harness in "$@"; do
    scratch="build/fuzz/corpus/$harness"
    seeds="tests/fuzz/corpus/$harness"
    log="build/fuzz/$harness.log"
    mkdir -p "$scratch"
    dict=""
    [ -f tests/fuzz/greybody.dict ] && dict="-dict=tests/fuzz/greybody.dict"
    # shellcheck disable=SC2086
    "$bin_dir/$harness" -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 -max_len=4096 \
        -print_final_stats=1 -artifact_prefix=build/fuzz/artifacts/"$harness"- $dict \
        "$scratch" "$seeds" > "$log" 2>&1
    code=$?
    runs=$(sed -n 's/^stat::number_of_executed_units: *//p' "$log" | tail -1)
    if [ "$code" -eq 0 ]; then
        passed=$((passed + 1))
        echo "fuzz $harness: ${runs:-?} executions in ${seconds} s, no failure"
    else
        failed=$((failed + 1))
        echo "fuzz $harness: FAILED (exit $code) after ${runs:-?} executions; log $log:"
        grep -v '^#' "$log" | tail -60
    fi
done
echo "fuzz: $passed passed, $failed failed"
[ "$failed" -eq 0 ]
