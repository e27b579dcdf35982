#!/usr/bin/python3
"""Trend, serial-correlation interval, t quantiles, annual harmonic and the MAD
constant of the summary (qc/linear_trend, qc/student_t, qc/seasonal_fit,
qc/robust_stats) against independent computations:
  - unweighted rate, intercept and standard error: scipy.stats.linregress
  - weighted rate and residual-scaled standard error: weighted least squares
    solved with numpy.linalg.lstsq on sqrt(w)-scaled rows
  - AR(1) effective sample size (Santer et al. 2000) recomputed with numpy and
    the interval with scipy.stats.t.ppf
  - annual harmonic amplitude and phase: numpy.linalg.lstsq
  - 1.4826 = 1 / Phi^-1(3/4): scipy.stats.norm.ppf(0.75)
Run: /usr/bin/python3 check_trend.py --build-dir B --source-dir S
"""
import argparse
import json
import math
import subprocess
import sys

import numpy as np
from scipy import stats

failures = []


def compare(name, got, want, tol):
    ok = abs(got - want) <= tol * max(1.0, abs(want))
    print(f"{'ok  ' if ok else 'FAIL'} {name}: engine {got:.10g}  reference {want:.10g}  (rel tol {tol:g})")
    if not ok:
        failures.append(name)


def run_probe(build_dir, payload):
    out = subprocess.run([f"{build_dir}/probes/trend_probe"], input=json.dumps(payload), capture_output=True,
                         text=True, check=True)
    return json.loads(out.stdout)


def series(rng, n, weighted, rho):
    t = np.sort(2003.0 + 15.0 * rng.random(n))
    ar = np.zeros(n)
    for i in range(1, n):
        ar[i] = rho * ar[i - 1] + rng.normal()
    sig = rng.uniform(3.0, 12.0, n) if weighted else np.full(n, 1.0)
    x = 150.0 - 0.9 * (t - 2003.0) + 6.0 * np.cos(2 * np.pi * (t - 2000.0) - 0.7) + sig * ar * 0.6 + rng.normal(0, 2, n)
    return t, x, sig


def reference_trend(t, x, sig, weighted):
    w = 1.0 / sig**2 if weighted else np.ones_like(t)
    tm = np.sum(w * t) / np.sum(w)
    a = np.column_stack([np.ones_like(t), t - tm]) * np.sqrt(w)[:, None]
    coef, *_ = np.linalg.lstsq(a, x * np.sqrt(w), rcond=None)
    e = x * np.sqrt(w) - a @ coef
    n = len(t)
    s2 = e @ e / (n - 2)
    cov = s2 * np.linalg.inv(a.T @ a)
    se = math.sqrt(cov[1, 1])
    rho = float(np.sum(e[1:] * e[:-1]) / np.sum(e * e))
    r = min(max(rho, 0.0), 0.999)
    n_eff = n * (1 - r) / (1 + r)
    se_adj = se * math.sqrt((n - 2) / (n_eff - 2))
    q = stats.t.ppf(0.975, n_eff - 2)
    return coef, se, rho, n_eff, se_adj, q


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--source-dir", required=True)
    args = ap.parse_args()
    rng = np.random.default_rng(20261202)

    # Unweighted: scipy.stats.linregress.
    t, x, sig = series(rng, 150, False, 0.0)
    got = run_probe(args.build_dir, {"t_years": t.tolist(), "values_m": x.tolist(), "sigmas_m": sig.tolist(),
                                     "weighted": False, "t_quantile_dofs": [1, 2.5, 7.3, 30, 400]})
    lr = stats.linregress(t, x)
    compare("unweighted rate vs scipy.stats.linregress slope", got["rate_m_per_yr"], lr.slope, 1e-10)
    compare("unweighted SE vs scipy.stats.linregress stderr", got["se_naive_m_per_yr"], lr.stderr, 1e-9)
    compare("unweighted level at mean time vs linregress", got["intercept_m"], lr.intercept + lr.slope * np.mean(t), 1e-10)
    for dof, q in zip([1, 2.5, 7.3, 30, 400], got["t_quantiles_975"]):
        compare(f"t quantile 0.975 dof {dof} vs scipy.stats.t.ppf", q, stats.t.ppf(0.975, dof), 1e-9)
    compare("MAD constant vs 1/scipy.stats.norm.ppf(0.75)", got["mad_to_sigma"], 1.0 / stats.norm.ppf(0.75), 1e-12)

    # Weighted, serially correlated: numpy weighted least squares + scipy t.
    for rho in (0.0, 0.7):
        t, x, sig = series(rng, 300, True, rho)
        got = run_probe(args.build_dir, {"t_years": t.tolist(), "values_m": x.tolist(), "sigmas_m": sig.tolist(),
                                         "weighted": True})
        coef, se, r, n_eff, se_adj, q = reference_trend(t, x, sig, True)
        compare(f"weighted rate (rho {rho}) vs numpy lstsq", got["rate_m_per_yr"], coef[1], 1e-9)
        compare(f"weighted naive SE (rho {rho}) vs numpy covariance", got["se_naive_m_per_yr"], se, 1e-8)
        compare(f"lag-1 autocorrelation (rho {rho}) vs numpy", got["lag1_autocorrelation"], r, 1e-8)
        compare(f"effective sample size (rho {rho}) vs numpy", got["n_effective"], n_eff, 1e-8)
        compare(f"adjusted SE (rho {rho})", got["se_m_per_yr"], se_adj, 1e-8)
        compare(f"CI low (rho {rho}) with scipy.stats.t.ppf", got["ci95_low"], coef[1] - q * se_adj, 1e-8)
        compare(f"CI high (rho {rho}) with scipy.stats.t.ppf", got["ci95_high"], coef[1] + q * se_adj, 1e-8)

        # Annual harmonic with a linear term, numpy lstsq.
        w = np.sqrt(1.0 / sig**2)
        ph = 2 * np.pi * (t - 2000.0)
        a = np.column_stack([np.ones_like(t), t - t.mean(), np.cos(ph), np.sin(ph)]) * w[:, None]
        c, *_ = np.linalg.lstsq(a, x * w, rcond=None)
        compare(f"seasonal amplitude (rho {rho}) vs numpy", got["seasonal_amplitude_m"], math.hypot(c[2], c[3]), 1e-8)
        compare(f"seasonal phase (rho {rho}) vs numpy", got["seasonal_phase_deg"],
                math.degrees(math.atan2(c[3], c[2])) % 360.0, 1e-8)

    if failures:
        print(f"{len(failures)} comparison(s) failed", file=sys.stderr)
        return 1
    print("all comparisons passed")
    return 0


if __name__ == "__main__":
    sys.exit(main())
