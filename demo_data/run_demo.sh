#!/usr/bin/env bash
# The main job on the invented demo site ("Gullwing Bay"): installs what is
# missing, builds, generates the demo (fixed seed, known truths), then
#   1. draws the raw positions as shoreline polylines (GeoPackage) and intersects
#      them with the transects again: the polyline -> observations path;
#   2. corrects them: gauge record where it covers the images, harmonic tide
#      prediction before it, Stockdon setup from the wave record, slopes
#      estimated by the spectral search, QC filters, uncertainty, summary;
#      cleaned rows as CSV and as a GeoPackage;
#   3. starts the HTTP service on the demo site (`strandline serve --demo`) and
#      prints its URL (skip with --batch-only; stop it with Ctrl-C).
# Outputs go to demo_data/out/ (git-ignored).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
batch_only=0
[[ "${1:-}" == "--batch-only" ]] && batch_only=1
bash "$root/tests/setup_debian.sh"
bash "$root/tests/build.sh" -DSTRANDLINE_UNIT_TESTS=OFF  # the demo needs the programs, not the tests
bin="$root/build/server/strandline"
out="$root/demo_data/out"
mkdir -p "$out"
"$root/build/demo_data/strandline-demo-gen" "$out"

echo "== shoreline polylines -> observations"
"$bin" polylines --observations "$out/observations.csv" --transects "$out/transects.geojson" \
  --out "$out/shorelines.gpkg"
"$bin" intersect --shorelines "$out/shorelines.gpkg" --transects "$out/transects.geojson" \
  --out "$out/observations_from_lines.csv"

echo "== correction, QC, uncertainty, summary"
common=(--water-levels "$out/water_levels.csv" --tide-constituents "$out/tide_constituents.json"
        --waves "$out/waves.csv" --wave-correction setup
        --slope auto --default-slope 0.1 --reference-elevation 0.0
        --transects "$out/transects.geojson")
"$bin" correct --observations "$out/observations_from_lines.csv" "${common[@]}" \
  --out "$out/cleaned.csv" --summary "$out/summary.json"
"$bin" correct --observations "$out/observations_from_lines.csv" "${common[@]}" \
  --out "$out/cleaned.gpkg" --quiet

echo
echo "demo outputs in $out:"
echo "  shorelines.gpkg              raw shorelines as polylines (one per image)"
echo "  observations_from_lines.csv  their intersections with the transects"
echo "  cleaned.csv, cleaned.gpkg    corrected, flagged, uncertainty-tagged rows (GeoPackage: points + transects)"
echo "  summary.json                 per-transect slope, trend, seasonal cycle, counts, cautions, provenance"
echo "  truth_points.csv, truth_transects.csv  the generator's truths, to compare"
echo "Cautions: satellite-derived positions must be validated against surveys; not a substitute for site"
echo "investigation; defer to local coastal-management codes and licensed professional practice."
if [[ $batch_only -eq 0 ]]; then
  echo
  echo "== HTTP service on the demo site (Ctrl-C to stop)"
  exec "$bin" serve --demo --port "${STRANDLINE_PORT:-8600}"
fi
