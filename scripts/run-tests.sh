#!/bin/sh
# Runs every test binary given, keeps going past failures, prints one summary
# line "N passed, N failed" and exits non-zero if any binary failed.
set -u
pass=0; fail=0; failed=""
for t in "$@"; do
    if "$t"; then pass=$((pass + 1)); else fail=$((fail + 1)); failed="$failed $(basename "$t")"; fi
done
[ -n "$failed" ] && echo "failed test programs:$failed"
echo "tests: $pass passed, $fail failed"
[ "$fail" -eq 0 ]
