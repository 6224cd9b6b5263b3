#!/usr/bin/env bash
# Times `circlet count` on the README's performance targets and PARI/GP on the
# same eta-quotient series, in one run. Run it once, on a quiet machine:
#   bench/count_vs_pari.sh [BUILD_DIR]        (default: build)
# CIRCLET_BENCH_NO_BUILD=1 skips the build step (use the binaries as they are).
# Prints one line per measurement: wall seconds, user seconds, peak RSS (MB).
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${1:-$here/build}"
if [ -z "${CIRCLET_BENCH_NO_BUILD:-}" ]; then
  cmake --build "$build" --target circlet benchmarks -j2 >/dev/null
fi
circlet="$build/circlet"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT

echo "# $(date -u +%Y-%m-%dT%H:%M:%SZ) $(nproc) cores, load average: $(cut -d' ' -f1-3 /proc/loadavg)"
echo "# $("$circlet" --version)"

# measure LABEL CMD...: wall/user seconds and peak resident memory of CMD (GNU time -v).
measure() {
  local label="$1"; shift
  /usr/bin/time -v -o "$work/time" "$@" >"$work/out" 2>"$work/err"
  local wall user rss
  wall=$(awk -F': ' '/Elapsed \(wall clock\)/ {n=split($2,a,":"); s=0; for(i=1;i<=n;i++) s=s*60+a[i]; print s}' "$work/time")
  user=$(awk -F': ' '/User time/ {print $2}' "$work/time")
  rss=$(awk -F': ' '/Maximum resident set size/ {printf "%.0f", $2/1024}' "$work/time")
  printf "%-34s wall %8.2f s   user %8.2f s   peak %6s MB\n" "$label" "$wall" "$user" "$rss"
  echo "$wall" >"$work/last_wall"
}

# Targets (README "Performance"): c7 to 1e6 < 3 s, to 1e7 < 20 s (peak < 2 GB), c30 to 1e6 < 15 s.
measure "circlet count c7 --to 1000000"   "$circlet" count c7 --to 1000000 -o "$work/c7_1e6.csv"
measure "circlet count c7 --to 10000000"  "$circlet" count c7 --to 10000000 -o "$work/c7_1e7.csv"
measure "circlet count c30 --to 1000000"  "$circlet" count c30 --to 1000000 -o "$work/c30_1e6.csv"

# Stage breakdown (plan, series mod p, CRT, decimal text) of the engine alone.
"$build/bench_count" c7 1000000
"$build/bench_count" c30 1000000

# PARI/GP on the same series Π(1 − q^{7k})^7 / Π(1 − q^k), series computation only.
if command -v gp >/dev/null 2>&1; then
  for N in 100000 300000; do
    cat >"$work/c7.gp" <<GP
default(parisizemax, 8000000000);
N = $N;
s = eta(x^7 + O(x^(N+1)))^7 / eta(x + O(x^(N+1)));
print(polcoeff(s, N));
quit;
GP
    measure "gp: eta quotient c7 to $N" gp -q "$work/c7.gp"
    pari_wall=$(cat "$work/last_wall")
    pari_value=$(grep -v Warning "$work/out" | tail -1)
    measure "circlet count c7 --to $N" "$circlet" count c7 --to "$N" -o "$work/c7_$N.csv"
    ours_wall=$(cat "$work/last_wall")
    ours_value=$(tail -1 "$work/c7_$N.csv" | cut -d, -f2)
    [ "$pari_value" = "$ours_value" ] && agree=yes || agree="NO ($pari_value vs $ours_value)"
    awk -v p="$pari_wall" -v o="$ours_wall" -v n="$N" -v a="$agree" \
      'BEGIN { printf "ratio at N = %d: PARI/GP wall / circlet wall = %.1f  (c7(N) agrees: %s)\n", n, p / (o > 0.01 ? o : 0.01), a }'
  done
else
  echo "WARN: gp not found on PATH; PARI/GP comparison skipped"
fi
