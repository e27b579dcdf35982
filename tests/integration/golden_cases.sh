#!/usr/bin/env bash
# The golden cases (tests/golden/README.md) through both faces: `strandline
# correct` and a live `strandline serve` on loopback must give the rows of each
# case's expected/cleaned.csv; the malformed cases must be refused by both with
# the same reason. The runner starts and stops its own servers (one per case,
# temporary database, --port 0, stopped in `finally` and on SIGTERM) and bounds
# every wait (server start 30 s, each run 300 s, each request 120 s).
# Args: BUILD_DIR SOURCE_DIR. Last line: `N passed, N failed`.
set -uo pipefail
build=$1 source=$2
work=$(mktemp -d /tmp/strandline-golden-sh-XXXXXX)
trap 'rm -rf "$work"' EXIT

if [ ! -x "$build/server/strandline" ]; then
  echo "FAIL: no $build/server/strandline"
  echo "0 passed, 1 failed"
  exit 1
fi
/usr/bin/python3 "$source/tests/golden/run_golden.py" --build-dir "$build" 2>&1 | tee "$work/out.txt"
code=${PIPESTATUS[0]}
last=$(tail -n 1 "$work/out.txt")
if ! [[ $last =~ ^[0-9]+\ passed,\ [0-9]+\ failed$ ]]; then
  echo "FAIL: the golden runner stopped early (exit $code)"
  echo "0 passed, 1 failed"
  exit 1
fi
[ "$code" -eq 0 ] && [[ $last =~ ,\ 0\ failed$ ]]
