#!/bin/sh
# Renders a holdfast report.html (or any .html/.svg file) to a PNG with
# headless Chromium, so a person can look at it.  Not used in CI.
#
#   scripts/render-report.sh REPORT.html [OUT.png] [WIDTH,HEIGHT]
#
# OUT.png defaults to the input name with .png; the window defaults to
# 1200,3000 pixels (the whole report is captured down to that height).
# Installs Debian's `chromium` package with apt-get when it is missing and
# this runs as root; otherwise says what to install.  Chromium runs with a
# throw-away profile and with its background network features off; the
# report itself fetches nothing (no scripts, no external resources).
# SPDX-License-Identifier: GPL-3.0-or-later
set -eu

usage() {
    echo "usage: $0 REPORT.html [OUT.png] [WIDTH,HEIGHT]" >&2
    exit 2
}
[ $# -ge 1 ] && [ $# -le 3 ] || usage
in=$1
[ -f "$in" ] || { echo "$0: no such file: $in" >&2; exit 2; }
out=${2:-${in%.*}.png}
size=${3:-1200,3000}
case $size in
    *[!0-9,]* | ,* | *, | *,*,*) echo "$0: size must be WIDTH,HEIGHT, got '$size'" >&2; exit 2 ;;
    *,*) ;;
    *) echo "$0: size must be WIDTH,HEIGHT, got '$size'" >&2; exit 2 ;;
esac

browser=""
for b in chromium chromium-browser; do
    if command -v "$b" >/dev/null 2>&1; then browser=$b; break; fi
done
if [ -z "$browser" ]; then
    if [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null 2>&1; then
        echo "$0: installing chromium with apt-get" >&2
        DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >&2 || {
            apt-get update -qq >&2 && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >&2; }
        browser=chromium
    else
        echo "$0: chromium not found; install it with: sudo apt-get install chromium" >&2
        exit 1
    fi
fi

# Absolute file:// URL of the input.
case $in in
    /*) abs=$in ;;
    *) abs=$(pwd)/$in ;;
esac
case $out in
    /*) absout=$out ;;
    *) absout=$(pwd)/$out ;;
esac

profile=$(mktemp -d)
trap 'rm -rf "$profile"' EXIT INT TERM HUP
rm -f "$absout"
"$browser" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
    --disable-background-networking --disable-component-update --disable-sync \
    --disable-extensions --hide-scrollbars --user-data-dir="$profile" \
    --screenshot="$absout" --window-size="$size" "file://$abs" >/dev/null 2>"$profile/log" || {
    cat "$profile/log" >&2
    echo "$0: chromium failed" >&2
    exit 1
}
[ -s "$absout" ] || { cat "$profile/log" >&2; echo "$0: no screenshot written" >&2; exit 1; }
echo "$absout"
