"""The published spectral slope method (Vos et al. 2020) written the way a
practitioner would write it by hand with numpy and scipy: a loop over candidate
slopes, each corrected series linearly detrended (a least-squares line in time)
and its unnormalised Lomb-Scargle periodogram (scipy.signal.lombscargle, angular
frequencies) on 4000 frequencies from 1/400 to 1/10 cycles per day; the band
energy integrated (trapezoid) over the tide's peak +- 8.64e-4 cycles per day;
the slope with the least energy. The tidal peak is the maximum of the
periodogram of the water level at the image times.
  /usr/bin/python3 slope_reference.py transects.csv > reference.json
Times are CPU seconds per transect, excluding file loading.
"""
import csv
import json
import sys
import time
from collections import defaultdict

import numpy as np
import scipy
import scipy.signal as signal


def detrend(t, y):
    slope, intercept = np.polyfit(t, y, 1)
    return y - (intercept + slope * t)


def reference_slope(t, x, w):
    freqs = np.linspace(1 / 400, 1 / 10, 4000)  # cycles per day
    omegas = 2 * np.pi * freqs
    tide_psd = signal.lombscargle(t, detrend(t, w), omegas, precenter=False, normalize=False)
    peak = freqs[np.argmax(tide_psd)]
    band = np.abs(freqs - peak) <= 8.64e-4
    slopes = np.arange(0.01, 0.2 + 1e-9, 0.0025)
    energy = np.empty(slopes.size)
    for i, tan_beta in enumerate(slopes):
        corrected = detrend(t, x + w / tan_beta)
        psd = signal.lombscargle(t, corrected, omegas, precenter=False, normalize=False)
        energy[i] = np.trapz(psd[band], freqs[band])
    return float(slopes[np.argmin(energy)]), float(1 / peak)


def main():
    rows = defaultdict(lambda: ([], [], []))
    with open(sys.argv[1]) as f:
        for r in csv.DictReader(f):
            t, x, w = rows[r["transect_id"]]
            t.append(float(r["time_days"]))
            x.append(float(r["x_m"]))
            w.append(float(r["w_m"]))
    out = []
    for tid, (t, x, w) in rows.items():
        t, x, w = np.array(t), np.array(x), np.array(w)
        start = time.process_time()
        slope, period = reference_slope(t, x, w)
        seconds = time.process_time() - start
        out.append({"transect_id": tid, "slope": slope, "seconds": seconds, "band_period_days": period})
        print(f"{tid}: slope {slope:.4f} in {seconds:.2f} s", file=sys.stderr)
    json.dump({"scipy": scipy.__version__, "numpy": np.__version__, "transects": out}, sys.stdout, indent=2)


if __name__ == "__main__":
    main()
