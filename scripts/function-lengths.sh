#!/bin/sh
# Lists the functions of src/*.c longer than a limit (default 100 lines,
# the rule of DEVELOPERS.md) and fails if there is any.
#
#   scripts/function-lengths.sh [--limit N] [--top K] [FILE.c ...]
#
# A function's length runs from the line of its name to the line of its
# closing brace, both included, as universal-ctags reports them (fields %n
# and %e).  --top K also prints the K longest functions, over the limit or
# not.  Output: one "LINES NAME FILE:LINE" per offender, longest first, then
# "function-lengths: N over L lines among F functions in M files".
# Exit 0 when none is over, 1 when some are, 2 when the tool cannot run.
set -u
limit=100
top=0
while [ $# -gt 0 ]; do
    case $1 in
    --limit) limit=${2:-}; shift 2 ;;
    --top) top=${2:-}; shift 2 ;;
    --) shift; break ;;
    -*) echo "function-lengths: unknown option $1 (expected --limit N, --top K)" >&2; exit 2 ;;
    *) break ;;
    esac
done
case $limit$top in *[!0-9]*|'') echo "function-lengths: --limit and --top take whole numbers" >&2; exit 2 ;; esac
cd "$(dirname "$0")/.." || exit 2
[ $# -eq 0 ] && set -- src/*.c
if ! ctags --version 2>/dev/null | grep -q 'Universal Ctags'; then
    echo "function-lengths: needs universal-ctags (apt-get install universal-ctags)" >&2
    exit 2
fi
table=$(ctags -x --c-kinds=f --_xformat='%n %e %N %F' "$@") || {
    echo "function-lengths: ctags failed" >&2; exit 2; }
# An end line ctags could not find ("-") is an error, not a short function.
printf '%s\n' "$table" | awk -v limit="$limit" -v top="$top" -v files="$#" '
    NF == 0 { next }
    $2 !~ /^[0-9]+$/ { printf "function-lengths: no end line for %s (%s:%s)\n", $3, $4, $1; bad = 1; next }
    { n = $2 - $1 + 1; all++; len[all] = n; name[all] = $3 " " $4 ":" $1
      if (n > limit) over++ }
    END {
        # insertion sort, longest first (a few hundred functions)
        for (i = 2; i <= all; i++) { k = len[i]; s = name[i]; j = i - 1
            while (j >= 1 && len[j] < k) { len[j + 1] = len[j]; name[j + 1] = name[j]; j-- }
            len[j + 1] = k; name[j + 1] = s }
        for (i = 1; i <= all; i++)
            if (len[i] > limit || i <= top)
                printf "%5d %s%s\n", len[i], name[i], (len[i] > limit ? "" : "  (within the limit)")
        printf "function-lengths: %d over %d lines among %d functions in %d files\n", over, limit, all, files
        exit (bad ? 2 : over ? 1 : 0)
    }'
