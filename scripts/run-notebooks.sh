#!/usr/bin/env bash
# Executes every notebook in notebooks/ top to bottom (CI: .ci/run) into a
# temporary copy; the stored notebooks keep their outputs cleared.
# Usage: scripts/run-notebooks.sh [OUTDIR]   (default: a fresh temporary directory)
# Environment: CIRCLET (the binary; default build/circlet), NOTEBOOK_TIMEOUT
# (seconds per cell, default 120).
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export CIRCLET_ROOT="$here"
export CIRCLET="${CIRCLET:-$here/build/circlet}"
out="${1:-$(mktemp -d /tmp/circlet-notebooks-XXXXXX)}"
mkdir -p "$out"
export CIRCLET_NOTEBOOK_OUT="$out"

if [ ! -x "$CIRCLET" ]; then
  echo "run-notebooks: $CIRCLET is missing; build first (scripts/setup.sh)" >&2
  exit 2
fi
# Debian's python3-nbconvert has no `jupyter nbconvert` entry point in every
# release; the module form is the same program.
if jupyter nbconvert --version >/dev/null 2>&1; then
  nbconvert=(jupyter nbconvert)
else
  nbconvert=(/usr/bin/python3 -m nbconvert)
fi

status=0
start=$(date +%s)
for nb in "$here"/notebooks/*.ipynb; do
  name="$(basename "$nb")"
  t0=$(date +%s)
  if "${nbconvert[@]}" --to notebook --execute --output-dir "$out" \
      --ExecutePreprocessor.timeout="${NOTEBOOK_TIMEOUT:-120}" --ExecutePreprocessor.kernel_name=python3 \
      "$nb" >"$out/${name%.ipynb}.log" 2>&1; then
    echo "run-notebooks: $name ok ($(( $(date +%s) - t0 )) s)"
  else
    echo "run-notebooks: $name FAILED; log:" >&2
    tail -n 40 "$out/${name%.ipynb}.log" >&2
    status=1
  fi
done
echo "run-notebooks: executed copies in $out ($(( $(date +%s) - start )) s in all)"
exit $status
