#!/usr/bin/python3
"""Offsets between sensor families and the per-sensor noise report
(qc/sensor_offset_estimate, qc/sensor_offset_step, qc/summary) against an
independent computation with numpy/scipy on random points:
  - bins: floor(time / bin width); per bin the difference of the two families'
    medians (numpy.median) and weight 1 / (sum sigma_f^2 / n_f^2 + sum sigma_r^2 / n_r^2)
  - offset and residual-scaled SE: weighted least squares of the bin differences on
    a constant column (numpy.linalg.lstsq on sqrt(w)-scaled rows), s^2 from its residuals
  - AR(1) effective number of bins (Santer et al. 2000) with numpy, the interval
    with scipy.stats.t.ppf(0.975, n_eff - 1)
  - site: per bin the weighted mean of the transects' differences, weights summed
  - noise: scipy.stats.median_abs_deviation(numpy.diff(x), scale='normal') / sqrt(2)
    over consecutive points of one sensor per transect, pooled
Run: /usr/bin/python3 check_sensor_offsets.py --build-dir B --source-dir S
"""
import argparse
import json
import math
import subprocess
import sys

import numpy as np
from scipy import stats

failures = []
SIGMA = {"landsat8": 12.0, "sentinel2a": 10.0, "sentinel2b": 10.0}  # built-in table (server/FORMATS.md)
FAMILY = {"landsat8": "landsat", "sentinel2a": "sentinel2", "sentinel2b": "sentinel2"}
T0, DAY = 1.5e9, 86400.0  # the probe's time base (tests/unit/qc_series.h)


def compare(name, got, want, tol):
    ok = got is not None and abs(got - want) <= tol * max(1.0, abs(want))
    print(f"{'ok  ' if ok else 'FAIL'} {name}: engine {got}  reference {want:.10g}  (rel tol {tol:g})")
    if not ok:
        failures.append(name)


def bins_of(rows, bin_days):
    """rows: (time_s, sensor, x) of one transect -> {bin: (d, w, n_f, n_r)}"""
    out = {}
    keys = sorted({math.floor(t / (bin_days * DAY)) for t, _, _ in rows})
    for b in keys:
        f = [(x, s) for t, s, x in rows if math.floor(t / (bin_days * DAY)) == b and FAMILY[s] == "sentinel2"]
        r = [(x, s) for t, s, x in rows if math.floor(t / (bin_days * DAY)) == b and FAMILY[s] == "landsat"]
        if not f or not r:
            continue
        var = sum(SIGMA[s] ** 2 for _, s in f) / len(f) ** 2 + sum(SIGMA[s] ** 2 for _, s in r) / len(r) ** 2
        out[b] = (np.median([x for x, _ in f]) - np.median([x for x, _ in r]), 1.0 / var, len(f), len(r))
    return out


def estimate(bins):
    keys = sorted(bins)
    d = np.array([bins[b][0] for b in keys])
    w = np.array([bins[b][1] for b in keys])
    a = np.sqrt(w)[:, None]
    coef, *_ = np.linalg.lstsq(a, d * np.sqrt(w), rcond=None)
    e = d * np.sqrt(w) - a @ coef
    n = len(d)
    se = math.sqrt((e @ e / (n - 1)) * np.linalg.inv(a.T @ a)[0, 0])
    rho = min(max(float(np.sum(e[1:] * e[:-1]) / np.sum(e * e)), 0.0), 0.999)
    n_eff = n * (1 - rho) / (1 + rho)
    se_adj = se * math.sqrt((n - 1) / (n_eff - 1))
    half = stats.t.ppf(0.975, n_eff - 1) * se_adj
    return float(coef[0]), se_adj, n_eff - 1, half, n


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--source-dir", required=True)
    args = ap.parse_args()
    rng = np.random.default_rng(20261203)
    transects, sensors, days, xs = [], [], [], []
    for tr in ("A", "B", "C"):
        level = 0.0
        for day in np.sort(rng.uniform(0, 1500, 260)):
            level += rng.normal(0, 0.3)  # a wandering shoreline: the bins must cancel it
            s = rng.choice(["landsat8", "sentinel2a", "sentinel2b"])
            # An offset drifting slowly: serially correlated bin differences (the AR(1) widening).
            off = 7.5 + 6.0 * math.sin(2 * math.pi * day / 900.0) if FAMILY[s] == "sentinel2" else 0.0
            transects.append(tr), sensors.append(str(s)), days.append(float(day))
            xs.append(100.0 + level + off + SIGMA[s] * rng.standard_t(5))  # heavy tails
    bin_days = 30.0
    out = subprocess.run([f"{args.build_dir}/probes/sensor_offset_probe"],
                         input=json.dumps({"transect": transects, "sensor": sensors, "day": days, "chainage_m": xs,
                                           "bin_days": bin_days, "min_bins": 5,
                                           "reference_family": "landsat"}),
                         capture_output=True, text=True, check=True)
    got = json.loads(out.stdout)

    per_transect = {}
    for tr in ("A", "B", "C"):
        rows = [(T0 + d * DAY, s, x) for t, s, d, x in zip(transects, sensors, days, xs) if t == tr]
        per_transect[tr] = bins_of(rows, bin_days)
        off, se, dof, half, n = estimate(per_transect[tr])
        e = got["transects"][tr][0]
        assert e["family"] == "sentinel2" and e["reference_family"] == "landsat", e
        compare(f"transect {tr} bins", e["n_bins"], n, 0)
        compare(f"transect {tr} offset", e["offset_m"], off, 1e-9)
        compare(f"transect {tr} SE", e["se_m"], se, 1e-9)
        compare(f"transect {tr} dof (n_eff - 1)", e["dof"], dof, 1e-9)
        compare(f"transect {tr} 95% half-width", e["ci95_m"][1] - e["offset_m"], half, 1e-6)

    pooled = {}
    for bins in per_transect.values():
        for b, (d, w, nf, nr) in bins.items():
            sd, sw = pooled.get(b, (0.0, 0.0))
            pooled[b] = (sd + w * d, sw + w)
    pooled = {b: (sd / sw, sw, 0, 0) for b, (sd, sw) in pooled.items()}
    off, se, dof, half, n = estimate(pooled)
    e = got["site"][0]
    compare("site bins", e["n_bins"], n, 0)
    compare("site offset", e["offset_m"], off, 1e-9)
    compare("site SE", e["se_m"], se, 1e-9)
    compare("site dof (n_eff - 1)", e["dof"], dof, 1e-9)
    compare("site 95% half-width", e["ci95_m"][1] - e["offset_m"], half, 1e-6)

    for s in ("landsat8", "sentinel2a", "sentinel2b"):
        diffs = []
        for tr in ("A", "B", "C"):
            seq = [x for t, ss, d, x in sorted(zip(transects, sensors, days, xs), key=lambda r: r[2]) if t == tr and ss == s]
            diffs.extend(np.diff(seq))
        want = stats.median_abs_deviation(diffs, scale="normal") / math.sqrt(2)
        n = next(r for r in got["noise"] if r["sensor"] == s)
        compare(f"{s} differences", n["n"], len(diffs), 0)
        compare(f"{s} measured sigma", n["measured_sigma_m"], want, 1e-12)

    print(f"{len(failures)} failed")
    sys.exit(1 if failures else 0)


if __name__ == "__main__":
    main()
