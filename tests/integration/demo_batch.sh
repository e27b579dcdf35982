#!/usr/bin/env bash
# The README's main job without the set-up: generate the demo site and correct it.
set -euo pipefail
build="$1"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
"$build/demo_data/strandline-demo-gen" "$tmp"
"$build/server/strandline" correct --observations "$tmp/observations.csv" --water-levels "$tmp/water_levels.csv" \
  --transect-params "$tmp/transect_params.csv" --out "$tmp/cleaned.csv" --summary "$tmp/summary.json" --quiet
rows_in=$(($(wc -l < "$tmp/observations.csv") - 1))
rows_out=$(($(wc -l < "$tmp/cleaned.csv") - 1))
[[ $rows_in -eq $rows_out ]] || { echo "FAIL: $rows_in input rows, $rows_out cleaned rows"; exit 1; }
grep -q '"cautions"' "$tmp/summary.json" || { echo "FAIL: summary without cautions"; exit 1; }
grep -q '"sha256"' "$tmp/summary.json" || { echo "FAIL: summary without input digests"; exit 1; }
echo "1 passed, 0 failed"
