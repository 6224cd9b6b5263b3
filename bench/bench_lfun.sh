#!/usr/bin/env bash
# Times the large-n main terms of the half-integral weights against PARI/GP in the
# same run (issue targets: `main c6 --at 10^12 --digits 30` under a second; weight
# 3/2 exact at 10^12). Run on purpose, on a quiet machine:
#   bench/bench_lfun.sh [BUILD_DIR]            (default: build)
# PARI/GP: lfun(lfuncreate(d), 2) at realprecision 40 for the same character
# (d = 72000000000105 is the character of c6 at n = 10^12, `main c6 --explain`),
# and qfbhclassno(32n + 20)/2 for c4. Weight 7/2 and 9/2 (theta route, exact):
# c8 at n = 10^9, 10^10, 10^11 and c10 at 10^10 against lfun(lfuncreate(d), k) at
# realprecision 45 for the characters `main --explain` prints. Each line: wall and user seconds.
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
  printf "%-52s wall %8.2f s   user %8.2f s\n" "$label" "$wall" "$user"
  echo "$wall" >"$work/last_wall"
}

measure "circlet main c6 --at 10^12 --digits 30" "$circlet" main c6 --at 1000000000000 --digits 30
ours=$(cat "$work/last_wall")
grep -q "exact rational" "$work/out" || { echo "c6 at 10^12 not exact"; exit 1; }
measure "circlet main c6 --at 10^10 --digits 30" "$circlet" main c6 --at 10000000000 --digits 30
measure "circlet main c4 --at 10^12" "$circlet" main c4 --at 1000000000000
measure "circlet main sc7 --at 10^12" "$circlet" main sc7 --at 1000000000000
measure "circlet main c4 --at 10^14" "$circlet" main c4 --at 100000000000000

theta=()
for spec in "c8 1000000000 -32000000084 3" "c8 10000000000 -320000000084 3" "c8 100000000000 -3200000000084 3" \
            "c10 10000000000 80000000033 4"; do
  read -r fam n d k <<<"$spec"
  measure "circlet main $fam --at $n (theta route)" "$circlet" main "$fam" --at "$n" --explain
  grep -q "exact rational" "$work/out" || { echo "$fam at $n not exact"; exit 1; }
  grep -q "Kronecker symbol ($d/.)" "$work/out" || { echo "$fam at $n: character is not ($d/.)"; exit 1; }
  theta+=("$(cat "$work/last_wall") $d $k")
done

if command -v gp >/dev/null 2>&1; then
  for entry in "${theta[@]}"; do
    read -r t d k <<<"$entry"
    printf 'default(realprecision,45);\nprint(lfun(lfuncreate(%s),%s));\n' "$d" "$k" >"$work/t.gp"
    measure "gp: lfun(lfuncreate($d), $k), 45 digits" gp -q "$work/t.gp"
    awk -v a="$t" -v b="$(cat "$work/last_wall")" 'BEGIN { printf "ratio circlet (exact) / PARI lfun (45 digits): %.1f\n", a / b }'
  done
  printf 'default(realprecision,40);\nprint(lfun(lfuncreate(72000000000105),2));\n' >"$work/l.gp"
  measure "gp: lfun(lfuncreate(72000000000105), 2), 40 digits" gp -q "$work/l.gp"
  pari=$(cat "$work/last_wall")
  awk -v a="$ours" -v b="$pari" 'BEGIN { printf "ratio PARI lfun / circlet main c6 --at 10^12: %.1f\n", b / a }'
  printf 'n=10^12;\nprint(qfbhclassno(32*n+20)/2);\n' >"$work/h.gp"
  measure "gp: qfbhclassno(32*10^12+20)/2" gp -q "$work/h.gp"
else
  echo "gp not on PATH: no PARI/GP comparison"
fi
