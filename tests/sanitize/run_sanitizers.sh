#!/usr/bin/env bash
# The unit suite under AddressSanitizer + UndefinedBehaviorSanitizer (clang-14,
# the build folder the fuzz targets use: one build serves both), and the server
# and run tests under ThreadSanitizer (GCC, build-tsan/). Each build is its own
# folder beside build/. Both run in the full tier (tests/run_all.sh).
#   bash tests/sanitize/run_sanitizers.sh            # both
#   bash tests/sanitize/run_sanitizers.sh --asan     # or --tsan: one of them
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
jobs="${STRANDLINE_JOBS:-$(nproc)}"
which=${1:-both}
unit_targets=()
for f in "$root"/tests/unit/*_test.cpp; do unit_targets+=("unit_$(basename "${f%.cpp}")"); done
status=0
# Ninja for a new build folder; an existing one keeps its generator.
new_folder_generator() { [[ -f "$1/CMakeCache.txt" ]] || echo "-G Ninja"; }

if [[ $which == both || $which == --asan ]]; then
  build="$root/build-fuzz"
  cmake -S "$root" -B "$build" $(new_folder_generator "$build") -DSTRANDLINE_FUZZ=ON -DCMAKE_BUILD_TYPE=None \
    -DCMAKE_CXX_COMPILER=clang++-14 -DCMAKE_CXX_FLAGS="-O1 -g1" > /dev/null
  # The fuzz targets are built in the same call: run_fuzz.sh then finds them up to date.
  cmake --build "$build" --target "${unit_targets[@]}" fuzz_all -j "$jobs" > "$build/asan-build.log" 2>&1 ||
    { tail -40 "$build/asan-build.log"; echo "run_sanitizers.sh: the ASan build failed" >&2; exit 1; }
  # Leaks are checked too; a report fails the test that caused it.
  ASAN_OPTIONS=detect_leaks=1:abort_on_error=1 UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1 \
    ctest --test-dir "$build" -L quick -j "$jobs" --output-on-failure --timeout 600 || status=1
fi

if [[ $which == both || $which == --tsan ]]; then
  build="$root/build-tsan"
  # The tests that drive the server's threads: requests, runs on the workers, the series cache.
  tsan_targets=(unit_http_service_test unit_http_hardening_test unit_http_dashboard_test unit_rendered_series_test)
  # -O1 -g1: TSan's recommended level with line tables for the reports, and a quicker build.
  cmake -S "$root" -B "$build" $(new_folder_generator "$build") -DSTRANDLINE_TSAN=ON -DCMAKE_BUILD_TYPE=None \
    -DCMAKE_CXX_FLAGS="-O1 -g1" > /dev/null
  cmake --build "$build" --target "${tsan_targets[@]}" -j "$jobs" > "$build/tsan-build.log" 2>&1 ||
    { tail -40 "$build/tsan-build.log"; echo "run_sanitizers.sh: the TSan build failed" >&2; exit 1; }
  export TSAN_OPTIONS="suppressions=$root/tests/sanitize/tsan.supp halt_on_error=1 second_deadlock_stack=1"
  for t in "${tsan_targets[@]}"; do
    if "$build/tests/$t" > "$build/$t.log" 2>&1; then
      echo "ok   $t under TSan ($(grep -c '^\[       OK \]' "$build/$t.log") tests)"
    else
      tail -60 "$build/$t.log"; echo "FAIL $t under TSan" >&2; status=1
    fi
  done
fi
exit $status
