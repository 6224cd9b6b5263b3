#!/usr/bin/env bash
# Builds circlet with AddressSanitizer + UndefinedBehaviorSanitizer into
# build-asan/ and runs the fast unit tests there.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
"$here/scripts/setup.sh" --no-build
cmake -S "$here" -B "$here/build-asan" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCIRCLET_SANITIZE=ON >/dev/null
cmake --build "$here/build-asan" -j"$(nproc)"
cd "$here/build-asan"
# FLINT keeps per-thread caches alive until exit; leak checking would report them.
export ASAN_OPTIONS=detect_leaks=0:abort_on_error=1
export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
ctest -j"$(nproc)" --output-on-failure -L unit
