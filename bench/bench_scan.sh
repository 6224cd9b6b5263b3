#!/bin/sh
# Benchmark of the scan: c_t vs sc_{2t-1} for t = 6..12 and all progression
# pairs with A, A2 <= 12 (42 588 pairs), in the same run:
#   1. the previous version (JSONL checkpoint, one thread), if given or buildable;
#   2. this version (SQLite results database) on 1 worker thread;
#   3. this version on 2 worker threads;
#   4. this version with --verify on 1 and on 2 threads (CPU / wall shows the use of both cores).
# For each: wall seconds, CPU seconds (user + sys), peak RSS, pairs per second.
# Run it on an otherwise idle machine (it keeps both cores busy for a few minutes).
#
# Usage: bench/bench_scan.sh [path/to/circlet] [path/to/jsonl-circlet | -] [output dir]
#   The JSONL binary defaults to a build of git ref $CIRCLET_JSONL_REF (default
#   6b1b81d, the last version with the JSONL checkpoint) in a temporary worktree;
#   "-" skips it.
set -eu
CIRCLET=${1:-build/circlet}
OLD=${2:-}
OUT=${3:-/tmp/circlet_bench_scan}
ARGS="--t 6..12 --modulus 12"
rm -rf "$OUT"
mkdir -p "$OUT"

if [ -z "$OLD" ]; then
  ref=${CIRCLET_JSONL_REF:-6b1b81d}
  src="$OUT/jsonl-src"
  echo "building the JSONL version ($ref) in $src ..." >&2
  git worktree add --detach "$src" "$ref" >/dev/null 2>&1
  cmake -S "$src" -B "$src/build" -DCMAKE_BUILD_TYPE=Release >/dev/null
  cmake --build "$src/build" -j2 --target circlet >/dev/null
  cp "$src/build/circlet" "$OUT/circlet-jsonl"
  git worktree remove --force "$src"
  OLD="$OUT/circlet-jsonl"
fi

# run LABEL DIR PROGRAM ARGS...: one timed run; prints one line of figures.
run() {
  label=$1
  dir=$2
  shift 2
  /usr/bin/time -f "%e %U %S %M" -o "$OUT/time.txt" "$@" -o "$dir" 2>"$OUT/stderr.txt" >/dev/null ||
    { cat "$OUT/stderr.txt" >&2; exit 1; }
  if [ -f "$dir/scan.db" ]; then
    pairs=$(/usr/bin/python3 -c "import sqlite3,sys; print(sqlite3.connect(sys.argv[1]).execute('select count(*) from pairs').fetchone()[0])" "$dir/scan.db")
  else
    pairs=$(($(wc -l <"$dir/checkpoint.jsonl") - 1))
  fi
  read -r wall user sys rss <"$OUT/time.txt"
  awk -v l="$label" -v w="$wall" -v u="$user" -v s="$sys" -v r="$rss" -v p="$pairs" 'BEGIN {
    printf "%-34s pairs %6d  wall %6.1f s  cpu %6.1f s  cpu/wall %4.2f  peak RSS %5.0f MB  pairs/s %6.0f\n",
           l, p, w, u + s, (u + s) / w, r / 1024, p / w }'
}

echo "scan $ARGS on $(nproc) cores, $(date -u +%Y-%m-%dT%H:%M:%SZ), $($CIRCLET --version)"
[ "$OLD" = "-" ] || run "JSONL checkpoint (previous version)" "$OUT/jsonl" "$OLD" scan $ARGS
run "SQLite database, 1 thread" "$OUT/db1" "$CIRCLET" scan $ARGS --threads 1
run "SQLite database, 2 threads" "$OUT/db2" "$CIRCLET" scan $ARGS --threads 2
run "SQLite, --verify, 1 thread" "$OUT/v1" "$CIRCLET" scan $ARGS --verify --threads 1
run "SQLite, --verify, 2 threads" "$OUT/v2" "$CIRCLET" scan $ARGS --verify --threads 2
if [ "$OLD" != "-" ]; then
  # Same verdicts in both versions.
  /usr/bin/python3 - "$OUT/jsonl/scan.json" "$OUT/db1/scan.db" <<'PY'
import json, sqlite3, sys
old = {r["job"]: r["verdict"] for r in json.load(open(sys.argv[1]))["rows"]}
new = dict(sqlite3.connect(sys.argv[2]).execute("select job, verdict from pairs"))
diff = [j for j in old if old[j] != new.get(j)]
print("verdicts: %d pairs, %d differ between the JSONL and the SQLite version" % (len(old), len(diff)))
PY
fi
sed -n '3,12p' "$OUT/db2/summary.txt"
