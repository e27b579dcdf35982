#!/usr/bin/env bash
# Installs what the build and the tests need on Debian 12, only when missing
# (apt-get as root; npm packages from the lock files). Safe to run repeatedly.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"

packages=(
  build-essential cmake ninja-build pkg-config git curl ca-certificates
  libgdal-dev gdal-bin libproj-dev proj-data libeigen3-dev libfftw3-dev libcpp-httplib-dev
  nlohmann-json3-dev libsqlite3-dev sqlite3 libgtest-dev libgmock-dev libhowardhinnant-date-dev libssl-dev libdeflate-dev
  libcli11-dev nginx openssl procps chromium
  clang-14 libclang-rt-14-dev
  python3 python3-numpy python3-scipy python3-pyproj python3-gdal
)
# Node.js and npm only when no node is on the machine already.
command -v node >/dev/null 2>&1 || packages+=(nodejs)
command -v npm >/dev/null 2>&1 || packages+=(npm)

missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if ((${#missing[@]})); then
  echo "setup: installing ${missing[*]}"
  if [[ $(id -u) -ne 0 ]]; then SUDO=sudo; else SUDO=; fi
  $SUDO apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}"
fi

# npm projects: the dashboard's chart library (embedded in the binary at build
# time) and those of the tests (reference checks, browser tests), exact versions
# from their lock files.
for dir in "$here"/../web_static/ "$here"/reference/*/ "$here"/browser/; do
  [[ -f "$dir/package-lock.json" ]] || continue
  if [[ ! -d "$dir/node_modules" || "$dir/package-lock.json" -nt "$dir/node_modules" ]]; then
    echo "setup: npm ci in $(realpath --relative-to="$here/.." "$dir")"
    (cd "$dir" && npm ci --no-audit --no-fund --loglevel=error)
  fi
done
