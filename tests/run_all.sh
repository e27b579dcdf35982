#!/usr/bin/env bash
# Installs what is missing, builds, and runs every test (all CTest labels:
# quick, reference, integration). `--quick` runs only the unit tests.
#   bash tests/run_all.sh            # the full suite (CI runs exactly this)
#   bash tests/run_all.sh --quick    # the daily tier
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
bash "$root/tests/setup_debian.sh"
bash "$root/tests/build.sh"
cd "$root/build"
jobs="${STRANDLINE_JOBS:-$(nproc)}"
if [[ "${1:-}" == "--quick" ]]; then
  ctest -L quick -j "$jobs" --output-on-failure
else
  ctest -j "$jobs" --output-on-failure --timeout 1200
fi
