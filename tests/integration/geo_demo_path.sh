#!/usr/bin/env bash
# The polyline -> cleaned GeoPackage path of the README, end to end on a small
# invented demo site: positions drawn as polylines, intersected back (every
# position must return to 1 mm, with one crossing each), corrected, exported,
# and the GeoPackage opened with ogrinfo (layers, CRS, feature counts).
set -euo pipefail
build=$1
source_dir=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
S="$build/server/strandline"

"$build/demo_data/strandline-demo-gen" "$work/demo" --transects 6 >/dev/null
bash "$source_dir/demo_data/shoreline_polylines.sh" "$build" "$work/demo" 2>/dev/null
"$S" intersect --shorelines "$work/demo/shorelines.gpkg" --transects "$work/demo/transects.geojson" \
  --out "$work/obs.csv" 2>"$work/intersect.log"
grep -q "transect-image pairs not crossed: 0" "$work/intersect.log" || { cat "$work/intersect.log"; exit 1; }

/usr/bin/python3 - "$work/demo/observations.csv" "$work/obs.csv" <<'PY'
import csv, sys
a = {(r["transect_id"], r["image_id"]): r for r in csv.DictReader(open(sys.argv[1]))}
b = {(r["transect_id"], r["image_id"]): r for r in csv.DictReader(open(sys.argv[2]))}
assert set(a) == set(b), "pairs differ: %d vs %d" % (len(a), len(b))
err = max(abs(float(a[k]["chainage_m"]) - float(b[k]["chainage_m"])) for k in a)
assert err < 1e-3, "chainage error %g m" % err
assert all(b[k]["crossings"] == "1" and b[k]["time"] == a[k]["time"] and b[k]["sensor"] == a[k]["sensor"] for k in a)
print("polylines -> intersect: %d positions back, max error %.1e m" % (len(a), err))
PY

"$S" correct --observations "$work/obs.csv" --water-levels "$work/demo/water_levels.csv" \
  --transect-params "$work/demo/transect_params.csv" --waves "$work/demo/waves.csv" \
  --out "$work/cleaned.csv" --summary "$work/summary.json" --quiet 2>/dev/null
"$S" geoexport --points "$work/cleaned.csv" --summary "$work/summary.json" \
  --transects "$work/demo/transects.geojson" --out "$work/cleaned.gpkg" 2>/dev/null

info=$(ogrinfo -so -al "$work/cleaned.gpkg")
grep -q "Layer name: shoreline_points" <<<"$info"
grep -q "Layer name: transects" <<<"$info"
grep -q 'ID\["EPSG",32631\]' <<<"$info"
rows=$(($(wc -l <"$work/cleaned.csv") - 1))
grep -q "Feature Count: $rows" <<<"$info" || { echo "expected $rows points"; echo "$info" | grep "Feature Count"; exit 1; }
grep -q "Feature Count: 6" <<<"$info"
grep -q "slope_ci95_low: Real" <<<"$info"
echo "cleaned.gpkg: $rows shoreline points, 6 transects, EPSG:32631"

# The same straight from `correct` (with transect geometry, which the
# alongshore filters may use): layers equal the cleaned CSV cell by cell.
for out in with_geometry.csv direct.gpkg; do
  "$S" correct --observations "$work/obs.csv" --water-levels "$work/demo/water_levels.csv" \
    --transect-params "$work/demo/transect_params.csv" --waves "$work/demo/waves.csv" \
    --transects "$work/demo/transects.geojson" --out "$work/$out" --quiet 2>/dev/null
done
/usr/bin/python3 - "$work/with_geometry.csv" "$work/direct.gpkg" <<'PY'
import csv, sys
from osgeo import ogr
rows = list(csv.DictReader(open(sys.argv[1])))
ds = ogr.Open(sys.argv[2])
layer = ds.GetLayerByName("shoreline_points")
assert layer.GetFeatureCount() == len(rows), (layer.GetFeatureCount(), len(rows))
for row, f in zip(rows, layer):
    for name, text in row.items():
        v = f.GetField(name)
        if text == "":
            assert v is None, (name, v)
        elif isinstance(v, float):
            assert abs(v - float(text)) < 1e-12, (name, v, text)
        else:
            assert str(v) == text, (name, v, text)
print("correct --out direct.gpkg: %d points equal to cleaned.csv" % len(rows))
PY
