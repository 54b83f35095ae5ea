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
#
# Each part comes with its sidecar part-K.csv.shard (written by `holdfast
# sweep --shard K/N --csv FILE`; format in docs/studies.md): the sweep's
# fingerprint (its parameters, values, outputs and case file), K, N, the
# part's first case, its number of cases and the sweep's total.  The merge
# refuses parts of different sweeps (fingerprints differ), parts cut for
# another N, parts that leave a gap or overlap, a last part that does not end
# the sweep, and a part whose row count is not the one its sidecar states
# (a part rewritten without its sidecar).
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

# field FILE KEY: the value of KEY=... in a sidecar
field() {
    sed -n "s/^$2=//p" "$1" | head -n 1
}

k=1 next=0 fp='' total=''
while [ "$k" -le "$n" ]; do
    part=$(printf '%s/part-%06d.csv' "$dir" "$k")
    side=$part.shard
    if [ ! -f "$side" ]; then
        echo "$0: missing $side: each part needs the sidecar holdfast sweep --shard writes beside it" >&2
        exit 1
    fi
    f=$(field "$side" fingerprint) p=$(field "$side" part) ps=$(field "$side" parts)
    first=$(field "$side" first_case) cases=$(field "$side" cases) t=$(field "$side" total_cases)
    for v in "$p" "$ps" "$first" "$cases" "$t"; do
        case $v in
        '' | *[!0-9]*) echo "$0: $side: not a holdfast sweep part sidecar" >&2; exit 1 ;;
        esac
    done
    [ -n "$f" ] || { echo "$0: $side: no fingerprint" >&2; exit 1; }
    if [ "$k" -eq 1 ]; then
        fp=$f total=$t
    elif [ "$f" != "$fp" ]; then
        echo "$0: $part belongs to another sweep (fingerprint $f, part 1 has $fp): rerun it with the same case and options" >&2
        exit 1
    fi
    if [ "$p" -ne "$k" ] || [ "$ps" -ne "$n" ]; then
        echo "$0: $part is part $p/$ps, expected $k/$n" >&2
        exit 1
    fi
    if [ "$t" -ne "$total" ] || [ "$first" -ne "$next" ]; then
        echo "$0: $part starts at case $first of $t, expected case $next of $total" >&2
        exit 1
    fi
    rows=$(wc -l <"$part")
    [ "$k" -eq 1 ] && rows=$((rows - 1))
    if [ "$rows" -ne "$cases" ]; then
        echo "$0: $part holds $rows rows, its sidecar says $cases: the part was rewritten or cut" >&2
        exit 1
    fi
    next=$((first + cases))
    k=$((k + 1))
done
if [ "$next" -ne "$total" ]; then
    echo "$0: the parts end at case $next of $total" >&2
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
