#!/bin/sh
# Benchmark of the full scan: c_t vs sc_{2t-1} for t = 6..12 and all progression
# pairs with A, A2 <= 12 (42 588 pairs). Target: under 10 minutes on a 2-core machine.
# Usage: bench/bench_scan.sh [path/to/circlet] [output dir]
set -eu
CIRCLET=${1:-build/circlet}
OUT=${2:-/tmp/circlet_bench_scan}
rm -rf "$OUT"
start=$(date +%s.%N)
"$CIRCLET" scan --t 6..12 --modulus 12 -o "$OUT"
end=$(date +%s.%N)
pairs=$(($(wc -l < "$OUT/scan.csv") - 2))
awk -v s="$start" -v e="$end" -v p="$pairs" 'BEGIN { printf "pairs %d  seconds %.1f  pairs/second %.0f\n", p, e - s, p / (e - s) }'
sed -n '3,20p' "$OUT/summary.txt"
