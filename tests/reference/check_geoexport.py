#!/usr/bin/env python3
"""Round trips of the geodata writers, read back with python GDAL (OGR) and
checked with pyproj:
  - `strandline geoexport` to GeoPackage: layers shoreline_points and transects,
    every CSV column as a field, the work CRS (EPSG:32631), point = origin +
    chainage * (sin az, cos az) to 1 mm, summary columns on the transect lines;
  - the same to GeoJSON: RFC 7946 lon/lat (pyproj always_xy inverse of the
    work-CRS point, 1e-8 degree ~ 1 mm), transects in the _transects sibling;
  - `strandline transects` along an invented straight baseline: count, normal
    azimuth and origins from the definition of the normal;
  - `strandline polylines` then `strandline intersect`: positions come back.
All geometry is invented.
"""
import argparse
import csv
import json
import math
import os
import subprocess
import sys
import tempfile

from osgeo import ogr, osr
from pyproj import Transformer

ogr.UseExceptions()
failures = []


def check(cond, what):
    if not cond:
        failures.append(what)


def run(args):
    r = subprocess.run(args, capture_output=True, text=True)
    if r.returncode != 0:
        failures.append("%s: exit %d: %s" % (" ".join(args), r.returncode, r.stderr))
    return r


def epsg_of(layer):
    s = layer.GetSpatialRef()
    if s is None:
        return None
    s.AutoIdentifyEPSG()
    return s.GetAuthorityCode(None)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--source-dir", required=True)
    a = ap.parse_args()
    exe = os.path.join(a.build_dir, "server", "strandline")
    with tempfile.TemporaryDirectory() as tmp:
        # Transects: 5 lines in EPSG:32631, legacy crs member GeoJSON.
        transects = []
        for i in range(5):
            az = 150.0 + 5 * i
            ox, oy = 431000.0 + 80 * i, 5902000.0 - 20 * i
            transects.append(("T%d" % i, ox, oy, az, 500.0))
        feats = []
        for tid, ox, oy, az, ln in transects:
            ex, ey = ox + ln * math.sin(math.radians(az)), oy + ln * math.cos(math.radians(az))
            feats.append({"type": "Feature", "properties": {"transect_id": tid},
                          "geometry": {"type": "LineString", "coordinates": [[ox, oy], [ex, ey]]}})
        tpath = os.path.join(tmp, "transects.geojson")
        json.dump({"type": "FeatureCollection", "crs": {"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::32631"}},
                   "features": feats}, open(tpath, "w"))

        # A cleaned-like CSV and a summary JSON.
        cpath = os.path.join(tmp, "cleaned.csv")
        columns = ["transect_id", "time", "sensor", "image_id", "chainage_raw_m", "chainage_m", "sigma_m", "flags", "accepted"]
        rows = []
        for k in range(4):
            for i, t in enumerate(transects):
                ch = "" if (k == 3 and i == 2) else "%.3f" % (120 + 10 * k + 7.5 * i)
                rows.append([t[0], "2021-0%d-01T10:00:00Z" % (k + 1), "landsat8", "L8_%d" % k, "%.3f" % (118 + 10 * k),
                             ch, "9.5", "spike;cloudy_image" if k == 1 else "", "1"])
        with open(cpath, "w", newline="") as f:
            w = csv.writer(f)
            w.writerow(columns)
            w.writerows(rows)
        spath = os.path.join(tmp, "summary.json")
        json.dump({"schema_version": 1, "transects": [
            {"transect_id": t[0], "slope": 0.05 + 0.01 * i, "slope_ci95": [0.04, 0.06 + 0.01 * i], "n_accepted": 4,
             "slope_identifiable": True, "counts_by_flag": {"spike": 1}, "slope_details": {"band": [1, 2]}}
            for i, t in enumerate(transects)]}, open(spath, "w"))

        # ---- GeoPackage ----
        gpkg = os.path.join(tmp, "cleaned.gpkg")
        run([exe, "geoexport", "--points", cpath, "--summary", spath, "--transects", tpath, "--out", gpkg])
        ds = ogr.Open(gpkg)
        names = sorted(ds.GetLayer(i).GetName() for i in range(ds.GetLayerCount()))
        check(names == ["shoreline_points", "transects"], "gpkg layers %s" % names)
        pts = ds.GetLayerByName("shoreline_points")
        check(epsg_of(pts) == "32631", "gpkg points CRS %s" % epsg_of(pts))
        defn = pts.GetLayerDefn()
        fields = [defn.GetFieldDefn(i).GetName() for i in range(defn.GetFieldCount())]
        check(fields == columns, "gpkg point fields %s" % fields)
        check(pts.GetFeatureCount() == len(rows), "gpkg point count %d" % pts.GetFeatureCount())
        geo = {t[0]: t for t in transects}
        worst = 0.0
        nulls = 0
        for f in pts:
            g = f.GetGeometryRef()
            ch = f.GetField("chainage_m")
            if ch is None:
                nulls += 1
                check(g is None or g.IsEmpty(), "unknown chainage should have no geometry")
                continue
            tid, ox, oy, az, ln = geo[f.GetField("transect_id")]
            x, y = ox + ch * math.sin(math.radians(az)), oy + ch * math.cos(math.radians(az))
            worst = max(worst, math.hypot(g.GetX() - x, g.GetY() - y))
        check(worst < 1e-3, "gpkg point position error %.3g m" % worst)
        check(nulls == 1, "gpkg points without chainage: %d" % nulls)
        print("gpkg shoreline_points: %d features, %d fields, EPSG:%s, max position error %.2e m"
              % (pts.GetFeatureCount(), len(fields), epsg_of(pts), worst))
        tl = ds.GetLayerByName("transects")
        check(epsg_of(tl) == "32631", "gpkg transects CRS")
        tdefn = tl.GetLayerDefn()
        tfields = [tdefn.GetFieldDefn(i).GetName() for i in range(tdefn.GetFieldCount())]
        for want in ["transect_id", "azimuth_deg", "length_m", "slope", "slope_ci95_low", "slope_ci95_high", "n_accepted",
                     "slope_identifiable", "counts_by_flag_spike"]:
            check(want in tfields, "gpkg transects lack field %s (have %s)" % (want, tfields))
        check("slope_details" not in tfields, "slope_details should not be flattened")
        for f in tl:
            tid, ox, oy, az, ln = geo[f.GetField("transect_id")]
            g = f.GetGeometryRef()
            check(abs(g.GetX(0) - ox) < 1e-3 and abs(g.GetY(0) - oy) < 1e-3, "transect origin %s" % tid)
            check(abs(f.GetField("azimuth_deg") - az) < 1e-9, "transect azimuth %s" % tid)
            i = int(tid[1:])
            check(abs(f.GetField("slope") - (0.05 + 0.01 * i)) < 1e-12, "summary slope on %s" % tid)
        print("gpkg transects: %d features, fields %s" % (tl.GetFeatureCount(), ", ".join(tfields)))
        ds = None

        # ---- GeoJSON (RFC 7946) ----
        gj = os.path.join(tmp, "cleaned.geojson")
        run([exe, "geoexport", "--points", cpath, "--summary", spath, "--transects", tpath, "--out", gj])
        doc = json.load(open(gj))
        check("crs" not in doc, "RFC 7946 GeoJSON must not carry a crs member")
        inv = Transformer.from_crs(32631, 4326, always_xy=True)
        worst_deg = 0.0
        for feat in doc["features"]:
            p = feat["properties"]
            if p["chainage_m"] is None:
                continue
            tid, ox, oy, az, ln = geo[p["transect_id"]]
            lon, lat = inv.transform(ox + p["chainage_m"] * math.sin(math.radians(az)),
                                     oy + p["chainage_m"] * math.cos(math.radians(az)))
            c = feat["geometry"]["coordinates"]
            worst_deg = max(worst_deg, abs(c[0] - lon), abs(c[1] - lat))
        check(worst_deg < 1e-8, "geojson lon/lat error %.3g deg" % worst_deg)
        check(os.path.exists(os.path.join(tmp, "cleaned_transects.geojson")), "geojson transects sibling missing")
        print("geojson points: %d features, max lon/lat error %.2e deg (pyproj always_xy)" % (len(doc["features"]), worst_deg))

        # ---- transects along a straight baseline ----
        bpath = os.path.join(tmp, "baseline.geojson")
        json.dump({"type": "FeatureCollection", "crs": {"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::32631"}},
                   "features": [{"type": "Feature", "properties": {},
                                 "geometry": {"type": "LineString", "coordinates": [[431000, 5902000], [431600, 5902800]]}}]},
                  open(bpath, "w"))
        out = os.path.join(tmp, "made.gpkg")
        run([exe, "transects", "--baseline", bpath, "--spacing", "50", "--length", "400", "--sea-side", "right", "--out", out])
        ds = ogr.Open(out)
        lyr = ds.GetLayer(0)
        # baseline length 1000 m -> stations 0, 50, ..., 1000: 21 transects;
        # direction atan2(600, 800) = 36.87 deg, sea on the right: +90.
        check(lyr.GetFeatureCount() == 21, "baseline transects: %d" % lyr.GetFeatureCount())
        want_az = (math.degrees(math.atan2(600, 800)) + 90) % 360
        worst = 0.0
        for n, f in enumerate(lyr):
            g = f.GetGeometryRef()
            az = math.degrees(math.atan2(g.GetX(1) - g.GetX(0), g.GetY(1) - g.GetY(0))) % 360
            worst = max(worst, abs(az - want_az))
            check(abs(g.GetX(0) - (431000 + 0.6 * 50 * n)) < 1e-3 and abs(g.GetY(0) - (5902000 + 0.8 * 50 * n)) < 1e-3,
                  "baseline transect %d origin" % n)
            check(abs(f.GetField("length_m") - 400) < 1e-9, "baseline transect length")
        check(worst < 1e-6, "baseline normal azimuth error %.3g deg" % worst)
        print("transects along a baseline: %d, normal azimuth %.4f deg, max error %.2e deg" % (lyr.GetFeatureCount(), want_az, worst))
        ds = None

        # ---- polylines then intersect ----
        opath = os.path.join(tmp, "obs.csv")
        with open(opath, "w", newline="") as f:
            w = csv.writer(f)
            w.writerow(["transect_id", "time", "chainage_m", "sensor", "image_id"])
            for k in range(3):
                for i, t in enumerate(transects):
                    if k == 2 and i in (1, 3):
                        continue  # gaps: T0, T2 and T4 isolated on image 2 -> ticks
                    w.writerow([t[0], "2021-0%d-01T10:00:00Z" % (k + 1), "%.3f" % (100 + 13 * k + 9 * i), "landsat8", "L8_%d" % k])
        lines = os.path.join(tmp, "lines.gpkg")
        run([exe, "polylines", "--observations", opath, "--transects", tpath, "--out", lines])
        ds = ogr.Open(lines)
        lyr = ds.GetLayerByName("shorelines")
        check(lyr is not None and lyr.GetFeatureCount() == 5, "polylines: 2 lines + 3 ticks expected")
        ds = None
        back = os.path.join(tmp, "back.csv")
        run([exe, "intersect", "--shorelines", lines, "--transects", tpath, "--out", back])
        orig = {(r["transect_id"], r["image_id"]): float(r["chainage_m"]) for r in csv.DictReader(open(opath))}
        got = {(r["transect_id"], r["image_id"]): float(r["chainage_m"]) for r in csv.DictReader(open(back))}
        check(set(orig) == set(got), "polylines round trip pairs differ")
        err = max(abs(orig[k] - got[k]) for k in got) if got else 1e9
        check(err < 1e-3, "polylines round trip error %.3g m" % err)
        print("polylines -> intersect: %d of %d positions back, max error %.2e m" % (len(got), len(orig), err))

    for f in failures:
        print("FAIL:", f)
    print("check_geoexport:", "FAILED" if failures else "ok")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
