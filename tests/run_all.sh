#!/usr/bin/env bash
# Installs what is missing, builds, and runs every test.
#   bash tests/run_all.sh            # the full tier (CI runs exactly this):
#       the normal build (GCC) with the reference and integration tests (crash loop, front checks);
#       one ASan+UBSan build (clang) shared by the unit tests and the fuzz targets (corpus replay
#       and 20 s each); the server and run tests under TSan (GCC)
#   bash tests/run_all.sh --quick    # the daily tier: the unit tests in the normal build
#   bash tests/run_all.sh --deep     # the full tier with the unit tests in the normal build too,
#                                    # then 10 min per fuzz target and the 60 s mixed load
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
mode=${1:-}
case "$mode" in ""|--quick|--deep) ;; *) echo "usage: run_all.sh [--quick|--deep]" >&2; exit 2 ;; esac
bash "$root/tests/setup_debian.sh"
jobs="${STRANDLINE_JOBS:-$(nproc)}"
stage() { echo "== $(date -u +%H:%M:%S) $*"; }

if [[ $mode == --quick ]]; then
  bash "$root/tests/build.sh"
  ctest --test-dir "$root/build" -L quick -j "$jobs" --output-on-failure
  exit 0
fi

# The full tier's unit tests run in the sanitizer build; --deep runs them in this one as well.
unit_tests=$([[ $mode == --deep ]] && echo ON || echo OFF)
stage "normal build (unit tests: $unit_tests)"
bash "$root/tests/build.sh" -DSTRANDLINE_UNIT_TESTS=$unit_tests
stage "reference and integration tests$([[ $unit_tests == ON ]] && echo ', unit tests')"
ctest --test-dir "$root/build" -j "$jobs" --output-on-failure --timeout 1200
stage "unit tests under ASan+UBSan (the build the fuzz targets share)"
bash "$root/tests/sanitize/run_sanitizers.sh" --asan
stage "fuzz targets: corpus replay and 20 s each"
bash "$root/tests/fuzz/run_fuzz.sh" --seconds 20
stage "server and run tests under TSan"
bash "$root/tests/sanitize/run_sanitizers.sh" --tsan
if [[ $mode == --deep ]]; then
  stage "long fuzzing and the mixed load"
  bash "$root/tests/fuzz/run_fuzz.sh" --seconds 600
  /usr/bin/python3 "$root/tests/bench/mixed_load.py" --build-dir "$root/build" --seconds 60 --connections 64
fi
stage "all passed"
