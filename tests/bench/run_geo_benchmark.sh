#!/usr/bin/env bash
# Geodata throughput on the invented demo site: positions drawn as polylines
# (`strandline polylines`), then intersected back (`strandline intersect`).
#   bash tests/bench/run_geo_benchmark.sh BUILD_DIR [TRANSECTS]
# Prints wall and user CPU seconds of each step and the transect-image pairs.
set -euo pipefail
build=${1:?usage: run_geo_benchmark.sh BUILD_DIR [TRANSECTS]}
transects=${2:-200}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
S="$build/server/strandline"
"$build/demo_data/strandline-demo-gen" "$work/site" --transects "$transects"
/usr/bin/time -f "polylines: wall %e s, user %U s, max RSS %M KB" \
  "$S" polylines --observations "$work/site/observations.csv" --transects "$work/site/transects.geojson" \
  --out "$work/lines.gpkg" 2>&1 | grep -E "^polylines:"
/usr/bin/time -f "intersect: wall %e s, user %U s, max RSS %M KB" \
  "$S" intersect --shorelines "$work/lines.gpkg" --transects "$work/site/transects.geojson" \
  --out "$work/obs.csv" 2>&1 | grep -E "^intersect:|rows written"
