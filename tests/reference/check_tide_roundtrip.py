"""Reference check: prediction and harmonic analysis are inverses.

Constants of a real station (the first "mixed" station picked from
@neaps/tide-database; data attribution: NOAA CO-OPS, TICON-4, Canadian
Hydrographic Service, Kartverket, GeoNames CC BY 4.0 - see the package NOTICE)
are predicted with `strandline tide-predict` every 30 min over 372 days (a year
does not quite separate Sa from the mean, S1 from K1 and T2 from S2 by the
Rayleigh criterion), 30% of the samples are removed at random (numpy, seeded),
and `strandline tide-fit` fits the same constituent set. Every constituent the
fit reports as resolvable must come back to 1 mm in amplitude and 0.5 deg in
phase; the mean level to 1 mm. The only independent ingredient is numpy's
random selection; the point is the consistency of the two paths (same V, f, u)
on an irregular, gappy record.
"""
import argparse
import json
import os
import subprocess
import sys
import tempfile

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import tide_common  # noqa: E402

START, END = "2021-03-01T00:00:00Z", "2022-03-08T00:00:00Z"  # 372 days
Z0_M = 0.137


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--source-dir", required=True)
    args = ap.parse_args()
    tide_common.ensure_npm(args.source_dir)
    exe = os.path.join(args.build_dir, "server", "strandline")
    print("numpy", np.__version__)

    station = next(s for s in tide_common.reference(args.source_dir, {"mode": "stations", "per_regime": 4})
                   if s["regime"] == "mixed")
    ours = tide_common.our_canonical_names(args.build_dir, [c["name"] for c in station["constituents"]])
    truth, seen = [], set()
    for c in sorted(station["constituents"], key=lambda c: -c["amplitude"]):
        name = ours.get(c["name"])
        if name and name not in seen and c["amplitude"] > 0:
            seen.add(name)
            truth.append({"name": name, "amplitude": c["amplitude"], "phase": c["phase"] % 360.0})
    print(f"station {station['id']} ({station['name']}, {station['source']}), {len(truth)} constituents")

    failures = 0
    with tempfile.TemporaryDirectory() as tmp:
        cfile = os.path.join(tmp, "truth.json")
        tide_common.write_constituent_file(cfile, truth, z0_m=Z0_M)
        full = os.path.join(tmp, "full.csv")
        subprocess.run([exe, "tide-predict", "--constituents", cfile, "--from", START, "--to", END,
                        "--step-s", "1800", "--out", full], check=True)
        times, levels = tide_common.read_levels_csv(full)
        rng = np.random.default_rng(20261202)
        keep = np.sort(rng.choice(len(times), size=int(round(0.7 * len(times))), replace=False))
        gauge = os.path.join(tmp, "gauge.csv")
        with open(gauge, "w") as f:
            f.write("time,level_m\n")
            for k in keep:
                f.write(f"{times[k]},{levels[k]:.4f}\n")
        print(f"{len(times)} samples predicted, {len(keep)} kept (30% removed at random)")
        fitted_path = os.path.join(tmp, "fit.json")
        names = ",".join(c["name"] for c in truth)  # priority: largest amplitude first
        subprocess.run([exe, "tide-fit", "--water-levels", gauge, "--out", fitted_path, "--constituents", names],
                       check=True)
        with open(fitted_path) as f:
            fit = json.load(f)

    fitted = {c["name"]: c for c in fit["constituents"]}
    unresolved = {u["name"]: u["conflicts_with"] for u in fit["record"]["unresolved"]}
    absorbing = set(unresolved.values())  # a resolvable constituent that absorbs an unresolvable neighbour
    print(f"resolvable {len(fitted)}, unresolvable {sorted(unresolved.items())}")
    print(f"z0: truth {Z0_M:.4f} fit {fit['z0_m']:.4f}; residual std {fit['residual_std_m'] * 1000:.3f} mm")
    if abs(fit["z0_m"] - Z0_M) > 0.001:
        failures += 1
    print(f"{'name':8s} {'H_true_m':>9s} {'H_fit_m':>9s} {'dH_mm':>8s} {'dg_deg':>7s} {'se_H_mm':>8s}")
    for c in truth:
        got = fitted.get(c["name"])
        if got is None:
            continue
        dh = got["amplitude_m"] - c["amplitude"]
        dg = (got["phase_deg"] - c["phase"] + 180.0) % 360.0 - 180.0
        note = ""
        if c["name"] in absorbing:
            note = f"  (absorbs unresolvable {[n for n, w in unresolved.items() if w == c['name']]}; not checked)"
        elif abs(dh) > 0.001 or abs(dg) > 0.5:
            note = "  FAIL"
            failures += 1
        print(f"{c['name']:8s} {c['amplitude']:9.4f} {got['amplitude_m']:9.4f} {dh * 1000:8.4f} {dg:7.3f} "
              f"{got['amplitude_se_m'] * 1000:8.4f}{note}")
    if len(fitted) < 20:
        print("too few resolvable constituents for a meaningful check")
        failures += 1
    print(f"\n{failures} failure(s)")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
