#!/usr/bin/python3
"""Writes the inputs of golden case b_estimated_slope_tide_blend: a window of the
invented demo site (`strandline-demo-gen`, fixed seed) with a few transects,
the site's harmonic constants, and the gauge record cut so that it covers only
the later part of the window (the earlier images take the prediction: blend).

  make_case_b.py --build-dir BUILD

Deterministic for a given generator; the files are committed, so run this only
to change the case deliberately (then run_golden.py --update --case ...)."""
import argparse
import csv
import json
import os
import shutil
import subprocess
import tempfile

HERE = os.path.dirname(os.path.abspath(__file__))
CASE = os.path.join(os.path.dirname(HERE), "b_estimated_slope_tide_blend")
TRANSECTS = ["T002", "T003", "T004"]
FIRST, LAST = "2004-01-01", "2009-01-01"  # the image window (UTC dates, ISO text compares in order)
GAUGE_FROM = "2007-01-01"                  # the gauge covers only the last two of the five years
GAUGE_STEP_MIN = 120


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--build-dir", required=True)
    args = ap.parse_args()
    tmp = tempfile.mkdtemp(prefix="golden-b-")
    try:
        subprocess.run([os.path.join(args.build_dir, "demo_data", "strandline-demo-gen"), tmp, "--transects", "6",
                        "--seed", "2026", "--no-waves"], check=True, stdout=subprocess.DEVNULL)
        os.makedirs(CASE, exist_ok=True)
        with open(os.path.join(tmp, "observations.csv"), newline="") as f:
            reader = csv.reader(f)
            header = next(reader)
            col = {n: i for i, n in enumerate(header)}
            rows = [r for r in reader if r[col["transect_id"]] in TRANSECTS and FIRST <= r[col["time"]] < LAST]
        rows.sort(key=lambda r: (TRANSECTS.index(r[col["transect_id"]]), r[col["time"]]))
        with open(os.path.join(CASE, "observations.csv"), "w", newline="") as f:
            w = csv.writer(f, lineterminator="\n")
            w.writerow(header)
            w.writerows(rows)
        with open(os.path.join(tmp, "water_levels.csv"), newline="") as f:
            reader = csv.reader(f)
            wl_header = next(reader)
            levels = [r for r in reader if GAUGE_FROM <= r[0] < LAST and (int(r[0][11:13]) * 60 + int(r[0][14:16])) % GAUGE_STEP_MIN == 0]
        with open(os.path.join(CASE, "water_levels.csv"), "w", newline="") as f:
            w = csv.writer(f, lineterminator="\n")
            w.writerow(wl_header)
            w.writerows(levels)
        shutil.copy(os.path.join(tmp, "tide_constituents.json"), os.path.join(CASE, "tide_constituents.json"))
        with open(os.path.join(tmp, "transects.geojson")) as f:
            doc = json.load(f)
        doc["features"] = [ft for ft in doc["features"] if ft["properties"]["transect_id"] in TRANSECTS]
        with open(os.path.join(CASE, "transects.geojson"), "w") as f:
            json.dump(doc, f, indent=1)
            f.write("\n")
        print(f"case b: {len(rows)} observations, {len(levels)} gauge samples")
    finally:
        shutil.rmtree(tmp, ignore_errors=True)


if __name__ == "__main__":
    main()
