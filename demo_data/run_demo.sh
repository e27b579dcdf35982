#!/usr/bin/env bash
# The main job on the invented demo site: installs what is missing, builds,
# generates the demo (fixed seed) and runs the batch correction on it.
# Outputs go to demo_data/out/ (git-ignored).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
bash "$root/tests/setup_debian.sh"
bash "$root/tests/build.sh"
bin="$root/build/server/strandline"
out="$root/demo_data/out"
mkdir -p "$out"
"$root/build/demo_data/strandline-demo-gen" "$out"
"$bin" correct \
  --observations "$out/observations.csv" \
  --water-levels "$out/water_levels.csv" \
  --transect-params "$out/transect_params.csv" \
  --reference-elevation 0.0 \
  --out "$out/cleaned.csv" --summary "$out/summary.json"
echo
echo "demo outputs:"
echo "  cleaned rows   $out/cleaned.csv"
echo "  summary        $out/summary.json"
echo "  truth (to compare): $out/truth_points.csv, $out/truth_transects.csv"
