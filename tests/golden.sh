#!/bin/sh
# Behaviour snapshot: runs every command of holdfast on the demo cases and on
# the golden-test cases (tests/golden/cases) and compares standard output,
# standard error, the exit status and every file written with the recorded
# snapshot in tests/golden/expected.  A refactoring must leave all of it
# byte-identical; a deliberate change of output is recorded again with
#
#     HF_BIN=build/holdfast sh tests/golden.sh --record
#
# and the diff of tests/golden/expected is reviewed in the commit.
set -u
root=${HF_ROOT:-$(cd "$(dirname "$0")/.." && pwd)}
bin=${HF_BIN:-}
if [ -z "$bin" ] || [ ! -x "$bin" ]; then
    echo "golden: HF_BIN must name the holdfast binary (got '${bin}')" >&2
    exit 1
fi
record=0
[ "${1:-}" = "--record" ] && record=1
expected="$root/tests/golden/expected"
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cd "$root" || exit 1

# run NAME ARGS...: stdout, stderr and status of one command into $out/NAME
run() {
    name=$1; shift
    "$bin" "$@" >"$out/$name.stdout" 2>"$out/$name.stderr"
    echo "exit $?" >"$out/$name.status"
}

# dump DIR NAME: every file written into DIR, in name order, into $out/NAME.files
dump() {
    : >"$out/$2.files"
    for f in $(cd "$1" && ls -A); do
        echo "=== $f" >>"$out/$2.files"
        cat "$1/$f" >>"$out/$2.files"
    done
}

for c in cases/*.yaml tests/golden/cases/*.yaml; do
    n=$(basename "$c" .yaml)
    out="$work/$n"
    mkdir -p "$out"
    run check check "$c"
    run lines lines "$c"
    run lines-csv lines "$c" --csv -
    run lines-offset lines "$c" --offset 3,-2,4 --csv -
    run lines-profiles lines "$c" --profiles "$work/prof-$n" --csv "$work/run-lines-$n.csv"
    [ -d "$work/prof-$n" ] && dump "$work/prof-$n" lines-profiles
    [ -f "$work/run-lines-$n.csv" ] && cp "$work/run-lines-$n.csv" "$out/lines-profiles.csvfile"
    run stiffness stiffness "$c"
    run stiffness-csv stiffness "$c" --csv -
    run stiffness-offset stiffness "$c" --offset 2,1,1 --csv -
    run curve curve "$c" --direction 30 --range -10:10:2.5
    run curve-csv curve "$c" --direction 30 --range -10:10:2.5 --csv -
    run balance balance "$c"
    run balance-csv balance "$c" --csv -
    run sweep sweep "$c" --vary site.water_level=-1:1:0.5 --csv - --jobs 2 --quiet
    run sweep-rest sweep "$c" --vary site.depth=-2:2:2 --vary site.water_level=0,0.5 --zip --csv - --quiet \
        --output max_tension --output max_utilisation --output stiffness_sway --output vertical_load
    run plot-plan plot "$c" --figure plan
    run plot-elevation plot "$c" --figure elevation
    run plot-curve plot "$c" --figure curve --direction 45 --range -5:5:1
    run run run "$c" --out "$work/run-$n" --jobs 2 --quiet
    [ -d "$work/run-$n" ] && dump "$work/run-$n" run
done

# Commands whose arguments depend on the case.
out="$work/student"
run invert invert cases/student.yaml --vary 'lines[practice].sections[0].length=367:380' \
    --target fairlead_tension:practice=250kN --csv -
run invert-miss invert cases/student.yaml --vary 'lines[practice].sections[0].length=379:380' \
    --target fairlead_tension:practice=250kN
out="$work/barge"
run sweep-load sweep cases/barge.yaml --vary 'components.mid-wire.diameter=70mm:80mm:5mm' \
    --output offset_beam-storm --output fairlead_horizontal:bow-port-a --csv - --quiet
run balance-one balance cases/barge.yaml --load head-storm
run invert-radius invert cases/barge.yaml --vary 'lines[bow-port-a].anchor_radius=846m:866m' \
    --target fairlead_tension:bow-port-a=800kN --csv -
out="$work/marina"
run balance-load balance cases/marina.yaml --load ebb-along --csv -
# issue 14: the design check of the barge's environments (budget, CSV, one environment)
out="$work/barge"
run design design cases/barge.yaml
run design-csv design cases/barge.yaml --environment head-swell --csv -

# Run folders hold the folder's own name in their report; make it stable.
for f in "$work"/*/*; do
    sed -i "s#$work#WORK#g" "$f"
done

if [ $record -eq 1 ]; then
    rm -rf "$expected"
    mkdir -p "$expected"
    for d in "$work"/*/; do
        case "$(basename "$d")" in prof-*|run-*) continue ;; esac
        cp -r "$d" "$expected/"
    done
    echo "golden: recorded $(find "$expected" -type f | wc -l) files in $expected"
    exit 0
fi

fail=0; total=0
for f in $(cd "$expected" && find . -type f | sort); do
    total=$((total + 1))
    if [ ! -f "$work/$f" ]; then
        echo "golden: missing output $f"; fail=$((fail + 1))
    elif ! cmp -s "$expected/$f" "$work/$f"; then
        echo "golden: differs: $f"
        diff -u "$expected/$f" "$work/$f" | head -20
        fail=$((fail + 1))
    fi
done
for f in $(cd "$work" && find . -path './prof-*' -prune -o -path './run-*' -prune -o -type f -print | sort); do
    [ -f "$expected/$f" ] || { echo "golden: new output not in the snapshot: $f"; fail=$((fail + 1)); }
done
echo "golden: $((total - fail)) passed, $fail failed"
[ $fail -eq 0 ]
