#!/bin/sh
# python-tests.sh - the Python package's unittest suite (python/tests), run by
# make check when python/tests exists:
#
#     PYTHONPATH=python $PYTHON -m unittest discover -s python/tests -v
#
# PYTHON is the system interpreter (/usr/bin/python3: Debian's python3-numpy
# belongs to it; a python3 earlier on PATH may lack numpy).  HOLDFAST_LIBRARY
# names this build's libholdfast.so.1 (HF_BUILD), so a BUILD=dir build tests
# its own library.  In a sanitizer build the instrumented library can only be
# loaded into python3 with the sanitizer runtimes preloaded (HF_SANITIZE
# names them; leak detection is off: the interpreter keeps memory at exit by
# design).  Exit status: unittest's (0 all passed).
set -u
root=${HF_ROOT:-$(cd "$(dirname "$0")/.." && pwd)}
python=${PYTHON:-/usr/bin/python3}
cd "$root" || exit 1
[ -d python/tests ] || { echo "python-tests: no python/tests"; exit 1; }
command -v "$python" >/dev/null 2>&1 || { echo "python-tests: $python not found (apt-get install python3 python3-numpy)"; exit 1; }
build=${HF_BUILD:-build}
case $build in /*) ;; *) build=$root/$build ;; esac
HOLDFAST_LIBRARY=$build/libholdfast.so.1
export HOLDFAST_LIBRARY
[ -f "$HOLDFAST_LIBRARY" ] || { echo "python-tests: $HOLDFAST_LIBRARY not built"; exit 1; }
if [ -n "${HF_SANITIZE:-}" ]; then
    pre=""
    for rt in $(echo "$HF_SANITIZE" | tr ',' ' '); do
        case $rt in address) n=libasan.so ;; undefined) n=libubsan.so ;; *) continue ;; esac
        p=$(${HF_CC:-cc} -print-file-name=$n)
        [ -f "$p" ] || { echo "python-tests: no $n for the sanitizer build"; exit 1; }
        pre="$pre${pre:+ }$p"
    done
    LD_PRELOAD=$pre
    ASAN_OPTIONS="${ASAN_OPTIONS:-}${ASAN_OPTIONS:+:}detect_leaks=0"
    export LD_PRELOAD ASAN_OPTIONS
fi
PYTHONPATH=python${PYTHONPATH:+:$PYTHONPATH} exec "$python" -m unittest discover -s python/tests -v
