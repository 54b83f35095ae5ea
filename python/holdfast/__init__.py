"""holdfast - quasi-static mooring analysis from Python.

A thin binding (ctypes) of the holdfast C library's session API
(include/holdfast/session.h).  One `Case` holds one loaded case file; its
results come from the same C functions as the command line's CSV files, with
the same column names and the same numbers::

    import holdfast
    case = holdfast.Case("cases/barge.yaml")
    case.set("lines[bow-port].sections[1].length", "310 m")
    for row in case.lines():
        print(row["line"], row["fairlead_tension_kN"])

Units: `get` and `set` use SI (m, N, kg/m^3, rad), or a string with units
for `set` ("310 m", "76 mm", "30 deg"; a bare number in a string is read as
in a case file).  Offsets and directions passed in are SI (m, rad) or such
strings.  Results are in the unit each column name declares (kN, deg, m),
exactly as in the CSV files.

Errors raise exceptions carrying the tool's own message, never a silent NaN:
`CaseError` (the case file or text: "file:line:col: ..."), `ParameterError`
(an unknown path or a bad value; the case is left unchanged and usable),
`SolveError` (a line or an equilibrium that cannot be solved), `HoldfastError`
(their base).  Overloaded lines and conditions without equilibrium are
results, flagged in their rows and reported as `HoldfastWarning` warnings.

The results are quasi-static: check them against the governing
classification rules or local codes, and have them approved by a competent,
licensed engineer before anything is built on them.
"""

from ._lib import library, library_path
from .case import (Case, CaseError, HoldfastError, HoldfastWarning, ParameterError,
                   SolveError)

__all__ = ["Case", "CaseError", "HoldfastError", "HoldfastWarning", "ParameterError",
           "SolveError", "library", "library_path"]
