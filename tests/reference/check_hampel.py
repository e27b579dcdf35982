#!/usr/bin/python3
"""The `hampel` QC step against an independent numpy computation of the Hampel
identifier (Hampel 1974; the MAD scaled by 1.4826 = 1 / Phi^-1(3/4), scipy's
norm.ppf(0.75)) over the exact window:
  - window of point i: every point with |day_j - day_i| <= half_window_days,
    the point itself included (no storm onsets, no widening: 21 points a window);
  - flagged when |x_i - median| > k * max(1.4826 * MAD, noise) and > min_threshold,
    noise = 1.4826 * MAD(successive differences) / sqrt(2) (the step's
    per-sensor-class floor, written out here);
  - 32 planted points sit at 0.98 and 1.02 times their own threshold, both signs:
    a window one point short, a missing 1.4826 or a strict/loose comparison
    flips some of them; every other point's flag must agree too.
The series is invented: a 90-day swing of 25 m plus 0.4 m noise, one image a day."""
import argparse
import json
import subprocess
import sys

import numpy as np
from scipy.stats import norm

HALF_WINDOW_DAYS = 10.0
K = 3.0
MIN_THRESHOLD_M = 0.0
MAD_TO_SIGMA = 1.0 / norm.ppf(0.75)


def noise_floor(x):
    d = np.diff(x)
    return MAD_TO_SIGMA * np.median(np.abs(d - np.median(d))) / np.sqrt(2.0)


def window_stats(day, x, i):
    w = x[np.abs(day - day[i]) <= HALF_WINDOW_DAYS]
    m = np.median(w)
    return m, np.median(np.abs(w - m))


def expected_flags(day, x):
    noise = noise_floor(x)
    flags = []
    for i in range(len(x)):
        m, mad = window_stats(day, x, i)
        dev = abs(x[i] - m)
        flags.append(bool(dev > K * max(MAD_TO_SIGMA * mad, noise) and dev > MIN_THRESHOLD_M))
    return flags


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--source-dir", required=True)
    args = ap.parse_args()
    probe = f"{args.build_dir}/probes/hampel_probe"

    rng = np.random.default_rng(20261203)
    day = np.arange(820, dtype=float)
    x = 200 + 25 * np.sin(2 * np.pi * day / 90) + rng.uniform(-0.4, 0.4, day.size)
    targets = np.arange(15, day.size - 15, 25)  # windows of two targets never overlap
    factors = np.array([(1.02 if j % 2 == 0 else 0.98) * (1 if (j // 2) % 2 == 0 else -1)
                        for j in range(targets.size)])
    # A planted point is the extreme of its window, so the window's median and MAD do not
    # depend on its value; the noise floor (successive differences) does, slightly: iterate.
    for _ in range(6):
        noise = noise_floor(x)
        for i, f in zip(targets, factors):
            x[i] = 1e6 * np.sign(f)
            m, mad = window_stats(day, x, i)
            x[i] = m + f * K * max(MAD_TO_SIGMA * mad, noise)
    want = expected_flags(day, x)

    request = {"day": day.tolist(), "chainage_m": x.tolist(), "half_window_days": HALF_WINDOW_DAYS,
               "min_points": 7, "k": K, "min_threshold_m": MIN_THRESHOLD_M}
    got = json.loads(subprocess.run([probe], input=json.dumps(request), capture_output=True, text=True,
                                    check=True).stdout)["flagged"]
    failures = 0
    for i, (g, w) in enumerate(zip(got, want)):
        if g != w:
            failures += 1
            m, mad = window_stats(day, x, i)
            print(f"MISMATCH point {i}: step {g}, numpy {w} (x {x[i]:.3f}, median {m:.3f}, MAD {mad:.3f})")
    planted_out = sum(want[i] for i in targets)
    if planted_out != int(np.sum(np.abs(factors) > 1)):
        failures += 1
        print(f"MISMATCH the planted points outside their threshold: {planted_out}")
    print(f"{len(x)} points, {targets.size} planted at 0.98/1.02 of their threshold, "
          f"{sum(want)} flagged by numpy, {sum(got)} by the step, {failures} mismatches "
          f"(1.4826 = 1/norm.ppf(0.75) = {MAD_TO_SIGMA:.10f})")
    print("all passed" if failures == 0 else f"{failures} failed")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
