#!/usr/bin/env bash
# Builds the libFuzzer targets with ASan+UBSan (clang-14, Debian's clang-14 and
# libclang-rt-14-dev) in their own build folder, replays every seed corpus in
# tests/fuzz/corpus/, then fuzzes each target for a bounded time. A crash, a
# sanitizer report or an unexpected exception fails the script and leaves the
# input in BUILD/fuzz/findings/TARGET/ (replay it: BUILD/fuzz/TARGET FILE).
#   bash tests/fuzz/run_fuzz.sh                       # 20 s per target (the full tier)
#   bash tests/fuzz/run_fuzz.sh --seconds 600         # long fuzzing (--deep)
#   bash tests/fuzz/run_fuzz.sh --build-dir DIR       # default build-fuzz/ beside build/
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
seconds=${FUZZ_SECONDS:-20} build="$root/build-fuzz"
while (($#)); do
  case $1 in
    --seconds) seconds=$2; shift 2 ;;
    --build-dir) build=$2; shift 2 ;;
    *) echo "usage: run_fuzz.sh [--seconds N] [--build-dir DIR]" >&2; exit 2 ;;
  esac
done
[[ $seconds =~ ^[0-9]+$ ]] || { echo "run_fuzz.sh: --seconds: expected a whole number, got \"$seconds\"" >&2; exit 2; }
command -v clang++-14 > /dev/null || { echo "run_fuzz.sh: clang++-14 missing (bash tests/setup_debian.sh)" >&2; exit 1; }

jobs="${STRANDLINE_JOBS:-$(nproc)}"
# -O1: the sanitizers' recommended level (fast enough, reports still exact).
generator=()
[[ -f "$build/CMakeCache.txt" ]] || generator=(-G Ninja)  # Ninja for a new folder; an existing one keeps its generator
cmake -S "$root" -B "$build" "${generator[@]}" -DSTRANDLINE_FUZZ=ON -DCMAKE_BUILD_TYPE=None \
  -DCMAKE_CXX_COMPILER=clang++-14 -DCMAKE_CXX_FLAGS="-O1 -g1" > /dev/null
cmake --build "$build" --target fuzz_all -j "$jobs" > "$build/fuzz-build.log" 2>&1 ||
  { tail -40 "$build/fuzz-build.log"; echo "run_fuzz.sh: the fuzz build failed" >&2; exit 1; }

export ASAN_OPTIONS=detect_leaks=1:abort_on_error=1:symbolize=1
export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
status=0
for target in "$build"/fuzz/fuzz_*; do
  [[ -f $target && -x $target ]] || continue  # the targets, not their logs
  name=$(basename "$target")
  seeds="$root/tests/fuzz/corpus/$name"
  work="$build/fuzz/corpus/$name" findings="$build/fuzz/findings/$name"
  mkdir -p "$work" "$findings"
  # Replay: every seed once (-runs=0 runs the given inputs and stops).
  if ! "$target" -runs=0 "$seeds" > "$build/fuzz/$name.replay.log" 2>&1; then
    tail -30 "$build/fuzz/$name.replay.log"; echo "FAIL $name: a seed input fails" >&2; status=1; continue
  fi
  # Bounded fuzzing from the seeds; new inputs go to the build folder, not the source tree.
  if "$target" -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 -max_len=65536 \
       -artifact_prefix="$findings/" "$work" "$seeds" > "$build/fuzz/$name.log" 2>&1; then
    runs=$(sed -n 's/^Done \([0-9]*\) runs.*/\1/p' "$build/fuzz/$name.log" | tail -1)
    echo "ok   $name: seeds replayed, ${seconds} s fuzzing, ${runs:-?} executions, corpus $(ls "$work" | wc -l)"
  else
    tail -40 "$build/fuzz/$name.log"
    echo "FAIL $name: finding in $findings/ (replay: $target $findings/<file>)" >&2
    status=1
  fi
done
exit $status
