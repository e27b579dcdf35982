"""Shared helpers of the tide reference checks: the npm reference project
(tests/reference/tide_npm, @neaps/tide-predictor and @neaps/tide-database, MIT
code) and the mapping of station constituent names to ours.

Station data: @neaps/tide-database, compiled from the US National Oceanic and
Atmospheric Administration (CO-OPS), TICON-4, the Canadian Hydrographic Service
and Kartverket (Norwegian Mapping Authority, Hydrographic Service); station
locations derived with GeoNames (CC BY 4.0); see the package's NOTICE and README.
"""
import json
import os
import subprocess

# Names some agencies spell differently from us (the rest match ignoring case).
ALIASES = {"LAM2": "LAMBDA2", "RHO": "RHO1", "SIG1": "SIGMA1"}


def npm_dir(source_dir):
    return os.path.join(source_dir, "tests", "reference", "tide_npm")


def ensure_npm(source_dir):
    """Installs the pinned packages when tests/setup_debian.sh has not (npm ci)."""
    d = npm_dir(source_dir)
    if not os.path.isdir(os.path.join(d, "node_modules", "@neaps", "tide-predictor")):
        subprocess.run(["npm", "ci", "--no-audit", "--no-fund", "--loglevel=error"], cwd=d, check=True)
    with open(os.path.join(d, "node_modules", "@neaps", "tide-predictor", "package.json")) as f:
        predictor = json.load(f)["version"]
    with open(os.path.join(d, "node_modules", "@neaps", "tide-database", "package.json")) as f:
        database = json.load(f)["version"]
    return predictor, database


def reference(source_dir, request):
    out = subprocess.run(["node", "reference_tide.mjs"], cwd=npm_dir(source_dir), input=json.dumps(request),
                         capture_output=True, text=True, check=True)
    return json.loads(out.stdout)


def our_canonical_names(build_dir, station_names):
    """{station name: our canonical name} for the names our table knows (via the probe)."""
    asked = {n: ALIASES.get(n.upper(), n) for n in station_names}
    out = subprocess.run([os.path.join(build_dir, "probes", "tide_probe")],
                         input=json.dumps({"names": sorted(set(asked.values())), "times": ["2020-01-01T00:00:00Z"]}),
                         capture_output=True, text=True, check=True)
    row = json.loads(out.stdout)[0]
    return {n: row[a]["name"] for n, a in asked.items() if row.get(a) is not None}


def write_constituent_file(path, constituents, z0_m=0.0):
    doc = {"datum": "MSL", "z0_m": z0_m, "z0_rate_m_per_yr": 0.0, "z0_epoch": "2000-01-01T00:00:00Z",
           "constituents": [{"name": c["name"], "amplitude_m": c["amplitude"], "phase_deg": c["phase"]}
                            for c in constituents]}
    with open(path, "w") as f:
        json.dump(doc, f, indent=1)


def read_levels_csv(path):
    times, levels = [], []
    with open(path) as f:
        header = f.readline().strip()
        assert header == "time,level_m", header
        for line in f:
            t, v = line.strip().split(",")
            times.append(t)
            levels.append(float(v))
    return times, levels
