#!/usr/bin/env bash
# QC on the demo site through the CLI: every row has flags and accepted, every
# accepted row a sigma_m; the planted gross outliers are mostly rejected; the
# summary has the trend, seasonal and cautions keys and honours --trend-from.
set -euo pipefail
build="$1"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
"$build/demo_data/strandline-demo-gen" "$tmp"
"$build/server/strandline" correct --observations "$tmp/observations.csv" --water-levels "$tmp/water_levels.csv" \
  --transect-params "$tmp/transect_params.csv" --waves "$tmp/waves.csv" --out "$tmp/cleaned.csv" \
  --summary "$tmp/summary.json" --trend-from 2015-01-01T00:00:00Z --quiet
if "$build/server/strandline" correct --observations "$tmp/observations.csv" --water-levels "$tmp/water_levels.csv" \
  --transect-params "$tmp/transect_params.csv" --out "$tmp/x.csv" --trend-from 2015-13-01T00:00Z --quiet 2> "$tmp/err"; then
  echo "FAIL: bad --trend-from accepted"; exit 1
fi
grep -q -- "--trend-from" "$tmp/err" || { echo "FAIL: error does not name --trend-from: $(cat "$tmp/err")"; exit 1; }
/usr/bin/python3 - "$tmp" <<'PY'
import csv, json, sys
d = sys.argv[1]
truth = {(r["transect_id"], r["image_id"]): r for r in csv.DictReader(open(f"{d}/truth_points.csv"))}
rows = list(csv.DictReader(open(f"{d}/cleaned.csv")))
gross = rejected_gross = good = rejected_good = 0
for r in rows:
    assert r["accepted"] in ("0", "1"), r
    assert "flags" in r
    if r["accepted"] == "1":
        assert r["sigma_m"] != "" and float(r["sigma_m"]) > 0, r
    if r["chainage_m"] == "":
        continue
    t = truth[(r["transect_id"], r["image_id"])]
    if t["outlier_kind"] != "none" and abs(float(t["outlier_offset_m"])) > 40:
        gross += 1
        rejected_gross += r["accepted"] == "0"
    elif t["outlier_kind"] == "none":
        good += 1
        rejected_good += r["accepted"] == "0"
print(f"gross outliers rejected {rejected_gross}/{gross}, good points rejected {rejected_good}/{good}")
assert rejected_gross >= 0.95 * gross
assert rejected_good <= 0.02 * good
s = json.load(open(f"{d}/summary.json"))
for t in s["transects"]:
    for key in ("trend", "seasonal", "cautions", "trend_window", "counts_by_flag", "mean_interval_days"):
        assert key in t, key
    assert t["trend_window"]["from"] == "2015-01-01T00:00:00Z"
    if t["trend"] is not None:
        lo, hi = t["trend"]["ci95_m_per_yr"]
        assert lo <= t["trend"]["rate_m_per_yr"] <= hi
steps = [x["step"] for x in s["provenance"]["steps"]]
assert steps.index("correct") < steps.index("hampel") < steps.index("uncertainty"), steps
print("summary keys present on", len(s["transects"]), "transects")
PY
echo "1 passed, 0 failed"
