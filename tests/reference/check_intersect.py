#!/usr/bin/env python3
"""Shoreline x transect intersections of `strandline intersect` against an
independent computation: pyproj (always_xy) for the coordinate transformations,
python OGR (GEOS) for the intersections, and a closed-form segment intersection
in numpy as a second, library-free check. Chainage is the distance from the
transect origin along its azimuth (positive seaward). Tolerance: 1 mm.

Cases (all geometry invented):
  A  line transects in a projected CRS (EPSG:32631, GeoPackage) x polylines in
     geographic WGS 84 (GeoPackage), several polylines per image, a meander
     crossing one transect three times (outermost, innermost, omit).
  B  the same polylines in another projected CRS (EPSG:2154, FlatGeobuf).
  C  point transects (azimuth_deg, length_m) in RFC 7946 GeoJSON lon/lat: the
     work CRS is the UTM zone of their centroid, computed here independently.
  D  line transects in GeoJSON lon/lat with --crs EPSG:2154.
"""
import argparse
import csv
import io
import math
import os
import subprocess
import sys
import tempfile

import numpy as np
from osgeo import ogr, osr
from pyproj import CRS, Transformer

ogr.UseExceptions()
osr.UseExceptions()
TOL_M = 1e-3
failures = []


def srs(code):
    s = osr.SpatialReference()
    s.ImportFromEPSG(code)
    s.SetAxisMappingStrategy(osr.OAMS_TRADITIONAL_GIS_ORDER)
    return s


def write_layer(path, driver, epsg, geom_type, fields, features, layer="data"):
    drv = ogr.GetDriverByName(driver)
    if os.path.exists(path):
        drv.DeleteDataSource(path)
    ds = drv.CreateDataSource(path)
    lyr = ds.CreateLayer(layer, srs(epsg), geom_type)
    for name, kind in fields:
        lyr.CreateField(ogr.FieldDefn(name, kind))
    for attrs, wkt in features:
        f = ogr.Feature(lyr.GetLayerDefn())
        for k, v in attrs.items():
            f.SetField(k, v)
        f.SetGeometry(ogr.CreateGeometryFromWkt(wkt))
        lyr.CreateFeature(f)
    ds = None


def linestring(pts):
    return "LINESTRING (" + ", ".join("%.12f %.12f" % p for p in pts) + ")"


# ---- invented site: 12 transects, fan of azimuths around 110-140 deg ----
CX, CY = 506000.0, 5002000.0  # EPSG:32631 metres (lon ~3.08, lat ~45.16)
transects = []
for i in range(12):
    az = 110.0 + 2.5 * i
    ox = CX + 60.0 * i * math.sin(math.radians(az - 90)) - 200 * math.sin(math.radians(az))
    oy = CY + 60.0 * i * math.cos(math.radians(az - 90)) - 200 * math.cos(math.radians(az))
    transects.append(("T%02d" % (i + 1), ox, oy, az, 400.0 + 10 * i))


def end_of(t):
    _, ox, oy, az, ln = t
    return ox + ln * math.sin(math.radians(az)), oy + ln * math.cos(math.radians(az))


# Shorelines in EPSG:32631 first (design), then transformed for the files.
rng = np.random.default_rng(7)
images = []  # (image_id, time, sensor, cloud, rmse, [polylines in 32631])
for k in range(6):
    pts = []
    for i, t in enumerate(transects):
        _, ox, oy, az, ln = t
        c = 150 + 40 * math.sin(k + i / 3.0) + rng.uniform(-5, 5)
        x = ox + c * math.sin(math.radians(az))
        y = oy + c * math.cos(math.radians(az))
        # off the transect a little, so vertices are not on transects
        pts.append((x + 30 * math.sin(math.radians(az + 90)), y + 30 * math.cos(math.radians(az + 90))))
    lines = [pts] if k % 2 == 0 else [pts[:6], pts[5:]]  # split images: two polylines sharing a vertex
    if k == 3:  # a meander: crosses transect T05 three times
        _, ox, oy, az, ln = transects[4]
        ux, uy = math.sin(math.radians(az)), math.cos(math.radians(az))
        px, py = math.sin(math.radians(az + 90)), math.cos(math.radians(az + 90))
        lines.append([(ox + c * ux + s * px, oy + c * uy + s * py) for c, s in
                      [(80, -20), (100, 20), (130, -20), (160, 20)]])
    if k == 5:  # short line: crosses only a few transects
        lines = [pts[2:5]]
    images.append(("IMG%02d" % k, "2020-0%d-1%dT10:3%d:00Z" % (k + 1, k, k), "sensorA" if k % 2 else "sensorB",
                   0.1 * k, 3.0 + k, lines))

to_4326 = Transformer.from_crs(32631, 4326, always_xy=True)
to_2154 = Transformer.from_crs(32631, 2154, always_xy=True)


def shoreline_features(tr):
    feats = []
    for img, time, sensor, cloud, rmse, lines in images:
        for ln in lines:
            xs, ys = tr.transform([p[0] for p in ln], [p[1] for p in ln])
            feats.append(({"time": time, "sensor": sensor, "image_id": img, "cloud_fraction": cloud,
                           "georef_rmse_m": rmse}, linestring(list(zip(xs, ys)))))
    return feats


SHORE_FIELDS = [("time", ogr.OFTString), ("sensor", ogr.OFTString), ("image_id", ogr.OFTString),
                ("cloud_fraction", ogr.OFTReal), ("georef_rmse_m", ogr.OFTReal)]


def reference(shore_path, epsg_shore, work_crs, transect_geoms, rule="outermost"):
    """Independent chainages: pyproj transform of the vertices into the work CRS,
    OGR intersection, dot product along the azimuth."""
    tr = Transformer.from_crs(CRS.from_user_input(epsg_shore), work_crs, always_xy=True)
    ds = ogr.Open(shore_path)
    lyr = ds.GetLayer(0)
    by_image = {}
    for f in lyr:
        g = f.GetGeometryRef()
        parts = [g] if g.GetGeometryType() == ogr.wkbLineString else [g.GetGeometryRef(i) for i in range(g.GetGeometryCount())]
        for p in parts:
            xs, ys = tr.transform([p.GetX(i) for i in range(p.GetPointCount())],
                                  [p.GetY(i) for i in range(p.GetPointCount())])
            by_image.setdefault(f.GetField("image_id"), []).append(list(zip(xs, ys)))
    out = {}
    for tid, ox, oy, az, ln in transect_geoms:
        ux, uy = math.sin(math.radians(az)), math.cos(math.radians(az))
        seg = ogr.CreateGeometryFromWkt(linestring([(ox, oy), (ox + ln * ux, oy + ln * uy)]))
        for img, lines in by_image.items():
            ch_ogr, ch_np = [], []
            for ln_pts in lines:
                hit = seg.Intersection(ogr.CreateGeometryFromWkt(linestring(ln_pts)))
                pts = []
                if hit is not None and not hit.IsEmpty():
                    if hit.GetGeometryType() == ogr.wkbPoint:
                        pts = [(hit.GetX(), hit.GetY())]
                    else:
                        pts = [(hit.GetGeometryRef(i).GetX(), hit.GetGeometryRef(i).GetY()) for i in range(hit.GetGeometryCount())]
                ch_ogr += [(x - ox) * ux + (y - oy) * uy for x, y in pts]
                # closed form: origin + c*u = a + s*(b - a), 0<=c<=ln, 0<=s<=1
                for a, b in zip(ln_pts[:-1], ln_pts[1:]):
                    d = np.array(b) - np.array(a)
                    m = np.array([[ux, -d[0]], [uy, -d[1]]])
                    if abs(np.linalg.det(m)) < 1e-12:
                        continue
                    c, s = np.linalg.solve(m, np.array(a) - np.array([ox, oy]))
                    if -1e-9 <= c <= ln + 1e-9 and -1e-12 <= s <= 1 + 1e-12:
                        ch_np.append(c)
            ch_ogr = sorted(set(round(c, 6) for c in ch_ogr))
            ch_np = sorted(set(round(c, 6) for c in ch_np))
            if not ch_ogr:
                continue
            if len(ch_np) != len(ch_ogr) or max(abs(p - q) for p, q in zip(ch_np, ch_ogr)) > 1e-6:
                failures.append("reference disagrees with itself on %s %s: %s vs %s" % (tid, img, ch_ogr, ch_np))
            if rule == "omit" and len(ch_ogr) > 1:
                continue
            out[(tid, img)] = (ch_ogr[0] if rule == "innermost" else ch_ogr[-1], len(ch_ogr))
    return out


def run_intersect(exe, shore, trans, extra=()):
    cmd = [exe, "intersect", "--shorelines", shore, "--transects", trans, "--out", "-"] + list(extra)
    r = subprocess.run(cmd, capture_output=True, text=True)
    if r.returncode != 0:
        failures.append("%s failed: %s" % (" ".join(cmd), r.stderr))
        return {}, r.stderr
    rows = {}
    for row in csv.DictReader(io.StringIO(r.stdout)):
        rows[(row["transect_id"], row["image_id"])] = (float(row["chainage_m"]), int(row["crossings"]), row)
    return rows, r.stderr


def compare(name, got, want):
    worst = 0.0
    if set(got) != set(want):
        failures.append("%s: pairs differ: only ours %s, only reference %s" %
                        (name, sorted(set(got) - set(want))[:5], sorted(set(want) - set(got))[:5]))
    for key in set(got) & set(want):
        err = abs(got[key][0] - want[key][0])
        worst = max(worst, err)
        if err > TOL_M:
            failures.append("%s %s: chainage %.6f, reference %.6f" % (name, key, got[key][0], want[key][0]))
        if got[key][1] != want[key][1]:
            failures.append("%s %s: %d crossings, reference %d" % (name, key, got[key][1], want[key][1]))
    print("%-42s %3d pairs (reference %3d), max |chainage difference| = %.2e m" % (name, len(got), len(want), worst))


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--source-dir", required=True)
    a = ap.parse_args()
    exe = os.path.join(a.build_dir, "server", "strandline")
    with tempfile.TemporaryDirectory() as tmp:
        tA = os.path.join(tmp, "transects_utm.gpkg")
        write_layer(tA, "GPKG", 32631, ogr.wkbLineString, [("transect_id", ogr.OFTString)],
                    [({"transect_id": t[0]}, linestring([(t[1], t[2]), end_of(t)])) for t in transects], "transects")
        s4326 = os.path.join(tmp, "shore_4326.gpkg")
        write_layer(s4326, "GPKG", 4326, ogr.wkbLineString, SHORE_FIELDS, shoreline_features(to_4326), "shorelines")
        s2154 = os.path.join(tmp, "shore_2154.fgb")
        write_layer(s2154, "FlatGeobuf", 2154, ogr.wkbLineString, SHORE_FIELDS, shoreline_features(to_2154), "shorelines")
        work = CRS.from_epsg(32631)

        # A: geographic shorelines, projected transects; three crossing rules.
        for rule in ["outermost", "innermost", "omit"]:
            got, _ = run_intersect(exe, s4326, tA, ["--crossing", rule])
            compare("A geographic lines, %s" % rule, got, reference(s4326, 4326, work, transects, rule))
            if rule == "outermost" and got.get(("T05", "IMG03"), (0, 0))[1] != 4:
                failures.append("A: IMG03 should cross T05 four times (its shoreline once, the meander three times)")
        got, report = run_intersect(exe, s4326, tA)
        first = next(iter(got.values()))[2] if got else {}
        if first.get("time") != "2020-01-10T10:30:00Z" and ("T01", "IMG00") in got:
            failures.append("A: time not carried: %s" % first.get("time"))
        if "not crossed" not in report:
            failures.append("A: no uncrossed report on stderr")

        # B: the same lines in another projected CRS and format.
        got, _ = run_intersect(exe, s2154, tA)
        compare("B projected lines (EPSG:2154, FlatGeobuf)", got, reference(s2154, 2154, work, transects))

        # C: point transects in RFC 7946 GeoJSON; UTM zone from their centroid.
        lon, lat = to_4326.transform([t[1] for t in transects], [t[2] for t in transects])
        zone = int(math.floor((np.mean(lon) + 180.0) / 6.0)) + 1
        utm = CRS.from_epsg(32600 + zone if np.mean(lat) >= 0 else 32700 + zone)
        to_utm = Transformer.from_crs(4326, utm, always_xy=True)
        tC = os.path.join(tmp, "transect_points.geojson")
        feats = [({"transect_id": t[0], "azimuth_deg": t[3], "length_m": t[4]}, "POINT (%.12f %.12f)" % (lo, la))
                 for t, lo, la in zip(transects, lon, lat)]
        write_layer(tC, "GeoJSON", 4326, ogr.wkbPoint,
                    [("transect_id", ogr.OFTString), ("azimuth_deg", ogr.OFTReal), ("length_m", ogr.OFTReal)], feats)
        geomsC = []
        for t, lo, la in zip(transects, lon, lat):
            x, y = to_utm.transform(lo, la)
            geomsC.append((t[0], x, y, t[3], t[4]))
        got, report = run_intersect(exe, s4326, tC)
        compare("C point transects, UTM zone %d auto" % zone, got, reference(s4326, 4326, utm, geomsC))
        if "EPSG:326%02d" % zone not in report:
            failures.append("C: work CRS EPSG:326%02d not reported: %s" % (zone, report))

        # D: line transects in GeoJSON lon/lat with --crs EPSG:2154.
        tD = os.path.join(tmp, "transect_lines.geojson")
        feats = []
        geomsD = []
        to_l93 = Transformer.from_crs(4326, 2154, always_xy=True)
        for t in transects:
            ex, ey = end_of(t)
            (lo0, lo1), (la0, la1) = to_4326.transform([t[1], ex], [t[2], ey])
            feats.append(({"transect_id": t[0]}, linestring([(lo0, la0), (lo1, la1)])))
            (x0, x1), (y0, y1) = to_l93.transform([lo0, lo1], [la0, la1])
            az = math.degrees(math.atan2(x1 - x0, y1 - y0)) % 360.0
            geomsD.append((t[0], x0, y0, az, math.hypot(x1 - x0, y1 - y0)))
        write_layer(tD, "GeoJSON", 4326, ogr.wkbLineString, [("transect_id", ogr.OFTString)], feats)
        got, _ = run_intersect(exe, s4326, tD, ["--crs", "EPSG:2154"])
        compare("D GeoJSON line transects, --crs EPSG:2154", got, reference(s4326, 4326, CRS.from_epsg(2154), geomsD))

    for f in failures:
        print("FAIL:", f)
    print("check_intersect:", "FAILED" if failures else "ok")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
