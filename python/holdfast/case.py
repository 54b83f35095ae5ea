"""The Case class: one loaded case behind a C session (include/holdfast/session.h)."""

import ctypes
import math
import numbers
import warnings

from . import _lib

HF_DIM_LENGTH = 1


class HoldfastError(Exception):
    """A holdfast call failed; the message is the tool's own, `status` the
    C status text ("invalid input", "no convergence", ...)."""

    def __init__(self, message, status="error"):
        super().__init__(message)
        self.status = status


class CaseError(HoldfastError, ValueError):
    """The case file or text is invalid: message "file:line:col: key: expected ..."."""


class ParameterError(HoldfastError, ValueError):
    """An unknown parameter path or a value the model refuses (the case is unchanged)."""


class SolveError(HoldfastError):
    """A line or an equilibrium could not be solved (or the input to a solve is invalid)."""


class HoldfastWarning(UserWarning):
    """A complete result that carries a warning: an overloaded line (T/MBL >= 1),
    a balance condition without equilibrium."""


def _text(b):
    return b.decode("utf-8", "replace") if b is not None else None


def _bytes(s, what):
    if not isinstance(s, str):
        raise TypeError("%s must be a str, got %r" % (what, s))
    return s.encode("utf-8")


class _Table:
    """Reads a hf_session_table into Python and frees it."""

    def __init__(self, lib, handle):
        self.lib, self.h = lib, handle

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.lib.hf_session_table_free(self.h)

    def columns(self):
        """(names, text flags) of the columns."""
        lib, h = self.lib, self.h
        ncols = lib.hf_session_table_columns(h)
        return ([_text(lib.hf_session_table_column(h, j)) for j in range(ncols)],
                [bool(lib.hf_session_table_is_text(h, j)) for j in range(ncols)])

    def rows(self, is_text):
        """The rows as lists: str in text columns, float in numeric columns,
        None where the CSV leaves the cell empty (the C table has NaN there:
        a value that is not finite is never written as a number)."""
        lib, h = self.lib, self.h
        nrows, ncols = lib.hf_session_table_rows(h), len(is_text)
        values = lib.hf_session_table_values(h)[:nrows * ncols] if nrows else []
        text = lib.hf_session_table_text
        isfinite = math.isfinite
        rows = []
        for i in range(nrows):
            row = values[i * ncols:(i + 1) * ncols]
            for j in range(ncols):
                if is_text[j]:
                    row[j] = _text(text(h, i, j))
                elif not isfinite(row[j]):
                    row[j] = None
            rows.append(row)
        return rows


class Case:
    """One holdfast case, loaded from a file (``Case(path)``) or from text
    (``Case.from_string(text)``).

    Not thread-safe: use one Case per thread (separate Cases may run on
    separate threads at the same time)."""

    def __init__(self, path=None, *, _text=None, _name=None):
        lib = _lib.library()
        self._lib = lib
        self._columns = {}
        self._s = lib.hf_session_alloc()
        if not self._s:
            raise MemoryError("holdfast: out of memory for a session")
        if _text is not None:
            data = _bytes(_text, "case text")
            st = lib.hf_session_load_string(self._s, data, len(data),
                                            _bytes(_name or "<string>", "name"))
        else:
            if path is None:
                raise TypeError("Case(path): a case file path is required "
                                "(or use Case.from_string(text))")
            st = lib.hf_session_load_file(self._s, _bytes(str(path), "path"))
        if st != _lib.HF_OK:
            msg = self._message()
            self.close()
            raise CaseError(msg, self._status(st))

    @classmethod
    def from_string(cls, text, name="<string>"):
        """A case from YAML text; messages name it `name` ("<string>:12:7: ...")."""
        return cls(_text=text, _name=name)

    # ---- life cycle ----

    def close(self):
        """Releases the C session (also done when the Case is garbage-collected)."""
        if getattr(self, "_s", None):
            self._lib.hf_session_free(self._s)
            self._s = None

    def __del__(self):
        self.close()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()

    # ---- plumbing ----

    def _message(self):
        return _text(self._lib.hf_session_message(self._s)) or "holdfast: unknown error"

    def _status(self, st):
        return _text(self._lib.hf_status_str(st))

    def _session(self):
        if not self._s:
            raise HoldfastError("holdfast: this Case is closed")
        return self._s

    def _check(self, st, error=SolveError):
        if st == _lib.HF_OK:
            return
        if st == _lib.HF_ENOMEM:
            raise MemoryError(self._message())
        raise error(self._message(), self._status(st))

    def _warn(self):
        w = _text(self._lib.hf_session_warnings(self._s))
        for line in filter(None, (w or "").split("\n")):
            warnings.warn(line, HoldfastWarning, stacklevel=3)

    def _table(self, call, *args):
        """(column names, text flags, rows) of the table `call` returns.  The
        columns of a kind of table do not change while the case is loaded
        (set() changes values, not lines), so they are read once."""
        out = ctypes.c_void_p()
        st = call(self._session(), *args, ctypes.byref(out))
        self._check(st)
        with _Table(self._lib, out) as t:
            key = call.__name__
            if key not in self._columns:
                self._columns[key] = t.columns()
            names, is_text = self._columns[key]
            rows = t.rows(is_text)
        self._warn()
        return names, is_text, rows

    def _parse(self, value, dim, what):
        """A number (SI) or a string with units of dimension dim, as SI float."""
        if isinstance(value, str):
            out, err = ctypes.c_double(), _lib.Error()
            st = self._lib.hf_units_parse(value.encode(), dim, ctypes.byref(out),
                                          ctypes.byref(err))
            if st != _lib.HF_OK:
                raise ParameterError("%s: %s" % (what, _text(err.text)), self._status(st))
            return out.value
        if isinstance(value, bool) or not isinstance(value, numbers.Real):
            raise TypeError("%s: expected a number or a string with units, got %r"
                            % (what, value))
        v = float(value)
        if not math.isfinite(v):
            raise ParameterError("%s: expected a finite value, got %r" % (what, value),
                                 "invalid input")
        return v

    def _offset(self, offset):
        if offset is None:
            return None
        off = list(offset)
        if len(off) != 3:
            raise ParameterError("offset: expected (surge m, sway m, heading rad), got %r"
                                 % (offset,), "invalid input")
        dims = (HF_DIM_LENGTH, HF_DIM_LENGTH, _lib.HF_DIM_ANGLE)
        vals = [self._parse(v, d, "offset") for v, d in zip(off, dims)]
        return (ctypes.c_double * 3)(*vals)

    # ---- the case ----

    @property
    def line_names(self):
        """Names of the lines, in case order."""
        lib, s = self._lib, self._session()
        return [_text(lib.hf_session_line_name(s, i)) for i in range(lib.hf_session_nlines(s))]

    @property
    def load_names(self):
        """Names of the load cases, in case order."""
        lib, s = self._lib, self._session()
        return [_text(lib.hf_session_load_name(s, i)) for i in range(lib.hf_session_nloads(s))]

    def get(self, path):
        """The parameter at `path` (the paths of --vary), in SI."""
        out = ctypes.c_double()
        st = self._lib.hf_session_get(self._session(), _bytes(path, "path"), ctypes.byref(out))
        self._check(st, ParameterError)
        return out.value

    def set(self, path, value):
        """Sets the parameter at `path` to `value`: a number in SI or a string
        with units ("310 m").  Raises ParameterError and leaves the case
        unchanged when the path or the value is bad."""
        s, p = self._session(), _bytes(path, "path")
        if isinstance(value, str):
            st = self._lib.hf_session_set_text(s, p, value.encode("utf-8"))
        elif isinstance(value, bool) or not isinstance(value, numbers.Real):
            raise TypeError("%s: expected a number (SI) or a string with units, got %r"
                            % (path, value))
        else:
            st = self._lib.hf_session_set(s, p, float(value))
        self._check(st, ParameterError)

    # ---- results ----

    def lines(self, offset=(0, 0, 0)):
        """Every line solved at the case's pose plus `offset` (surge m, sway m,
        heading rad; strings with units allowed): one dict per line with the
        columns of the `lines` CSV (kN, deg, m).  Raises SolveError when a
        line cannot be solved; an overloaded line gives a HoldfastWarning
        and alert == "overloaded"."""
        names, _, rows = self._table(self._lib.hf_session_lines, self._offset(offset))
        return [dict(zip(names, r)) for r in rows]

    def stiffness(self, offset=(0, 0, 0)):
        """The 6x6 mooring stiffness K = -dF/dq at the pose, a numpy array in
        the `stiffness` CSV's units (kN/m, kN/rad, kN m/m, kN m/rad); rows
        and columns surge, sway, heave, roll, pitch, yaw."""
        import numpy as np
        names, _, rows = self._table(self._lib.hf_session_stiffness, self._offset(offset))
        return np.array([r[1:] for r in rows[:6]], dtype=float)

    def static_load(self, offset=(0, 0, 0)):
        """The `stiffness` CSV's static_load row: the mooring force and moment
        on the hull at the pose (kN, kN m), a numpy array Fx, Fy, Fz, Mx, My, Mz."""
        import numpy as np
        names, _, rows = self._table(self._lib.hf_session_stiffness, self._offset(offset))
        return np.array(rows[6][1:], dtype=float)

    def curve(self, direction, offsets):
        """The restoring curve along `direction` (rad from global x, or a
        string such as "30 deg") at `offsets` (m from the rest pose, in the
        order given): a dict of numpy arrays keyed by the `curve` CSV's
        columns (text columns as arrays of str).  Raises SolveError at an
        offset that cannot be solved."""
        import numpy as np
        d = self._parse(direction, _lib.HF_DIM_ANGLE, "direction")
        offs = [self._parse(v, HF_DIM_LENGTH, "offsets") for v in np.ravel(offsets)]
        if not offs:
            raise ParameterError("curve: expected at least one offset", "invalid input")
        arr = (ctypes.c_double * len(offs))(*offs)
        names, is_text, rows = self._table(self._lib.hf_session_curve, d, arr, len(offs))
        out = {}
        for j, name in enumerate(names):
            col = [r[j] for r in rows]
            out[name] = np.array(col, dtype=str if is_text[j] else float)
        return out

    def balance(self, load=None):
        """Mean equilibrium of the load cases (all, one name or a list of
        names), intact and with each line broken, at every still water level
        of the case (site.water_levels, else the one level): one dict per
        level, load case and condition with the `balance` CSV's columns.  A condition without
        equilibrium is a row whose status says so (values None) and gives a
        HoldfastWarning."""
        names = [] if load is None else [load] if isinstance(load, str) else list(load)
        arr = (ctypes.c_char_p * max(len(names), 1))(*[_bytes(n, "load") for n in names])
        cols, _, rows = self._table(self._lib.hf_session_balance, arr, len(names))
        return [dict(zip(cols, r)) for r in rows]
