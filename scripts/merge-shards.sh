#!/bin/sh
# merge-shards.sh - join the parts of a sharded holdfast sweep into one CSV.
#
#   scripts/merge-shards.sh DIR N RESULT
#
# Concatenates DIR/part-000001.csv .. DIR/part-N.csv (as written by
# scripts/slurm-sweep.sh, or `holdfast sweep --shard K/N --csv ...`) in order
# into RESULT.  Only part 1 has the header, so the result equals the sweep run
# on one machine.  Refuses to write anything when a part is missing or empty
# (part 1 must at least hold the header), and writes RESULT through a
# temporary file renamed into place, so RESULT is never half-written.
set -eu

if [ $# -ne 3 ]; then
    echo "usage: $0 DIR N RESULT" >&2
    exit 2
fi
dir=$1 n=$2 result=$3
case $n in
'' | *[!0-9]*) echo "$0: N must be a whole number, got '$n'" >&2; exit 2 ;;
esac
if [ "$n" -lt 1 ]; then
    echo "$0: N must be at least 1" >&2
    exit 2
fi

k=1
while [ "$k" -le "$n" ]; do
    part=$(printf '%s/part-%06d.csv' "$dir" "$k")
    if [ ! -f "$part" ]; then
        echo "$0: missing $part: the shard $k/$n has not finished (or failed)" >&2
        exit 1
    fi
    k=$((k + 1))
done
if [ ! -s "$(printf '%s/part-%06d.csv' "$dir" 1)" ]; then
    echo "$0: part 1 is empty: it should start with the header" >&2
    exit 1
fi

tmp=$(mktemp "$(dirname "$result")/.$(basename "$result").tmpXXXXXX")
trap 'rm -f "$tmp"' EXIT INT TERM HUP
k=1
while [ "$k" -le "$n" ]; do
    cat "$(printf '%s/part-%06d.csv' "$dir" "$k")"
    k=$((k + 1))
done >"$tmp"
chmod 644 "$tmp"
mv "$tmp" "$result"
trap - EXIT INT TERM HUP
