#!/usr/bin/env bash
# Installs what is missing, builds, and runs every test (all CTest labels:
# quick, reference, integration) and the fuzz targets (corpus replay and 20 s
# each in an ASan+UBSan build). `--quick` runs only the unit tests; `--deep`
# adds what is run by hand or nightly.
#   bash tests/run_all.sh            # the full suite (CI runs exactly this)
#   bash tests/run_all.sh --quick    # the daily tier
#   bash tests/run_all.sh --deep     # full, then 10 min per fuzz target, the unit suite under
#                                    # ASan+UBSan, the server tests under TSan, the 60 s mixed load
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
bash "$root/tests/setup_debian.sh"
bash "$root/tests/build.sh"
cd "$root/build"
jobs="${STRANDLINE_JOBS:-$(nproc)}"
case "${1:-}" in
  --quick)
    ctest -L quick -j "$jobs" --output-on-failure ;;
  ""|--deep)
    ctest -j "$jobs" --output-on-failure --timeout 1200
    bash "$root/tests/fuzz/run_fuzz.sh" --seconds 20
    if [[ "${1:-}" == "--deep" ]]; then
      bash "$root/tests/fuzz/run_fuzz.sh" --seconds 600
      bash "$root/tests/sanitize/run_sanitizers.sh"
      /usr/bin/python3 "$root/tests/bench/mixed_load.py" --build-dir "$root/build" --seconds 60 --connections 64
    fi ;;
  *)
    echo "usage: run_all.sh [--quick|--deep]" >&2; exit 2 ;;
esac
