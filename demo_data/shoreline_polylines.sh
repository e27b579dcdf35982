#!/usr/bin/env bash
# Ships the demo's raw observations also as shoreline polylines, the form an
# image-mapping step delivers: one polyline per image through its positions on
# the transects, in a GeoPackage in the demo's work CRS (EPSG:32631).
#   bash demo_data/shoreline_polylines.sh BUILD_DIR DEMO_DIR
# DEMO_DIR holds the generator's files (strandline-demo-gen DEMO_DIR); the
# result is DEMO_DIR/shorelines.gpkg (layer `shorelines`).
set -euo pipefail
build=${1:?usage: shoreline_polylines.sh BUILD_DIR DEMO_DIR}
demo=${2:?usage: shoreline_polylines.sh BUILD_DIR DEMO_DIR}
strandline="$build/server/strandline"
if [[ ! -f "$demo/observations.csv" ]]; then
  "$build/demo_data/strandline-demo-gen" "$demo"
fi
"$strandline" polylines --observations "$demo/observations.csv" --transects "$demo/transects.geojson" \
  --out "$demo/shorelines.gpkg"
