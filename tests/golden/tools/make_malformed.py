#!/usr/bin/python3
"""Writes tests/golden/malformed/<case>/: one bad input file each (a copy of the
valid file in malformed/_base with one row spoilt) and case.json naming the
input kind and the reason text both faces must show. Deterministic; the files
are committed, so run this only to change a case deliberately."""
import csv
import io
import json
import os

HERE = os.path.dirname(os.path.abspath(__file__))
MAL = os.path.join(os.path.dirname(HERE), "malformed")
BASE = os.path.join(MAL, "_base")


def read(name):
    with open(os.path.join(BASE, name), encoding="utf-8", newline="") as f:
        rows = list(csv.reader(f))
    return rows[0], rows[1:]


def write_case(name, description, kind, filename, header, rows, reason):
    folder = os.path.join(MAL, name)
    os.makedirs(folder, exist_ok=True)
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(header)
    w.writerows(rows)
    with open(os.path.join(folder, filename), "w", encoding="utf-8", newline="") as f:
        f.write(buf.getvalue())
    with open(os.path.join(folder, "case.json"), "w", encoding="utf-8") as f:
        json.dump({"description": description, "kind": kind, "file": filename, "reason": reason}, f, indent=1)
        f.write("\n")


def obs_case(name, description, spoil, reason, header_fn=None):
    header, rows = read("observations.csv")
    rows = [list(r) for r in rows]
    col = {n: i for i, n in enumerate(header)}
    spoil(rows, col)
    if header_fn:
        header = header_fn(list(header))
    write_case(name, description, "observations", "observations.csv", header, rows, reason)


def main():
    # Row 3 of the base file is M1 / IMG_M02 (data rows are transect by transect, six images each).
    def set_cell(r, column, value):
        def spoil(rows, col):
            rows[r][col[column]] = value
        return spoil

    obs_case("unparseable_time", "a time that is not RFC 3339", set_cell(2, "time", "2024-01-07 at noon"),
             ["time", "RFC 3339"])
    obs_case("time_without_zone", "a time without a zone designator", set_cell(2, "time", "2024-01-07T10:00:00"),
             ["time", "missing zone designator"])
    obs_case("cloud_fraction_percent", "cloud_fraction 45: a percentage, not a fraction",
             set_cell(2, "cloud_fraction", "45"), ["cloud_fraction", "not a percentage"])
    obs_case("unknown_sensor", "a sensor missing from the sensor table", set_cell(2, "sensor", "worldview9"),
             ["worldview9", "sensor not in the sensor table"])

    def two_times(rows, col):  # IMG_M02 on M2 (data row 9) an hour later than on M1
        r = rows[8]
        assert r[col["image_id"]] == "IMG_M02"
        hh = int(r[col["time"]][11:13])
        r[col["time"]] = r[col["time"]][:11] + "%02d" % (hh + 1) + r[col["time"]][13:]
    obs_case("image_two_times", "one image id with two times (on two transects)", two_times,
             ["IMG_M02", "one image, one time"])

    def two_sensors(rows, col):  # IMG_M03 on M2 (data row 10) with the other sensor
        r = rows[9]
        assert r[col["image_id"]] == "IMG_M03"
        r[col["sensor"]] = "sentinel2a" if r[col["sensor"]] != "sentinel2a" else "landsat8"
    obs_case("image_two_sensors", "one image id with two sensors (on two transects)", two_sensors,
             ["IMG_M03", "sensor", "one image, one time"])

    def duplicate(rows, col):  # a second M1 / IMG_M02 row with another position
        r = list(rows[2])
        r[col["chainage_m"]] = "%.2f" % (float(r[col["chainage_m"]]) + 7.5)
        rows.insert(4, r)
    obs_case("duplicate_transect_image", "two rows for one (transect, image) pair", duplicate,
             ["duplicate", "IMG_M02", "already has an observation from this image"])

    obs_case("misspelt_cloud_column", "optional column cloud_fraction misspelt cloud_fration",
             lambda rows, col: None, ["cloud_fration", "cloud_fraction"],
             header_fn=lambda h: [("cloud_fration" if n == "cloud_fraction" else n) for n in h])

    header, rows = read("water_levels.csv")
    rows = [list(r) for r in rows]
    rows[40][1] = "500"
    write_case("water_level_500m", "a water level of 500 m (not metres, or a gauge fault)", "water_levels",
               "water_levels.csv", header, rows, ["level_m", "500", "metres"])

    header, rows = read("waves.csv")
    rows = [list(r) for r in rows]
    rows[30][1] = "45"
    write_case("wave_hs_45m", "a wave row with Hs 45 m", "waves", "waves.csv", header, rows,
               ["hs_m", "45", "[0, 30]"])

    header, rows = read("slopes.csv")
    rows = [list(r) for r in rows]
    rows[1][1] = "8"
    write_case("slope_percent", "a slope of 8 (percent given as a number)", "slopes", "slopes.csv", header, rows,
               ["slope", "not degrees or percent"])
    print("wrote", len([d for d in os.listdir(MAL) if not d.startswith("_")]), "malformed cases")


if __name__ == "__main__":
    main()
