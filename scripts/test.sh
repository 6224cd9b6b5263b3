#!/usr/bin/env bash
# The test command (README): set up (idempotent), build, run the fast test suite.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
"$here/scripts/setup.sh"
cd "$here/build"
ctest -j"$(nproc)" --output-on-failure -L unit
