#!/usr/bin/env bash
# The default main job (README): set up, build, then compute and write results
# under results/default/ with provenance.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
"$here/scripts/setup.sh"
out="$here/results/default"
mkdir -p "$out"
circlet="$here/build/circlet"
"$circlet" count c7 --to 10000 -o "$out/c7_counts.csv"
"$circlet" count sc13 --to 10000 -o "$out/sc13_counts.csv"
echo "default job: results written to $out"
ls -l "$out"
