#!/bin/sh
# CI check of the Slurm route: start a one-node Slurm (scripts/slurm-local.sh),
# run a small scan as a 4-task array plus merge (scripts/slurm-scan.sh), run
# the same scan unsharded, and compare every row of the two databases and the
# two CSV exports; then check that a merge after a failed array task is
# cancelled (not left pending). The daemons are stopped on every exit.
# Exit status non-zero on any difference or failure.
#   scripts/slurm-ci.sh [path/to/circlet]
set -eu
here=$(cd "$(dirname "$0")" && pwd)
circlet=${1:-${CIRCLET:-$here/../build/circlet}}
case "$circlet" in /*) ;; *) circlet="$(pwd)/$circlet" ;; esac
work=$(mktemp -d /tmp/circlet-slurm-ci.XXXXXX)
cleanup() {
  "$here/slurm-local.sh" stop "$work/slurm" || true
  rm -rf "$work"
}
trap cleanup EXIT
trap 'exit 1' INT TERM

"$here/slurm-local.sh" start "$work/slurm"
export SLURM_CONF="$work/slurm/etc/slurm.conf"

scan="--t 5..7 --modulus 3 --compare-to 200"
start=$(date +%s.%N)
# shellcheck disable=SC2086
"$here/slurm-scan.sh" -k 4 -o "$work/array" --circlet "$circlet" -- $scan >"$work/array-summary.txt"
end=$(date +%s.%N)
awk -v s="$start" -v e="$end" 'BEGIN { printf "slurm-ci: 4-task array plus merge in %.1f s\n", e - s }'
# shellcheck disable=SC2086
"$circlet" scan $scan -o "$work/single" 2>/dev/null

/usr/bin/python3 - "$work/array/merged/scan.db" "$work/single/scan.db" <<'PY'
import sqlite3, sys
def rows(path):
    con = sqlite3.connect("file:%s?mode=ro" % path, uri=True)
    return con.execute("SELECT * FROM pairs ORDER BY job").fetchall()
a, b = rows(sys.argv[1]), rows(sys.argv[2])
if a != b:
    diff = [x for x, y in zip(a, b) if x != y][:3]
    sys.exit("slurm-ci: the merged database differs from the unsharded run (%d vs %d rows; first differences %r)" % (len(a), len(b), diff))
print("slurm-ci: merged database equals the unsharded run (%d rows)" % len(a))
PY
tail -n +2 "$work/array/merged/scan.csv" >"$work/a.csv"
tail -n +2 "$work/single/scan.csv" >"$work/b.csv"
cmp -s "$work/a.csv" "$work/b.csv" || { echo "slurm-ci: the merged scan.csv differs from the unsharded run" >&2; exit 1; }
echo "slurm-ci: merged scan.csv equals the unsharded run"

# A failing array task: the merge must end (cancelled as an invalid dependency), and the script must fail.
if "$here/slurm-scan.sh" -k 2 -o "$work/failing" --circlet "$circlet" -- --t 6..7 --modulus 0 >/dev/null 2>"$work/failing.err"; then
  echo "slurm-ci: a scan with failing tasks was reported as a success" >&2
  exit 1
fi
grep -q "the merge job .* ended" "$work/failing.err" || { cat "$work/failing.err" >&2; exit 1; }
echo "slurm-ci: a failed array task cancels the merge ($(grep -o 'ended [A-Z_]*' "$work/failing.err"))"
