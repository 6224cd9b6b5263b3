#!/usr/bin/env bash
# Peak memory of a large scan: the full table t = 6..30, moduli <= 24
# (2 250 000 pairs), measured with GNU time's maximum resident set size.
# The scan's memory must not grow with the number of jobs (README "Memory");
# the target is a peak below 500 MB. Takes about 4 minutes of CPU per core
# on 2 cores (8.5 min wall on a loaded machine); writes a 1.2 GB database.
#   bench/bench_scan_memory.sh [build-dir] [out-dir] [extra scan options, e.g. --verify]
set -euo pipefail
build=${1:-build}
out=${2:-$(mktemp -d /tmp/circlet-scan-memory.XXXXXX)}
shift $(( $# > 2 ? 2 : $# ))
[ -x /usr/bin/time ] || { echo "bench_scan_memory: needs GNU time (Debian package time)" >&2; exit 2; }
rm -rf "$out/scan"
/usr/bin/time -v "$build/circlet" scan --t 6..30 --modulus 24 --no-csv "$@" -o "$out/scan" \
  > "$out/stdout.txt" 2> "$out/time.txt"
rss_kb=$(awk -F: '/Maximum resident set size/ { gsub(/ /, "", $2); print $2 }' "$out/time.txt")
wall=$(awk -F': ' '/Elapsed \(wall clock\)/ { print $2 }' "$out/time.txt")
user=$(awk -F': ' '/User time/ { print $2 }' "$out/time.txt")
echo "scan t = 6..30, M = 24 $*: wall $wall, user ${user} s, peak RSS $((rss_kb / 1024)) MB"
sed -n '2,6p' "$out/scan/summary.txt"
if [ "$rss_kb" -ge $((500 * 1024)) ]; then
  echo "bench_scan_memory: peak RSS above 500 MB" >&2
  exit 1
fi
