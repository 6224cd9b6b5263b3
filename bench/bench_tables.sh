#!/usr/bin/env bash
# Times main-term tables and remainders (issue targets: remainder linear in the
# rows, 10^5 rows of a half-integral family in seconds). Run on purpose:
#   bench/bench_tables.sh [BUILD_DIR]          (default: build)
# Each line: wall and user seconds (user counts both threads).
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${1:-$here/build}"
circlet="$build/circlet"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT
echo "# $(date -u +%Y-%m-%dT%H:%M:%SZ) $(nproc) cores, load average: $(cut -d' ' -f1-3 /proc/loadavg)"
measure() {
  local label="$1"; shift
  /usr/bin/time -f "%e %U" -o "$work/time" "$@" >"$work/out" 2>"$work/err"
  read -r wall user <"$work/time"
  printf "%-48s wall %8.2f s   user %8.2f s\n" "$label" "$wall" "$user"
}
measure "circlet main c6 --to 100000 (exact rows)"     "$circlet" main c6 --to 100000 -o "$work/a.csv"
measure "circlet main c10 --to 20000"                  "$circlet" main c10 --to 20000 -o "$work/b.csv"
measure "circlet remainder c10 --to 2000"              "$circlet" remainder c10 --to 2000 -q -o "$work/c.csv"
measure "circlet remainder c10 --to 20000"             "$circlet" remainder c10 --to 20000 -q -o "$work/d.csv"
measure "circlet remainder c6 --to 100000 (w = 5/2)"   "$circlet" remainder c6 --to 100000 -q -o "$work/e.csv"
measure "circlet remainder c4 --to 100000 (w = 3/2)"   "$circlet" remainder c4 --to 100000 -q -o "$work/f.csv"
grep -c "+/-" "$work/a.csv" >/dev/null && echo "note: main c6 table has ball rows" || echo "main c6 table: every row exact"
