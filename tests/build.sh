#!/usr/bin/env bash
# Configures and builds the project into build/ (Release with debug info).
# Extra arguments go to CMake's configure step and win over the defaults here
# (e.g. -DSTRANDLINE_UNIT_TESTS=OFF: the unit tests are built unless told otherwise,
# also in a folder configured without them before).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
jobs="${STRANDLINE_JOBS:-$(nproc)}"
# Ninja for a new build folder (it schedules both cores across targets); an existing one keeps its generator.
generator=()
[[ -f "$root/build/CMakeCache.txt" ]] || generator=(-G Ninja)
cmake -S "$root" -B "$root/build" "${generator[@]}" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DSTRANDLINE_UNIT_TESTS=ON "$@" >/dev/null
cmake --build "$root/build" -j "$jobs"
