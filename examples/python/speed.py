#!/usr/bin/env python3
"""How much faster a Python loop over the library is than one process per evaluation.

Each evaluation sets the practice line's length in the student case (a
fictional training basin) and solves the lines.  Two ways:

  library:      case.set(path, length); case.lines()
  command line: write the edited case file, start `holdfast lines CASE --csv -`,
                parse its CSV (what a script had to do before the library)

Prints the time per evaluation of each and their ratio; checks that both give
the same fairlead tension (to the CSV's 10 printed digits) at every length.
Run from the repository root after `make`:

    PYTHONPATH=python python3 examples/python/speed.py [N_LIBRARY [N_PROCESSES]]
"""

import csv
import io
import os
import subprocess
import sys
import tempfile
import time

import holdfast

ROOT = os.path.normpath(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))
CASE = os.path.join(ROOT, "cases", "student.yaml")
BIN = os.environ.get("HF_BIN") or os.path.join(ROOT, "build", "holdfast")
PATH = "lines[practice].sections[0].length"


def lengths(n):
    return [366.0 + 14.0 * k / max(n - 1, 1) for k in range(n)]


def by_library(n):
    case = holdfast.Case(CASE)
    out = []
    t0 = time.perf_counter()
    for L in lengths(n):
        case.set(PATH, L)
        out.append(case.lines()[0]["fairlead_tension_kN"])
    return (time.perf_counter() - t0) / n, out


def by_process(n):
    with open(CASE) as f:
        text = f.read()
    out = []
    with tempfile.TemporaryDirectory() as d:
        path = os.path.join(d, "case.yaml")
        t0 = time.perf_counter()
        for L in lengths(n):
            with open(path, "w") as f:
                f.write(text.replace("length: 370 m}", "length: %.17g m}" % L, 1))
            p = subprocess.run([BIN, "lines", path, "--csv", "-"], capture_output=True,
                               text=True, check=False)
            if p.returncode not in (0, 1):
                sys.exit("holdfast lines failed: " + p.stderr)
            rows = list(csv.DictReader(io.StringIO(p.stdout)))
            out.append(float(rows[0]["fairlead_tension_kN"]))
        return (time.perf_counter() - t0) / n, out


def main():
    n_lib = int(sys.argv[1]) if len(sys.argv) > 1 else 2000
    n_proc = int(sys.argv[2]) if len(sys.argv) > 2 else 100
    t_lib, a = by_library(n_lib)
    t_proc, b = by_process(n_proc)
    # same lengths when n_lib == n_proc; otherwise compare the shared grid
    check = by_library(n_proc)[1]
    bad = [k for k, (x, y) in enumerate(zip(check, b)) if "%.10g" % x != "%.10g" % y]
    print("library:      %8.1f us per evaluation (%d evaluations)" % (t_lib * 1e6, n_lib))
    print("command line: %8.1f us per evaluation (%d processes)" % (t_proc * 1e6, n_proc))
    print("ratio:        %8.0f x faster through the library" % (t_proc / t_lib))
    print("same fairlead tension to 10 digits at all %d lengths: %s"
          % (n_proc, "yes" if not bad else "NO (%d differ)" % len(bad)))
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
