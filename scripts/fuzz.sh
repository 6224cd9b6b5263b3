#!/usr/bin/env bash
# Builds the libFuzzer targets in fuzz/ with clang and runs each for a while.
# Usage: scripts/fuzz.sh [seconds-per-target (default 60)]
# Seed corpora live in fuzz/corpus/<target without fuzz_>/ and are not modified;
# new inputs go to a scratch directory. A crash input is left as crash-* in
# build-fuzz/ and must become a unit test.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
secs="${1:-60}"
"$here/scripts/setup.sh" --no-build
cmake -S "$here" -B "$here/build-fuzz" -DCMAKE_BUILD_TYPE=RelWithDebInfo \
  -DCMAKE_CXX_COMPILER=clang++ -DCIRCLET_FUZZ=ON >/dev/null
cmake --build "$here/build-fuzz" -j"$(nproc)"
cd "$here/build-fuzz"
status=0
for src in "$here"/fuzz/fuzz_*.cpp; do
  target="$(basename "$src" .cpp)"
  seeds="$here/fuzz/corpus/${target#fuzz_}"
  scratch="$(mktemp -d)"
  echo "fuzz: $target for ${secs}s (seeds: $seeds)"
  if ! ASAN_OPTIONS=detect_leaks=0 ./"$target" -max_total_time="$secs" -max_len=8192 "$scratch" "$seeds"; then
    echo "fuzz: $target FAILED; see crash-* in $(pwd)" >&2
    status=1
  fi
  rm -rf "$scratch"
done
exit $status
