#!/usr/bin/env bash
# The tide commands end to end: tide-predict CSV, tide-fit round trip on a
# gappy record, clear errors (exit 2 naming file and entry), and `correct` with
# --tide-constituents alone and blended with a gauge (flag tide_predicted only
# where the gauge has no data).
set -uo pipefail
build="$1"
exe="$build/server/strandline"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
failures=0; passed=0
ok() { echo "ok   $1"; passed=$((passed+1)); }
fail() { echo "FAIL $1"; failures=$((failures+1)); }

# Invented constants (not a real site).
cat > "$tmp/c.json" <<'JSON'
{"datum": "MSL", "z0_m": 0.05, "z0_rate_m_per_yr": 0.003, "z0_epoch": "2000-01-01T00:00:00Z",
 "constituents": [{"name": "M2", "amplitude_m": 0.62, "phase_deg": 40.0},
                  {"name": "S2", "amplitude_m": 0.21, "phase_deg": 75.0},
                  {"name": "K1", "amplitude_m": 0.18, "phase_deg": 200.0},
                  {"name": "O1", "amplitude_m": 0.12, "phase_deg": 180.0}]}
JSON

# expect NAME EXPECTED_EXIT MESSAGE_PART -- ARGS...
expect() {
  local name="$1" code="$2" message="$3"; shift 4
  "$exe" "$@" >"$tmp/stdout" 2>"$tmp/stderr"
  local got=$?
  if [[ $got -ne $code ]]; then fail "$name: exit $got, expected $code"; cat "$tmp/stderr"; return; fi
  if ! grep -qF -- "$message" "$tmp/stderr" "$tmp/stdout"; then fail "$name: output lacks '$message'"; cat "$tmp/stderr"; return; fi
  ok "$name"
}

expect predict_stdout 0 'time,level_m' -- tide-predict --constituents "$tmp/c.json" \
  --from 2020-01-01T00:00Z --to 2020-01-02T00:00Z --step-s 600
rows=$(($(wc -l < "$tmp/stdout") - 1))
[[ $rows -eq 145 ]] && ok predict_rows || fail "predict_rows: $rows rows, expected 145"
head -2 "$tmp/stdout" | tail -1 | grep -qE '^2020-01-01T00:00:00Z,-?[0-9]+\.[0-9]{4}$' && ok predict_format || fail predict_format

# 60 days every 20 min, every third sample dropped, then fitted back.
"$exe" tide-predict --constituents "$tmp/c.json" --from 2020-01-01T00:00Z --to 2020-03-01T00:00Z --step-s 1200 \
  --out "$tmp/full.csv" && awk 'NR == 1 || NR % 3 != 0' "$tmp/full.csv" > "$tmp/gauge.csv"
expect fit 0 'constituents fitted' -- tide-fit --water-levels "$tmp/gauge.csv" --out "$tmp/fit.json" \
  --constituents M2,S2,K1,O1,N2,P1
/usr/bin/python3 - "$tmp/fit.json" <<'PY' && ok fit_values || fail fit_values
import json, sys
fit = json.load(open(sys.argv[1]))
got = {c["name"]: c for c in fit["constituents"]}
truth = {"M2": (0.62, 40.0), "S2": (0.21, 75.0), "K1": (0.18, 200.0), "O1": (0.12, 180.0)}
assert set(got) == {"M2", "S2", "K1", "O1", "N2"}, sorted(got)            # P1 needs 183 days
assert [u["name"] for u in fit["record"]["unresolved"]] == ["P1"], fit["record"]["unresolved"]
for name, (h, g) in truth.items():
    assert abs(got[name]["amplitude_m"] - h) < 5e-4, (name, got[name])
    assert abs((got[name]["phase_deg"] - g + 180) % 360 - 180) < 0.2, (name, got[name])
    assert got[name]["resolvable"] is True and got[name]["amplitude_se_m"] > 0
assert got["N2"]["amplitude_m"] < 5e-4
assert 0 <= fit["residual_std_m"] < 1e-3 and fit["record"]["samples"] > 2800
PY
# The fitted file feeds prediction unchanged.
expect predict_from_fit 0 'time,level_m' -- tide-predict --constituents "$tmp/fit.json" \
  --from 2020-02-01T00:00Z --to 2020-02-02T00:00Z --step-s 3600

printf '{"constituents": [{"name": "M2", "amplitude_m": 0.5, "phase_deg": 0}, {"name": "Q7", "amplitude_m": 0.1, "phase_deg": 0}]}' > "$tmp/unknown.json"
expect unknown_constituent 2 'unknown.json: /constituents/1/name "Q7": unknown constituent' -- \
  tide-predict --constituents "$tmp/unknown.json" --from 2020-01-01T00:00Z --to 2020-01-02T00:00Z
printf '{"constituents": [{"name": "M2", "phase_deg": 0}]}' > "$tmp/missing.json"
expect missing_field 2 'missing.json: /constituents/0/amplitude_m "": missing required field' -- \
  tide-predict --constituents "$tmp/missing.json" --from 2020-01-01T00:00Z --to 2020-01-02T00:00Z
# A date alone is midnight UTC; a time without a zone is still refused.
expect bad_time 2 'option --from "2020-01-01T00:00": missing zone designator' -- \
  tide-predict --constituents "$tmp/c.json" --from 2020-01-01T00:00 --to 2020-01-02T00:00Z
head -8 "$tmp/full.csv" > "$tmp/short.csv"  # two hours: under one M8 cycle
expect short_record 2 'resolves no tidal constituent' -- tide-fit --water-levels "$tmp/short.csv" --out "$tmp/x.json"
expect unknown_fit_name 2 'constituent "ZZ9" is unknown' -- tide-fit --water-levels "$tmp/gauge.csv" \
  --out "$tmp/x.json" --constituents M2,ZZ9

# correct: prediction alone, then blended with a gauge covering only the first image.
cat > "$tmp/wl.csv" <<'CSV'
time,level_m
2019-03-01T00:00:00Z,0.10
2019-03-01T01:00:00Z,0.40
CSV
cat > "$tmp/obs.csv" <<'CSV'
transect_id,time,chainage_m,sensor,image_id
T1,2019-03-01T00:30:00Z,100.0,landsat8,a
T1,2019-03-09T01:30:00Z,101.0,landsat8,b
CSV
expect correct_prediction 0 'corrected 2 of 2 rows' -- correct --observations "$tmp/obs.csv" \
  --tide-constituents "$tmp/fit.json" --slope 0.05 --out "$tmp/out1.csv" --summary "$tmp/s1.json"
expect correct_blended 0 'corrected 2 of 2 rows' -- correct --observations "$tmp/obs.csv" --water-levels "$tmp/wl.csv" \
  --tide-constituents "$tmp/fit.json" --slope 0.05 --out "$tmp/out2.csv"
/usr/bin/python3 - "$tmp" <<'PY' && ok correct_flags || fail correct_flags
import csv, json, sys
tmp = sys.argv[1]
alone = list(csv.DictReader(open(f"{tmp}/out1.csv")))
blend = list(csv.DictReader(open(f"{tmp}/out2.csv")))
assert all("tide_predicted" in r["flags"] for r in alone), [r["flags"] for r in alone]
assert "tide_predicted" not in blend[0]["flags"] and abs(float(blend[0]["water_level_m"]) - 0.25) < 1e-9
assert "tide_predicted" in blend[1]["flags"]
assert blend[1]["water_level_m"] == alone[1]["water_level_m"]
# sigma of predicted levels: the fit's residual std (tiny here) divided by the slope
fit = json.load(open(f"{tmp}/fit.json"))
assert abs(float(alone[1]["sigma_water_level_m"]) - fit["residual_std_m"] / 0.05) < 0.01
roles = [f["role"] for f in json.load(open(f"{tmp}/s1.json"))["provenance"]["inputs"]]
assert "tide_constituents" in roles, roles
PY

echo "$passed passed, $failures failed"
[[ $failures -eq 0 ]]
