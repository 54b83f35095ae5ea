#!/usr/bin/env python3
"""Worked example: the top-chain length that minimises the largest line tension under a storm.

The demo barge (cases/barge.yaml: the fictional "Kestrel Deep 3" on an
8-point spread) has chain - clump - wire - chain lines.  We change the length
of the top chain (sections[3], the same on all eight lines) and look for the
length that minimises the largest tension the spread sees under the load case
"beam-storm", over every condition the balance command checks: intact and
each line broken in turn.  Too short, the lines are tight and the pretension
alone is large; too long, the hull drifts far and the lines left holding it
snatch taut.  A condition without equilibrium counts as an infinite tension.

The search uses scipy.optimize.minimize_scalar (bounded) when scipy is
installed, else a golden-section search written below (the example says
which one ran).  Then, if matplotlib is installed, it plots the restoring
curve of the optimised spread across the storm's direction into
restoring_curve.png (else it says the plot was skipped).

Run from the repository root after `make`:

    PYTHONPATH=python /usr/bin/python3 examples/python/optimise_chain.py

Quasi-static analysis only: check the result against the governing
classification rules or local codes, and have any mooring design approved by a
competent, licensed engineer.
"""

import math
import os
import sys
import warnings

import holdfast

ROOT = os.path.normpath(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))
LOAD = "beam-storm"
BOUNDS = (150.0, 270.0)  # m of top chain
TOL = 0.05               # m


def set_top_chain(case, length):
    for name in case.line_names:
        case.set("lines[%s].sections[3].length" % name, length)


def largest_tension(case, length):
    """kN: the largest tension over every condition of the load case, inf
    when one has no equilibrium."""
    set_top_chain(case, length)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", holdfast.HoldfastWarning)
        rows = case.balance(LOAD)
    if any(r["status"] != "ok" for r in rows):
        return math.inf
    return max(r["max_tension_kN"] for r in rows)


def golden_section(f, a, b, tol):
    """Minimum of a unimodal f on [a, b] to within tol: golden-section search
    (Kiefer 1953; the interval shrinks by 1/phi = 0.618 per evaluation)."""
    invphi = (math.sqrt(5.0) - 1.0) / 2.0
    c, d = b - invphi * (b - a), a + invphi * (b - a)
    fc, fd, n = f(c), f(d), 2
    while b - a > tol:
        if fc <= fd:
            b, d, fd = d, c, fc
            c = b - invphi * (b - a)
            fc = f(c)
        else:
            a, c, fc = c, d, fd
            d = a + invphi * (b - a)
            fd = f(d)
        n += 1
    x = (a + b) / 2.0
    return x, f(x), n + 1


def optimise(case):
    f = lambda L: largest_tension(case, L)  # noqa: E731
    try:
        from scipy.optimize import minimize_scalar
    except ImportError:
        print("scipy is not installed: using the golden-section search of this example")
        return golden_section(f, BOUNDS[0], BOUNDS[1], TOL)
    print("using scipy.optimize.minimize_scalar (bounded)")
    r = minimize_scalar(f, bounds=BOUNDS, method="bounded", options={"xatol": TOL})
    return r.x, r.fun, r.nfev


def plot_curve(case, path):
    try:
        import numpy as np
        import matplotlib
        matplotlib.use("Agg")
        import matplotlib.pyplot as plt
    except ImportError as e:
        print("plot skipped: %s is not installed" % e.name)
        return
    offsets = np.linspace(-30.0, 30.0, 61)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", holdfast.HoldfastWarning)
        c = case.curve("270 deg", offsets)
    fig, ax = plt.subplots(figsize=(6, 4))
    ax.plot(c["offset_m"], c["restoring_kN"])
    ax.set_xlabel("offset toward 270 deg (m)")
    ax.set_ylabel("restoring force (kN)")
    ax.set_title("Restoring curve, optimised top chain (fictional barge)")
    ax.grid(True)
    fig.tight_layout()
    fig.savefig(path, dpi=120)
    print("restoring curve written to %s" % path)


def main():
    case = holdfast.Case(os.path.join(ROOT, "cases", "barge.yaml"))
    start = case.get("lines[%s].sections[3].length" % case.line_names[0])
    print("load case %s; top chain now %.1f m: largest tension %.1f kN"
          % (LOAD, start, largest_tension(case, start)))
    L, t, n = optimise(case)
    set_top_chain(case, L)
    rows = case.balance(LOAD)
    worst = max(rows, key=lambda r: r["max_tension_kN"])
    intact = rows[0]
    print("optimum top chain %.2f m after %d evaluations: largest tension %.1f kN" % (L, n, t))
    print("  governing condition %s, line %s, utilisation %.3f"
          % (worst["condition"], worst["max_tension_line"], worst["max_utilisation"]))
    print("  intact offset %.2f m (surge %.2f m, sway %.2f m), intact verdict %s (governing: %s)"
          % (intact["horizontal_m"], intact["surge_m"], intact["sway_m"],
             "PASS" if intact["passed"] else "FAIL", intact["criterion"]))
    if not intact["passed"]:
        print("  -> the least tension comes with a large drift: a real design must also meet"
              " the offset limit (add it as a constraint)")
    for L2 in (BOUNDS[0] + 10.0, L, BOUNDS[1] - 10.0):
        print("  check: %.2f m -> %.1f kN" % (L2, largest_tension(case, L2)))
    set_top_chain(case, L)
    plot_curve(case, "restoring_curve.png")
    print("quasi-static results: check them against the governing classification rules or"
          " local codes; a competent, licensed engineer must approve any design.")
    return 0


if __name__ == "__main__":
    sys.exit(main())
