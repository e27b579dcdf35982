#!/usr/bin/python3
"""Writes the invented inputs of the golden cases a_stored_slopes_gauge_setup,
c_text_edge_cases and d_runup, and the shared valid inputs of the malformed
cases (malformed/_base). Deterministic (fixed seeds); standard library only.
The files are committed: run this only to change a case deliberately, then
`run_golden.py --update` (see ../README.md).

Case b (estimated slope, harmonic tide, partial gauge) is cut from the demo
generator's site by make_case_b.py.

Physics of the invented data (only so that the numbers look like a beach):
a planar beach face, chainage of the z=0 contour drifting slowly, a tide of
four constituents, Stockdon setup in the waterline, sensor noise.
"""
import csv
import json
import math
import os
import random

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
G = 9.80665
EPOCH_2024 = 1704067200  # 2024-01-01T00:00:00Z


def iso(t):
    import datetime
    return datetime.datetime.fromtimestamp(t, datetime.timezone.utc).strftime("%Y-%m-%dT%H:%M:%SZ")


def tide(t):
    h = (t - EPOCH_2024) / 3600.0
    return (0.82 * math.cos(math.radians(28.9841042 * h - 40)) + 0.27 * math.cos(math.radians(30.0 * h - 75))
            + 0.11 * math.cos(math.radians(15.0410686 * h - 310)) + 0.08 * math.cos(math.radians(13.9430356 * h - 290)))


def waves_at(t, rng_state):
    d = (t - EPOCH_2024) / 86400.0
    hs = 1.1 + 0.6 * math.sin(2 * math.pi * d / 9.3) + 0.35 * math.sin(2 * math.pi * d / 3.7 + 1.0)
    if 30 <= d <= 33:  # a small storm
        hs += 1.8 * math.sin(math.pi * (d - 30) / 3)
    tp = 8.0 + 2.5 * math.sin(2 * math.pi * d / 11.1 + 0.4)
    return max(hs, 0.2), tp, (250 + 20 * math.sin(2 * math.pi * d / 7.0)) % 360


def setup_m(hs, tp, slope):
    l0 = G * tp * tp / (2 * math.pi)
    return 0.35 * slope * math.sqrt(hs * l0)


def transects_geojson(ids, path, x0=431000.0, y0=5902000.0, spacing=100.0):
    features = [{"type": "Feature",
                 "properties": {"transect_id": tid, "azimuth_deg": 180, "length_m": 400},
                 "geometry": {"type": "Point", "coordinates": [x0 + spacing * i, y0]}} for i, tid in enumerate(ids)]
    doc = {"type": "FeatureCollection",
           "crs": {"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::32631"}},
           "features": features}
    with open(path, "w", encoding="utf-8") as f:
        json.dump(doc, f, indent=1, ensure_ascii=False)
        f.write("\n")


def write_csv(path, header, rows, bom=False):
    with open(path, "w", encoding="utf-8-sig" if bom else "utf-8", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(header)
        w.writerows(rows)


def gauge(start, end, step_s, skip=None):
    rows = []
    t = start
    while t <= end:
        if not (skip and skip[0] <= t <= skip[1]):
            rows.append([iso(t), "%.3f" % tide(t)])
        t += step_s
    return rows


def wave_rows(start, end, step_s, depth=None):
    rows = []
    t = start
    while t <= end:
        hs, tp, d = waves_at(t, None)
        row = [iso(t), "%.2f" % hs, "%.1f" % tp, "%.0f" % d]
        if depth is not None:
            row.append("%g" % depth)
        rows.append(row)
        t += step_s
    return rows


def images(rng, start, n, every_days, sensors):
    out = []
    for k in range(n):
        t = start + int(k * every_days * 86400 + rng.uniform(-1800, 1800))
        out.append((t, sensors[k % len(sensors)]))
    return out


def observations(rng, ids, imgs, slopes, image_name, with_setup=True, mode="setup", cloud=None, rmse=None,
                 spikes=(), skip=()):
    rows = []
    for ti, tid in enumerate(ids):
        base = 160.0 + 12.0 * ti
        for k, (t, sensor) in enumerate(imgs):
            if (tid, k) in skip:
                continue
            slope = slopes[tid]
            eta = tide(t)
            hs, tp, _ = waves_at(t, None)
            wave = setup_m(hs, tp, slope) if with_setup else 0.0
            if mode == "runup":
                wave *= 2.4
            sigma = 4.5 if sensor == "smallsat" else 10.0
            x = base - 0.02 * (t - imgs[0][0]) / 86400.0 - (eta + wave) / slope + rng.gauss(0, sigma * 0.4)
            if (tid, k) in spikes:
                x += spikes[(tid, k)]
            row = [tid, iso(t), "%.2f" % x, sensor, image_name(k)]
            if cloud is not None:
                row.append(cloud(k))
            if rmse is not None:
                row.append(rmse(k))
            rows.append(row)
    return rows


def case_a():
    folder = os.path.join(ROOT, "a_stored_slopes_gauge_setup")
    os.makedirs(folder, exist_ok=True)
    rng = random.Random(20260101)
    ids = ["T01", "T02", "T03", "T04", "T05"]
    slopes = {"T01": 0.085, "T02": 0.092, "T03": 0.078, "T04": 0.1, "T05": 0.07}
    start = EPOCH_2024 + 10 * 3600 + 31 * 60
    imgs = images(rng, start, 24, 2, ["sentinel2a", "landsat8", "sentinel2b", "smallsat"])
    # The gauge stops before the last image (no_water_level) and has a 6 h hole around image 9.
    hole = (imgs[9][0] - 3 * 3600, imgs[9][0] + 3 * 3600)
    write_csv(os.path.join(folder, "water_levels.csv"), ["time", "level_m"],
              gauge(EPOCH_2024, imgs[-1][0] - 6 * 3600, 3600, skip=hole))
    write_csv(os.path.join(folder, "waves.csv"), ["time", "hs_m", "tp_s", "dir_deg"],
              wave_rows(EPOCH_2024, EPOCH_2024 + 50 * 86400, 3600))
    write_csv(os.path.join(folder, "slopes.csv"), ["transect_id", "slope", "slope_sigma"],
              [[t, "%.3f" % s, "0.006"] for t, s in slopes.items()])
    cloud = lambda k: "0.92" if k == 5 else ("" if k % 7 == 3 else "%.2f" % (0.05 * (k % 5)))
    rmse = lambda k: "22.5" if k == 13 else "%.1f" % (3 + k % 6)
    spikes = {("T02", 11): 65.0, ("T04", 17): -70.0}
    rows = observations(rng, ids, imgs, slopes, lambda k: "S2_%04d" % k if k % 4 != 1 else "LC8_%04d" % k,
                        cloud=cloud, rmse=rmse, spikes=spikes, skip={("T03", 4), ("T05", 20)})
    write_csv(os.path.join(folder, "observations.csv"),
              ["transect_id", "time", "chainage_m", "sensor", "image_id", "cloud_fraction", "georef_rmse_m"], rows)
    transects_geojson(ids, os.path.join(folder, "transects.geojson"))


def case_c():
    folder = os.path.join(ROOT, "c_text_edge_cases")
    os.makedirs(folder, exist_ok=True)
    rng = random.Random(20260303)
    ids = ["T 1", "Tø2", "T3"]  # a space; a non-ASCII letter (UTF-8)
    slopes = {"T 1": 0.09, "Tø2": 0.08, "T3": 0.1}
    start = EPOCH_2024 + 10 * 3600 + 20 * 60
    imgs = images(rng, start, 14, 3.0, ["sentinel2a", "smallsat"])
    names = {0: "IMG,7", 1: 'IMG"8', 2: "ÎMG-é9", 3: "IMG '10'", 4: 'IMG,"11",x'}
    write_csv(os.path.join(folder, "water_levels.csv"), ["time", "level_m"],
              gauge(EPOCH_2024, EPOCH_2024 + 50 * 86400, 3600))
    write_csv(os.path.join(folder, "slopes.csv"), ["transect_id", "slope"], [[t, "%.3f" % s] for t, s in slopes.items()])
    notes = {0: "calm, clear", 1: 'operator said "ok"', 2: "two\nlines", 3: "ünïcödé note"}
    rows = observations(rng, ids, imgs, slopes, lambda k: names.get(k, "IMG-%02d" % k), with_setup=False,
                        cloud=lambda k: "%.2f" % (0.1 * (k % 3)))
    for i, r in enumerate(rows):
        k = i % len(imgs)
        if k == 6:  # the same instant written with an offset and a space instead of 'T'
            import datetime
            t = datetime.datetime.strptime(r[1], "%Y-%m-%dT%H:%M:%SZ") + datetime.timedelta(hours=2)
            r[1] = t.strftime("%Y-%m-%d %H:%M:%S+02:00")
        r.append(notes.get(k, ""))
    write_csv(os.path.join(folder, "observations.csv"),
              ["transect_id", "time", "chainage_m", "sensor", "image_id", "cloud_fraction", "note"], rows, bom=True)
    transects_geojson(ids, os.path.join(folder, "transects.geojson"))


def case_d():
    folder = os.path.join(ROOT, "d_runup")
    os.makedirs(folder, exist_ok=True)
    rng = random.Random(20260404)
    ids = ["R1", "R2", "R3", "R4", "R5"]
    slopes = {"R1": 0.12, "R2": 0.1, "R3": 0.045, "R4": 0.03, "R5": 0.06}  # steep to flat: both Stockdon regimes
    start = EPOCH_2024 + 10 * 3600 + 45 * 60
    imgs = images(rng, start, 22, 2, ["sentinel2b", "landsat9", "smallsat"])
    write_csv(os.path.join(folder, "water_levels.csv"), ["time", "level_m"],
              gauge(EPOCH_2024, EPOCH_2024 + 50 * 86400, 3600))
    # A nearshore record (depth 18 m, deshoaled); a gap of 14 h around image 8 (no_wave_data).
    wav = [r for r in wave_rows(EPOCH_2024, EPOCH_2024 + 50 * 86400, 3600, depth=18)]
    gap = (imgs[8][0] - 7 * 3600, imgs[8][0] + 7 * 3600)
    import datetime
    wav = [r for r in wav if not gap[0] <= datetime.datetime.strptime(r[0], "%Y-%m-%dT%H:%M:%SZ").replace(
        tzinfo=datetime.timezone.utc).timestamp() <= gap[1]]
    write_csv(os.path.join(folder, "waves.csv"), ["time", "hs_m", "tp_s", "dir_deg", "depth_m"], wav)
    write_csv(os.path.join(folder, "slopes.csv"), ["transect_id", "slope", "slope_sigma"],
              [[t, "%.3f" % s, "0.004"] for t, s in slopes.items()])
    rows = observations(rng, ids, imgs, slopes, lambda k: "IMG_D%03d" % k, mode="runup",
                        spikes={("R2", 14): 80.0})
    write_csv(os.path.join(folder, "observations.csv"), ["transect_id", "time", "chainage_m", "sensor", "image_id"], rows)
    transects_geojson(ids, os.path.join(folder, "transects.geojson"))


def malformed_base():
    folder = os.path.join(ROOT, "malformed", "_base")
    os.makedirs(folder, exist_ok=True)
    rng = random.Random(20260505)
    ids = ["M1", "M2"]
    slopes = {"M1": 0.08, "M2": 0.09}
    start = EPOCH_2024 + 10 * 3600
    imgs = images(rng, start, 6, 3.0, ["sentinel2a", "landsat8"])
    write_csv(os.path.join(folder, "water_levels.csv"), ["time", "level_m"],
              gauge(EPOCH_2024, EPOCH_2024 + 20 * 86400, 3600))
    write_csv(os.path.join(folder, "waves.csv"), ["time", "hs_m", "tp_s", "dir_deg"],
              wave_rows(EPOCH_2024, EPOCH_2024 + 20 * 86400, 3600))
    write_csv(os.path.join(folder, "slopes.csv"), ["transect_id", "slope"], [[t, "%.2f" % s] for t, s in slopes.items()])
    rows = observations(rng, ids, imgs, slopes, lambda k: "IMG_M%02d" % k, cloud=lambda k: "0.10")
    write_csv(os.path.join(folder, "observations.csv"),
              ["transect_id", "time", "chainage_m", "sensor", "image_id", "cloud_fraction"], rows)
    transects_geojson(ids, os.path.join(folder, "transects.geojson"))


if __name__ == "__main__":
    case_a()
    case_c()
    case_d()
    malformed_base()
    print("wrote cases a, c, d and malformed/_base")
