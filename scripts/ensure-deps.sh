#!/bin/sh
# Checks that the build's packages are present.  As root on Debian it installs
# the missing ones; otherwise it names exactly what to install and fails.
# Besides the compiler and the libraries: binutils (nm, readelf: the shared
# library's tests) and, once the repository has its Python package
# (python/), the system Python with numpy ($PYTHON, default /usr/bin/python3:
# Debian's python3-numpy belongs to it) for make check's Python tests.
set -u
python=${PYTHON:-/usr/bin/python3}
need=""
have_pc() { pkg-config --exists "$1" 2>/dev/null; }
command -v pkg-config >/dev/null 2>&1 || need="$need pkg-config"
command -v cc >/dev/null 2>&1 || need="$need gcc"
command -v make >/dev/null 2>&1 || need="$need make"
have_pc gsl || need="$need libgsl-dev"
have_pc yaml-0.1 || need="$need libyaml-dev"
have_pc cmocka || need="$need libcmocka-dev"
{ command -v nm && command -v readelf; } >/dev/null 2>&1 || need="$need binutils"
if [ -d python ]; then
    if ! [ -x "$python" ]; then
        need="$need python3 python3-numpy"
    elif ! "$python" -c 'import numpy' >/dev/null 2>&1; then
        need="$need python3-numpy"
    fi
fi
[ -z "$need" ] && exit 0
if [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null 2>&1; then
    echo "holdfast: installing missing packages:$need" >&2
    export DEBIAN_FRONTEND=noninteractive
    { apt-get update -qq && apt-get install -y -qq $need; } >&2 || {
        echo "holdfast: apt-get failed; install by hand: apt-get install$need" >&2; exit 1; }
    exit 0
fi
echo "holdfast: missing packages; install them with: sudo apt-get install$need" >&2
exit 1
