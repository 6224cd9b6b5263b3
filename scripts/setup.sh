#!/usr/bin/env bash
# Idempotent set-up for a fresh Debian 12 machine: installs the Debian
# packages circlet needs (only those missing), then configures and builds.
# Usage: scripts/setup.sh [--no-build]
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"

packages=(
  build-essential cmake pkg-config
  libflint-dev libflint-arb-dev libntl-dev libmpfr-dev libgmp-dev
  libeigen3-dev catch2 libcli11-dev nlohmann-json3-dev libfmt-dev
  pari-gp clang-14 libclang-rt-14-dev ccache libsqlite3-dev libssl-dev sqlite3 time strace
  python3-matplotlib python3-pandas python3-numpy
  jupyter-notebook python3-nbconvert python3-ipykernel
)

missing=()
for p in "${packages[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$p")
  fi
done

if [ "${#missing[@]}" -gt 0 ]; then
  echo "setup: installing ${missing[*]}" >&2
  SUDO=""
  if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi
  export DEBIAN_FRONTEND=noninteractive
  $SUDO apt-get update -qq
  $SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
else
  echo "setup: all Debian packages present" >&2
fi

if [ "${1:-}" != "--no-build" ]; then
  cmake -S "$here" -B "$here/build" -DCMAKE_BUILD_TYPE=Release >/dev/null
  cmake --build "$here/build" -j"$(nproc)"
fi
