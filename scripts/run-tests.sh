#!/bin/sh
# Runs every test program given (cmocka programs and tests/golden.sh), keeps
# going past failures, and ends with one summary line
#
#     tests: N passed, M failed, K skipped
#
# N and M count programs (exit 0, or any other status).  K counts what did
# not run: each cmocka test that called skip() (its program still passes if
# nothing failed) and each program that exited 77 (the "skipped" status of
# the GNU test drivers; such a program counts as skipped, not passed).
# Every skip is listed by name above the summary, so none is invisible.
# Exits 1 if any program failed.
set -u
pass=0; fail=0; skipped=0; failed=""; skiplist=""
log=$(mktemp) || exit 2
trap 'rm -f "$log" "$log.rc"' EXIT
for t in "$@"; do
    name=$(basename "$t")
    # Output is shown as it comes and kept to count the skips.
    { "$t" 2>&1; echo $? >"$log.rc"; } | tee "$log"
    rc=$(cat "$log.rc")
    if [ "$rc" -eq 77 ]; then
        skipped=$((skipped + 1)); skiplist="$skiplist
  $name (whole program)"
        continue
    fi
    # cmocka prints "[  SKIPPED ] NAME" for each skipped test, and again in
    # its closing list; "[  SKIPPED ] N test(s), listed below:" is the count.
    tests=$(sed -n 's/^\[  SKIPPED \] \([^ ]*\)$/\1/p' "$log" | sort -u)
    for s in $tests; do
        skipped=$((skipped + 1)); skiplist="$skiplist
  $name: $s"
    done
    if [ "$rc" -eq 0 ]; then
        pass=$((pass + 1))
    else
        fail=$((fail + 1)); failed="$failed $name"
    fi
done
[ -n "$skiplist" ] && echo "skipped tests:$skiplist"
[ -n "$failed" ] && echo "failed test programs:$failed"
echo "tests: $pass passed, $fail failed, $skipped skipped"
[ "$fail" -eq 0 ]
