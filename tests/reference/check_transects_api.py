#!/usr/bin/env python3
"""The transect geometry of `GET /v1/sites/{site}/transects` against pyproj:
the service stores transects in the site CRS and replies with an RFC 7946
lon/lat LineString origin -> seaward end. Checked here, on a real server:
  - the end is origin + length * (sin az, cos az) in the site CRS (the
    definition of a clockwise-from-grid-north azimuth), to 1 mm;
  - both vertices are pyproj's always_xy transform of those site-CRS points
    (EPSG:32631 -> EPSG:4326), to 1e-8 degree (~1 mm);
  - the site-CRS properties (origin, azimuth, length) are as sent;
  - a transect sent as a lon/lat line comes back at the same lon/lat.
All geometry is invented.
"""
import argparse
import json
import math
import os
import re
import subprocess
import sys
import tempfile
import time
import urllib.request

from pyproj import Transformer

failures = []


def check(cond, what):
    print(("ok   " if cond else "FAIL ") + what)
    if not cond:
        failures.append(what)


def call(base, method, path, key=None, body=None):
    data = json.dumps(body).encode() if body is not None else None
    req = urllib.request.Request(base + path, data=data, method=method)
    if data is not None:
        req.add_header("Content-Type", "application/json")
    if key:
        req.add_header("Authorization", "Bearer " + key)
    with urllib.request.urlopen(req, timeout=30) as r:
        return json.load(r)


def main():
    p = argparse.ArgumentParser()
    p.add_argument("--build-dir", required=True)
    p.add_argument("--source-dir", required=True)
    a = p.parse_args()
    exe = os.path.join(a.build_dir, "server", "strandline")
    to_lon_lat = Transformer.from_crs("EPSG:32631", "EPSG:4326", always_xy=True)
    with tempfile.TemporaryDirectory() as work:
        db = os.path.join(work, "db")
        key = subprocess.run([exe, "keys", "add", "--db", db, "--name", "check", "--role", "write"],
                             check=True, capture_output=True, text=True).stdout.strip()
        log = open(os.path.join(work, "serve.log"), "w+")
        server = subprocess.Popen([exe, "serve", "--db", db, "--port", "0"], stdout=log, stderr=subprocess.STDOUT)
        try:
            base = None
            for _ in range(200):
                log.seek(0)
                m = re.search(r"serving (http://127\.0\.0\.1:\d+)", log.read())
                if m:
                    base = m.group(1)
                    break
                time.sleep(0.05)
            check(base is not None, "the server prints its URL")
            if base is None:
                return 1
            call(base, "POST", "/v1/sites", key,
                 {"id": "plan", "name": "Invented plan check", "crs": "EPSG:32631"})
            # Origins with azimuths in every quadrant; one lon/lat line (no crs member).
            points = [("A", 431000.0, 5902000.0, 180.0, 400.0), ("B", 431250.5, 5901990.25, 161.85, 500.0),
                      ("C", 430800.0, 5902100.0, 247.5, 350.0), ("D", 431500.0, 5901900.0, 95.0, 275.5)]
            features = [{"type": "Feature", "properties": {"transect_id": t, "azimuth_deg": az, "length_m": length},
                         "geometry": {"type": "Point", "coordinates": [x, y]}} for t, x, y, az, length in points]
            put = call(base, "PUT", "/v1/sites/plan/transects", key, {
                "type": "FeatureCollection",
                "crs": {"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::32631"}},
                "features": features})
            got = call(base, "GET", "/v1/sites/plan/transects")
            check(put["features"] == got["features"], "PUT replies with what GET returns")
            by_id = {f["properties"]["transect_id"]: f for f in got["features"]}
            worst_deg, worst_m = 0.0, 0.0
            for t, x, y, az, length in points:
                f = by_id[t]
                props = f["properties"]
                check(abs(props["origin_x_m"] - x) < 1e-6 and abs(props["origin_y_m"] - y) < 1e-6 and
                      abs(props["azimuth_deg"] - az) < 1e-9 and abs(props["length_m"] - length) < 1e-9,
                      "%s: site-CRS properties as sent" % t)
                check(f["geometry"]["type"] == "LineString" and len(f["geometry"]["coordinates"]) == 2,
                      "%s: a two-vertex LineString" % t)
                end_x = x + length * math.sin(math.radians(az))
                end_y = y + length * math.cos(math.radians(az))
                for (px, py), (lon, lat) in zip([(x, y), (end_x, end_y)], f["geometry"]["coordinates"]):
                    elon, elat = to_lon_lat.transform(px, py)
                    worst_deg = max(worst_deg, abs(lon - elon), abs(lat - elat))
                # The end back in the site CRS: the azimuth convention, in metres.
                back = Transformer.from_crs("EPSG:4326", "EPSG:32631", always_xy=True)
                bx, by = back.transform(*f["geometry"]["coordinates"][1])
                worst_m = max(worst_m, math.hypot(bx - end_x, by - end_y))
            check(worst_deg < 1e-8, "vertices = pyproj always_xy EPSG:32631 -> 4326 (max error %.1e deg)" % worst_deg)
            check(worst_m < 1e-3, "end = origin + length (sin az, cos az) (max error %.1e m)" % worst_m)

            # A lon/lat line in: the same lon/lat out.
            line = [[3.05, 53.26], [3.0512, 53.2565]]
            call(base, "PUT", "/v1/sites/plan/transects", key, {
                "type": "FeatureCollection",
                "features": [{"type": "Feature", "properties": {"transect_id": "L"},
                              "geometry": {"type": "LineString", "coordinates": line}}]})
            got = call(base, "GET", "/v1/sites/plan/transects")["features"][0]["geometry"]["coordinates"]
            err = max(abs(got[i][j] - line[i][j]) for i in range(2) for j in range(2))
            check(err < 1e-8, "a lon/lat line comes back at its lon/lat (max error %.1e deg)" % err)
        finally:
            server.terminate()
            server.wait(timeout=30)
    if failures:
        print("%d failed" % len(failures))
        return 1
    print("all passed")
    return 0


if __name__ == "__main__":
    sys.exit(main())
