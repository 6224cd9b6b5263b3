#!/usr/bin/env bash
# The default main job (README's first command): set up, build, then compute
# and write under results/default/, every file with its provenance (program
# version, command line, date):
#   counts      c7_counts.csv, sc13_counts.csv            (circlet count)
#   scan        scan/ (scan.db, summary.txt, summary.json, scan.csv)  (circlet scan, t = 6..8, modulus 4)
#   certificates cert_*.json, each re-checked by circlet verify
#   tables      ratio_*.csv, remainder_*.csv, arcs_*.csv, main_*.json
#   plots       ratio_*.png, remainder_*.png, relerr_*.png, arcs_*.png, scan_heatmap.png (scripts/plot.py; caption = provenance)
#   JOB.txt     what ran, when, with which binary
# A step whose command is not in this build is skipped with a message; a
# command that fails stops the job. Finishes in well under a minute after the build.
# Usage: scripts/run-default.sh [OUTDIR]   (default results/default)
# Environment: CIRCLET=BINARY with CIRCLET_NO_SETUP=1 runs the job with an
# existing binary and no set-up step (for developers with their own build dir).
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
if [ "${CIRCLET_NO_SETUP:-0}" != 1 ]; then
  "$here/scripts/setup.sh"
fi
out="${1:-$here/results/default}"
mkdir -p "$out"
circlet="${CIRCLET:-$here/build/circlet}"
python=/usr/bin/python3
plot=("$python" "$here/scripts/plot.py")
start=$(date +%s)
job="$out/JOB.txt"
{
  echo "circlet default job"
  echo "version: $("$circlet" --version)"
  echo "date:    $(date -u +%Y-%m-%dT%H:%M:%SZ)"
  echo "binary:  ${circlet#$here/}"
  echo "commands (run from ${out#$here/}):"
} >"$job"

have() { "$circlet" --help 2>/dev/null | grep -qE "^  $1 "; }
step() { echo "default job: $*" >&2; }
run() {  # run a circlet command from inside $out, recording it
  echo "  circlet $*" >>"$job"
  (cd "$out" && "$circlet" "$@")
}
have_plots=1
if ! "$python" -c 'import matplotlib' 2>/dev/null; then
  have_plots=0
  step "python3-matplotlib is missing: the plots are skipped (scripts/setup.sh installs it)"
fi
plot_to() {  # plot_to KIND INPUT PNG [extra...]
  local kind="$1" input="$2" png="$3"
  shift 3
  if [ "$have_plots" = 1 ]; then
    echo "  scripts/plot.py $kind $input $* -o $png" >>"$job"
    (cd "$out" && "${plot[@]}" "$kind" "$input" "$@" -o "$png" >/dev/null)
  fi
}

# 1. Exact counts.
step "exact counts c7, sc13 for n <= 10000"
run count c7 --to 10000 -o c7_counts.csv
run count sc13 --to 10000 -o sc13_counts.csv

# 2. The scan: every progression pair with A, A2 <= 4, t = 6..8.
if have scan; then
  step "scan t = 6..8, modulus 4"
  rm -rf "$out/scan"
  run scan --t 6..8 --modulus 4 -o scan
else
  step "'circlet scan' is not in this build: scan skipped"
fi

# 3. Certificates for a few pairs (c_t against sc_{2t-1}), each verified.
pairs=("c6 sc11 1,0 1,0" "c7 sc13 2,1 1,0" "c8 sc15 1,0 2,1")
if have certify; then
  for p in "${pairs[@]}"; do
    read -r F G ap ap2 <<<"$p"
    name="cert_${F}_${ap/,/_}__${G}_${ap2/,/_}.json"
    step "certificate $F($ap) vs $G($ap2) -> $name"
    run certify "$F" "$G" --ap "$ap" --ap2 "$ap2" -o "$name"
    if have verify; then
      if run verify "$name" >"$out/${name%.json}.verify.txt" 2>&1; then
        step "  verified"
      else
        step "  WARNING: circlet verify rejected $name (see ${name%.json}.verify.txt)"
      fi
    fi
  done
else
  step "'circlet certify' is not in this build: certificates skipped"
fi

# 4. The standard plots.
# Ratio: c6(n)/sc11(n), n = 0..200, with the certificate's bands.
if have ratio; then
  step "ratio c6/sc11 and its plot"
  run ratio c6 sc11 --ap 1,0 --ap2 1,0 --to 200 -o ratio_c6_sc11.csv >/dev/null
  cert=()
  [ -f "$out/cert_c6_1_0__sc11_1_0.json" ] && cert=(--cert cert_c6_1_0__sc11_1_0.json)
  plot_to ratio ratio_c6_sc11.csv ratio_c6_sc11.png "${cert[@]}"
else
  step "'circlet ratio' is not in this build: ratio plot from exact counts (circlet count --ap)"
  run count c6 --ap 1,0 --to 200 -o ratio_c6_counts.csv
  run count sc11 --ap 1,0 --to 200 -o ratio_sc11_counts.csv
  cert=()
  [ -f "$out/cert_c6_1_0__sc11_1_0.json" ] && cert=(--cert cert_c6_1_0__sc11_1_0.json)
  plot_to ratio ratio_c6_counts.csv ratio_c6_sc11.png --over ratio_sc11_counts.csv "${cert[@]}"
fi

# Remainder: c7 (weight 3; the cusp part is -a(n+2)/8, docs/MATH.md §3) and c6 (weight 5/2).
for fam in c7 c6; do
  if have remainder; then
    step "remainder $fam and its plot"
    run remainder "$fam" --to 3000 -o "remainder_$fam.csv" >/dev/null
    plot_to remainder "remainder_$fam.csv" "remainder_$fam.png"
    plot_to relerr "remainder_$fam.csv" "relerr_$fam.png"
  elif have main; then
    step "'circlet remainder' is not in this build: remainder of $fam from 'circlet main --to'"
    run main "$fam" --to 1500 -o "remainder_$fam.csv"
    plot_to remainder "remainder_$fam.csv" "remainder_$fam.png"
  else
    step "neither 'circlet remainder' nor 'circlet main': remainder plot skipped"
  fi
done

# Arcs: c9 at n = 1000 (c_9(1000) = 14180606, docs/MATH.md §3), K = 1..40.
if have arcs; then
  step "arcs c9 at n = 1000 and the plot"
  run arcs c9 --at 1000 --upto 40 -o arcs_c9_1000.csv
  main=()
  if have main; then
    run main c9 --at 1000 --json -o main_c9_1000.json
    main=(--main main_c9_1000.json)
  fi
  plot_to arcs arcs_c9_1000.csv arcs_c9_1000.png "${main[@]}"
else
  step "'circlet arcs' is not in this build: arcs plot skipped"
fi

# Scan heat map: the largest pinning prime per (A, A'), discrete colour bar.
if [ -f "$out/scan/scan.csv" ]; then
  step "scan heat map"
  plot_to scan scan/scan.csv scan_heatmap.png
fi

secs=$(( $(date +%s) - start ))
echo "finished in $secs s" >>"$job"
echo
echo "default job: done in $secs s; results written to $out"
if [ -f "$out/scan/summary.txt" ]; then
  echo
  sed -n '2,20p' "$out/scan/summary.txt"
fi
echo
ls -l "$out"
