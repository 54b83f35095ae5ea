#!/bin/sh
# install-check.sh - the installed tree, as a user meets it (run by make check).
#
#   1. `make install DESTDIR=$tmp PREFIX=/usr` and the tree it writes: the
#      program, libholdfast.so.1.0.0 with its soname and symlinks, the
#      archive, the public headers (not cli.h), holdfast.pc, the man page,
#      and the Python package when python/holdfast exists;
#   2. examples/c/spread_example.c built exactly as docs/library.md says,
#      `cc example.c $(pkg-config --cflags --libs holdfast)`, with pkg-config
#      pointed into the tree (PKG_CONFIG_SYSROOT_DIR, PKG_CONFIG_PATH), run
#      with LD_LIBRARY_PATH into it; every number it prints is compared with
#      the installed program's CSV for the same case (cases/barge.yaml,
#      cases/student.yaml), cell by cell, also the session API's tables;
#   3. `import holdfast` from the installed Python package (when there is
#      one, and not in sanitizer builds: an instrumented library cannot be
#      loaded into an uninstrumented python3);
#   4. `make uninstall DESTDIR=$tmp PREFIX=/usr` leaves no file behind.
#
# Environment (set by `make check`): HF_ROOT the repository, MAKE the make
# program (the sub-makes inherit BUILD, SANITIZE, OPT... from MAKEFLAGS),
# HF_CC the compiler, HF_EXAMPLE_CFLAGS extra flags for the example (the
# sanitizer flags of a sanitizer build), PYTHON the system python3.
# Exit 0 when everything agrees, 1 with a message naming each difference.
set -u
root=${HF_ROOT:-$(cd "$(dirname "$0")/.." && pwd)}
make=${MAKE:-make}
cc=${HF_CC:-cc}
python=${PYTHON:-/usr/bin/python3}
cd "$root" || exit 1
tmp=$(mktemp -d) || exit 1
trap 'rm -rf "$tmp"' EXIT
dest=$tmp/dest
fails=0
bad() { echo "install-check: FAIL: $*"; fails=$((fails + 1)); }
ok() { echo "install-check: ok: $*"; }

# ---- 1. install ----
if ! $make --no-print-directory install DESTDIR="$dest" PREFIX=/usr >"$tmp/install.log" 2>&1; then
    cat "$tmp/install.log"; echo "install-check: FAIL: make install"; exit 1
fi
u=$dest/usr
for f in bin/holdfast lib/libholdfast.so.1.0.0 lib/libholdfast.a lib/pkgconfig/holdfast.pc \
         share/man/man1/holdfast.1 include/holdfast/case.h include/holdfast/status.h; do
    [ -f "$u/$f" ] || bad "make install wrote no $f"
done
[ -x "$u/bin/holdfast" ] || bad "bin/holdfast is not executable"
[ "$(readlink "$u/lib/libholdfast.so.1")" = libholdfast.so.1.0.0 ] || bad "lib/libholdfast.so.1 -> libholdfast.so.1.0.0"
[ "$(readlink "$u/lib/libholdfast.so")" = libholdfast.so.1 ] || bad "lib/libholdfast.so -> libholdfast.so.1"
soname=$(readelf -d "$u/lib/libholdfast.so.1.0.0" | sed -n 's/.*Library soname: \[\(.*\)\].*/\1/p')
[ "$soname" = libholdfast.so.1 ] || bad "soname is '$soname', expected libholdfast.so.1"
[ -e "$u/include/holdfast/cli.h" ] && bad "cli.h (the program's header) was installed"
want=$(ls include/holdfast/*.h | grep -vc '/cli\.h$')
got=$(ls "$u/include/holdfast" | wc -l)
[ "$want" -eq "$got" ] || bad "$got headers installed, expected $want (include/holdfast minus cli.h)"
[ $fails -eq 0 ] && ok "installed tree: program, library $soname, archive, $got headers, holdfast.pc, man page"

# ---- 2. the C example through pkg-config ----
export PKG_CONFIG_SYSROOT_DIR="$dest" PKG_CONFIG_PATH="$u/lib/pkgconfig"
version=$(sed -n 's/^VERSION *= *//p' Makefile)
got=$(pkg-config --modversion holdfast 2>&1)
[ "$got" = "$version" ] || bad "pkg-config --modversion holdfast: '$got', expected '$version'"
flags=$(pkg-config --cflags --libs holdfast) || { bad "pkg-config --cflags --libs holdfast"; flags=""; }
case "$flags" in *"-I$u/include"*"-L$u/lib"*"-lholdfast"*) ;; *) bad "pkg-config flags '$flags'" ;; esac
# shellcheck disable=SC2086
if ! $cc ${HF_EXAMPLE_CFLAGS:-} -std=c11 -Wall -Wextra -Wpedantic -Werror \
        examples/c/spread_example.c $flags -o "$tmp/spread_example" 2>"$tmp/cc.log"; then
    cat "$tmp/cc.log"; echo "install-check: FAIL: the example does not build with pkg-config"; exit 1
fi
ok "examples/c/spread_example.c built with: $cc spread_example.c $flags"
export LD_LIBRARY_PATH="$u/lib${LD_LIBRARY_PATH:+:$LD_LIBRARY_PATH}"
lib=$(ldd "$tmp/spread_example" | sed -n 's/.*libholdfast.so.1 => \([^ ]*\) .*/\1/p')
[ "$lib" = "$u/lib/libholdfast.so.1" ] || bad "the example loads libholdfast.so.1 from '$lib', not the installed tree"
if ! "$tmp/spread_example" cases/barge.yaml >"$tmp/example.out" 2>"$tmp/example.err"; then
    cat "$tmp/example.out" "$tmp/example.err"; echo "install-check: FAIL: the example failed"; exit 1
fi

hf=$u/bin/holdfast
"$hf" lines cases/barge.yaml --offset 3,-2,4 --csv "$tmp/lines.csv" >/dev/null 2>&1 || bad "holdfast lines"
"$hf" stiffness cases/barge.yaml --csv "$tmp/stiffness.csv" >/dev/null 2>&1 || bad "holdfast stiffness"
"$hf" curve cases/barge.yaml --direction 30 --range -10:10:2.5 --csv "$tmp/curve.csv" >/dev/null 2>&1 ||
    bad "holdfast curve"
"$hf" balance cases/barge.yaml --csv "$tmp/balance.csv" >/dev/null 2>&1 || bad "holdfast balance"
"$hf" sweep cases/barge.yaml --vary site.water_level=1.5 --csv "$tmp/sweep.csv" --quiet >/dev/null 2>&1 ||
    bad "holdfast sweep"

# compare TITLE CSV: the table the example prints under the line starting
# with TITLE (a header of CSV column names, then rows, up to a blank line or
# the next "== ") against the CSV file: same number of rows, and in each row
# every column the example prints equal to the CSV's cell of that name:
# text exactly ("-" stands for an empty cell), numbers to the CSV's printed
# digits (%.10g: 2e-9 relative) or 1e-6 absolute (values printed near zero
# are rounding noise).
compare() {
    awk -v title="$1" -v what="$1" '
    function num(s) { return s ~ /^[-+]?([0-9]+\.?[0-9]*|\.[0-9]+)([eE][-+]?[0-9]+)?$/ }
    function abs(x) { return x < 0 ? -x : x }
    FNR == NR {
        if (index($0, title) == 1) { inblk = 1; hdr = 0; next }
        if (inblk && ($0 ~ /^== / || NF == 0)) inblk = 0
        if (!inblk) next
        if (!hdr) { nc = NF; for (i = 1; i <= NF; i++) col[i] = $i; hdr = 1; next }
        ne++; for (i = 1; i <= NF; i++) ev[ne, i] = $i; enf[ne] = NF; next
    }
    FNR == 1 { FS = ","; $0 = $0; for (i = 1; i <= NF; i++) at[$i] = i; next }
    { nr++; for (i = 1; i <= NF; i++) cv[nr, i] = $i }
    END {
        bad = 0; cells = 0
        if (!hdr || ne == 0) { print "install-check: FAIL: " what ": no table in the example output"; exit 1 }
        if (ne != nr) { print "install-check: FAIL: " what ": " ne " rows, the CSV has " nr; exit 1 }
        for (i = 1; i <= nc; i++)
            if (!(col[i] in at)) { print "install-check: FAIL: " what ": no CSV column " col[i]; exit 1 }
        for (r = 1; r <= ne; r++) {
            if (enf[r] != nc) { print "install-check: FAIL: " what ": row " r " has " enf[r] " cells"; bad++; continue }
            for (i = 1; i <= nc; i++) {
                e = ev[r, i]; c = cv[r, at[col[i]]]; cells++
                if (num(e) && num(c)) same = abs(e - c) <= 2e-9 * abs(c) + 1e-6
                else same = (e == c) || (e == "-" && c == "")
                if (!same) { print "install-check: FAIL: " what ": row " r ", " col[i] ": example " e ", CLI " c; bad++ }
            }
        }
        if (bad) exit 1
        print "install-check: ok: " what ": " ne " rows, " cells " cells agree with the CLI"
    }' "$tmp/example.out" "$2" || fails=$((fails + 1))
}
compare "== lines at offset" "$tmp/lines.csv"
compare "== stiffness at rest" "$tmp/stiffness.csv"
compare "== curve toward 30 deg" "$tmp/curve.csv"
compare "== balance" "$tmp/balance.csv"
compare "== parameter site.water_level" "$tmp/sweep.csv"
compare "== session: lines at offset" "$tmp/lines.csv"
compare "== session: stiffness at rest" "$tmp/stiffness.csv"
grep -qx '== session: site.water_level set to "150 cm" reads 1.5 m (SI)' "$tmp/example.out" ||
    bad "session: site.water_level set from \"150 cm\" does not read 1.5 m"
grep -q '^== session: site.depth = "-3 m": invalid input: site.depth: ' "$tmp/example.out" ||
    bad "session: a negative depth was not refused with a message naming site.depth"

# The case given as a string is cases/student.yaml's line: same tension.
"$hf" lines cases/student.yaml --csv "$tmp/student.csv" >/dev/null 2>&1 || bad "holdfast lines student"
cli=$(awk -F, 'NR == 1 { for (i = 1; i <= NF; i++) if ($i == "fairlead_tension_kN") k = i } NR == 2 { print $k }' "$tmp/student.csv")
ex=$(sed -n 's/^== string case .*fairlead tension \([^ ]*\) kN$/\1/p' "$tmp/example.out")
[ -n "$ex" ] && [ "$ex" = "$cli" ] && ok "string case: fairlead tension $ex kN, the CLI's $cli kN" ||
    bad "string case: example '$ex' kN, CLI '$cli' kN"
# The loader's message for a bad string is the command line's for that file.
sed -n 's/^== bad string case: invalid input: //p' "$tmp/example.out" >"$tmp/bad.msg"
# The example's small_case with "370 m" changed to "370 t", as the example does.
cat >"$tmp/bad.yaml" <<'EOF'
title: One chain at the Tarrow Point basin (fictional)
site: {depth: 48 m}
components:
  chain: {type: studless_chain, grade: R3S, diameter: 52 mm}
lines:
  - name: practice
    anchor: [-365, 0]
    fairlead: [0, 0, -6]
    sections: [{component: chain, length: 370 t}]
EOF
(cd "$tmp" && "$hf" check bad.yaml >/dev/null 2>"$tmp/bad.err")
sed -n '1s/^holdfast: //p' "$tmp/bad.err" >"$tmp/bad.cli"
if [ -s "$tmp/bad.msg" ] && cmp -s "$tmp/bad.msg" "$tmp/bad.cli"; then
    ok "bad string case: the same located message as the CLI: $(cat "$tmp/bad.msg")"
else
    bad "bad string case: example '$(cat "$tmp/bad.msg")', CLI '$(cat "$tmp/bad.cli")'"
fi
grep -q 'competent, licensed engineer' "$tmp/example.out" || bad "the example prints no caution"

# ---- 3. the installed Python package ----
if [ -d python/holdfast ]; then
    site=$(find "$u/lib" -type d -name holdfast -path '*-packages/*' | head -n 1)
    if [ -z "$site" ]; then
        bad "make install put no Python package under $u/lib/python*/*-packages"
    elif [ -n "${HF_EXAMPLE_CFLAGS:-}" ]; then
        echo "install-check: not run: import of the installed Python package (sanitizer build)"
    else
        pyout=$(cd "$tmp" && PYTHONPATH="$(dirname "$site")" "$python" -c '
import sys, holdfast
assert holdfast.__file__.startswith(sys.argv[1]), holdfast.__file__
c = holdfast.Case(sys.argv[2])
print("%.10g" % c.lines()[0]["fairlead_tension_kN"])' "$u" "$root/cases/student.yaml" 2>&1)
        [ "$pyout" = "$cli" ] && ok "installed Python package: student case fairlead tension $pyout kN" ||
            bad "installed Python package: '$pyout', CLI '$cli' kN"
    fi
fi

# ---- 4. uninstall ----
if ! $make --no-print-directory uninstall DESTDIR="$dest" PREFIX=/usr >"$tmp/uninstall.log" 2>&1; then
    cat "$tmp/uninstall.log"; bad "make uninstall"
fi
left=$(find "$dest" ! -type d)
[ -z "$left" ] && ok "make uninstall removed every file" || bad "make uninstall left: $left"

[ $fails -eq 0 ] && echo "install-check: passed" || echo "install-check: $fails failures"
[ $fails -eq 0 ]
