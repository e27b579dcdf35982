#!/usr/bin/python3
"""Linear wave theory of strandline (corrections/waves/linear_waves.cpp) against
an independent computation: the dispersion root omega^2 = g k tanh(k h) found by
scipy.optimize.brentq on a bracket, and group velocity / shoaling coefficient
from the textbook formulas in numpy (Dean & Dalrymple; Shore Protection Manual
1984, App. C). Cases span deep, intermediate and shallow water."""
import argparse
import json
import subprocess
import sys

import numpy as np
from scipy.optimize import brentq

G = 9.80665


def exact(period, depth):
    omega = 2 * np.pi / period
    if depth is None:
        k = omega ** 2 / G
        return k, 0.5 * omega / k, 1.0
    f = lambda k: omega ** 2 - G * k * np.tanh(k * depth)
    k0 = omega ** 2 / G
    # f > 0 for k -> 0+, f < 0 at k = omega/sqrt(g h) * 2 and beyond k0: bracket [tiny, max(k0, shallow k) * 2]
    k = brentq(f, 1e-12, 2 * max(k0, omega / np.sqrt(G * depth)), xtol=1e-16, rtol=4 * np.finfo(float).eps, maxiter=500)
    kh = k * depth
    n = 0.5 if kh > 350 else 0.5 * (1 + 2 * kh / np.sinh(2 * kh))
    cg = n * omega / k
    cg0 = 0.5 * G / omega
    return k, cg, np.sqrt(cg0 / cg)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--source-dir", required=True)
    args = ap.parse_args()

    cases = []
    for period in [2.0, 5.0, 8.0, 10.0, 12.0, 16.0, 20.0, 25.0]:
        for depth in [0.05, 0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 200.0, 1000.0, 5000.0, None]:
            cases.append({"period_s": period, "depth_m": depth})
    probe = f"{args.build_dir}/probes/linear_wave_probe"
    out = subprocess.run([probe], input=json.dumps({"cases": cases}), capture_output=True, text=True, check=True)
    results = json.loads(out.stdout)["results"]

    worst_k = worst_cg = worst_ks = worst_h0 = 0.0
    failures = 0
    for c, r in zip(cases, results):
        k, cg, ks = exact(c["period_s"], c["depth_m"])
        rel_k = abs(r["k_rad_m"] - k) / k
        rel_cg = abs(r["group_velocity_m_s"] - cg) / cg
        rel_ks = abs(r["shoaling_coefficient"] - ks) / ks
        rel_h0 = abs(r["h0_per_h"] - 1.0 / ks) * ks
        worst_k, worst_cg, worst_ks, worst_h0 = (max(worst_k, rel_k), max(worst_cg, rel_cg),
                                                 max(worst_ks, rel_ks), max(worst_h0, rel_h0))
        if rel_k > 1e-12 or rel_cg > 1e-11 or rel_ks > 1e-11 or rel_h0 > 1e-11:
            failures += 1
            print(f"MISMATCH T={c['period_s']} h={c['depth_m']}: k {r['k_rad_m']} vs {k}, "
                  f"Cg {r['group_velocity_m_s']} vs {cg}, Ks {r['shoaling_coefficient']} vs {ks}")
    print(f"{len(cases)} cases (T 2-25 s, h 0.05 m to deep water) vs scipy.optimize.brentq dispersion root:")
    print(f"  max relative error  k {worst_k:.2e}  Cg {worst_cg:.2e}  Ks {worst_ks:.2e}  H0/H {worst_h0:.2e}")

    # The minimum of the shoaling coefficient, Ks = 0.913 near h/L0 = 0.15 (a
    # textbook fact of linear theory, e.g. Shore Protection Manual 1984 Table C-1;
    # recalled from memory), found by a scan of the probe over h/L0.
    period = 10.0
    l0 = G * period ** 2 / (2 * np.pi)
    ratios = np.linspace(0.05, 0.4, 351)
    scan = [{"period_s": period, "depth_m": float(x * l0)} for x in ratios]
    out = subprocess.run([probe], input=json.dumps({"cases": scan}), capture_output=True, text=True, check=True)
    ks_scan = np.array([r["shoaling_coefficient"] for r in json.loads(out.stdout)["results"]])
    i = int(np.argmin(ks_scan))
    print(f"  min Ks {ks_scan[i]:.4f} at h/L0 {ratios[i]:.3f} (handbook, recalled from memory: 0.913 near 0.15)")
    if abs(ks_scan[i] - 0.913) > 0.001 or abs(ratios[i] - 0.15) > 0.03:
        failures += 1
        print("MISMATCH: shoaling minimum")

    if failures:
        print(f"FAILED: {failures} mismatches")
        return 1
    print("OK")
    return 0


if __name__ == "__main__":
    sys.exit(main())
