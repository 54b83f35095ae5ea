"""Finding and describing libholdfast.so.1 for ctypes (internal).

The package binds the C library through ctypes, so it needs no compiler and
no build step of its own: only the system python3 (and numpy for the array
results).  The library is looked for, in order:

1. the file named by the environment variable HOLDFAST_LIBRARY;
2. the repository's build/ directory beside this package
   (python/holdfast/../../build/libholdfast.so.1), so that after `make` a
   checkout works with PYTHONPATH=python and nothing installed;
3. the system: ctypes.util.find_library("holdfast"), then the soname
   "libholdfast.so.1" through the dynamic loader's usual search
   (LD_LIBRARY_PATH, the ld.so cache; `make install` puts it there).
"""

import ctypes
import ctypes.util
import os

SONAME = "libholdfast.so.1"

# hf_status (include/holdfast/status.h) and hf_dim (units.h) values used here.
HF_OK = 0
HF_EINVAL = 2
HF_ENOMEM = 3
HF_EIO = 4
HF_ELIMIT = 9
HF_DIM_ANGLE = 7
HF_ERROR_TEXT = 1024


class Error(ctypes.Structure):
    """hf_error (status.h): a status and its message."""
    _fields_ = [("status", ctypes.c_int), ("text", ctypes.c_char * HF_ERROR_TEXT)]

_lib = None


def _candidates():
    env = os.environ.get("HOLDFAST_LIBRARY")
    if env:
        yield env
        return
    here = os.path.dirname(os.path.abspath(__file__))
    build = os.path.normpath(os.path.join(here, "..", "..", "build"))
    for name in (SONAME, "libholdfast.so"):
        path = os.path.join(build, name)
        if os.path.exists(path):
            yield path
    found = ctypes.util.find_library("holdfast")
    if found:
        yield found
    yield SONAME


def _declare(lib):
    """Argument and result types of every function the package calls."""
    c_double_p = ctypes.POINTER(ctypes.c_double)
    S, T = ctypes.c_void_p, ctypes.c_void_p  # hf_session *, hf_session_table *
    T_out = ctypes.POINTER(ctypes.c_void_p)
    size, status, text = ctypes.c_size_t, ctypes.c_int, ctypes.c_char_p
    sigs = {
        "hf_session_alloc": (S, []),
        "hf_session_free": (None, [S]),
        "hf_session_message": (text, [S]),
        "hf_session_warnings": (text, [S]),
        "hf_session_load_file": (status, [S, text]),
        "hf_session_load_string": (status, [S, text, size, text]),
        "hf_session_nlines": (size, [S]),
        "hf_session_nloads": (size, [S]),
        "hf_session_line_name": (text, [S, size]),
        "hf_session_load_name": (text, [S, size]),
        "hf_session_get": (status, [S, text, c_double_p]),
        "hf_session_set": (status, [S, text, ctypes.c_double]),
        "hf_session_set_text": (status, [S, text, text]),
        "hf_session_lines": (status, [S, c_double_p, T_out]),
        "hf_session_stiffness": (status, [S, c_double_p, T_out]),
        "hf_session_curve": (status, [S, ctypes.c_double, c_double_p, size, T_out]),
        "hf_session_balance": (status, [S, ctypes.POINTER(text), size, T_out]),
        "hf_session_table_free": (None, [T]),
        "hf_session_table_rows": (size, [T]),
        "hf_session_table_columns": (size, [T]),
        "hf_session_table_column": (text, [T, size]),
        "hf_session_table_is_text": (ctypes.c_int, [T, size]),
        "hf_session_table_scale": (ctypes.c_double, [T, size]),
        "hf_session_table_values": (c_double_p, [T]),
        "hf_session_table_is_empty": (ctypes.c_int, [T, size, size]),
        "hf_session_table_text": (text, [T, size, size]),
        "hf_units_parse": (status, [text, ctypes.c_int, c_double_p, ctypes.POINTER(Error)]),
        "hf_status_str": (text, [status]),
    }
    for name, (res, args) in sigs.items():
        fn = getattr(lib, name)
        fn.restype = res
        fn.argtypes = args
    return lib


def library():
    """The loaded library (loaded on first use).  Raises OSError naming
    every place that was tried when none works."""
    global _lib
    if _lib is not None:
        return _lib
    tried = []
    for path in _candidates():
        try:
            lib = ctypes.CDLL(path)
            getattr(lib, "hf_session_alloc")
        except (OSError, AttributeError) as e:
            tried.append("%s (%s)" % (path, e))
            continue
        _lib = _declare(lib)
        _lib.holdfast_path = path
        return _lib
    raise OSError(
        "holdfast: cannot load the holdfast C library; tried: " + "; ".join(tried)
        + ". Build it with `make` in the repository, install it with `make install`, "
        "or set HOLDFAST_LIBRARY to the path of libholdfast.so.1")


def library_path():
    """Path (or soname) of the library in use."""
    return library().holdfast_path
