#!/usr/bin/env bash
# `strandline correct --sensor-offsets estimate|none|FILE` on the inputs of golden
# case a: a FILE's offset_m is subtracted from that sensor's positions (flagged,
# written as sensor_offset_m, its sigma as sigma_sensor_offset_m and in sigma_m,
# recorded in the summary and the configuration), `none`
# shifts nothing, and a bad FILE row, an unknown mode or "given" without any
# offset_m stop the run with exit 2 and a message naming the file, line and field.
set -uo pipefail
build=$1 source=$2
bin=$build/server/strandline
case_dir=$source/tests/golden/a_stored_slopes_gauge_setup
work=$(mktemp -d /tmp/strandline-offsets-XXXXXX)
trap 'rm -rf "$work"' EXIT
passed=0 failures=0
ok() { passed=$((passed + 1)); echo "ok: $1"; }
bad() { failures=$((failures + 1)); echo "FAIL: $1" >&2; }
finish() { echo "$passed passed, $failures failed"; [ "$failures" -eq 0 ]; exit $?; }
py=/usr/bin/python3

inputs=(--observations "$case_dir/observations.csv" --water-levels "$case_dir/water_levels.csv"
        --waves "$case_dir/waves.csv" --slopes "$case_dir/slopes.csv" --quiet)
printf 'sensor,class,sigma_m,offset_m,offset_sigma_m\nsentinel2a,moderate_resolution,10,5,0.5\n' > "$work/offsets.csv"
printf 'sensor,class,sigma_m,offset_m\nsentinel2a,moderate_resolution,10,\nsentinel2b,moderate_resolution,10,five\n' \
  > "$work/bad.csv"

"$bin" correct "${inputs[@]}" --sensor-offsets none --out "$work/none.csv" --summary "$work/none.json" \
  && ok "none runs" || bad "none run failed"
"$bin" correct "${inputs[@]}" --sensor-offsets "$work/offsets.csv" --out "$work/file.csv" --summary "$work/file.json" \
  && ok "FILE runs" || bad "FILE run failed"

$py - "$work" <<'PY' && ok "FILE shifts sentinel2a by -5 m (flagged, sigma 0.5 m added), none shifts nothing" || bad "FILE/none rows"
import csv, json, math, sys
w = sys.argv[1]
none = list(csv.DictReader(open(f"{w}/none.csv")))
given = list(csv.DictReader(open(f"{w}/file.csv")))
assert len(none) == len(given)
checked = 0
for a, b in zip(none, given):
    assert "sensor_offset_applied" not in a["flags"]
    if not a["chainage_m"]:
        continue
    if b["sensor"] == "sentinel2a":
        assert abs(float(b["chainage_m"]) - (float(a["chainage_m"]) - 5.0)) < 2e-3, (a, b)
        assert abs(float(b["correction_m"]) - (float(a["correction_m"]) - 5.0)) < 2e-3
        assert "sensor_offset_applied" in b["flags"]
        assert b["sensor_offset_m"] == "5.000" and b["sigma_sensor_offset_m"] == "0.50", b
        # sigma_m written with 2 decimals: sqrt(a^2 + 0.5^2) within rounding.
        assert abs(float(b["sigma_m"]) - math.hypot(float(a["sigma_m"]), 0.5)) < 0.011, (a["sigma_m"], b["sigma_m"])
        checked += 1
    else:
        assert a["chainage_m"] == b["chainage_m"], (a, b)
        assert b["sensor_offset_m"] == "" and b["sigma_sensor_offset_m"] == "", b
assert checked > 10, checked
s = json.load(open(f"{w}/file.json"))
assert s["sensor_offsets"]["mode"] == "given"
assert s["sensor_offsets"]["applied"] == [{"sensor": "sentinel2a", "offset_m": 5.0, "sigma_m": 0.5}]
assert s["provenance"]["configuration"]["sensor_offsets"] == "given"
assert any(i["role"] == "sensor_offsets" for i in s["provenance"]["inputs"])
n = json.load(open(f"{w}/none.json"))
assert n["sensor_offsets"]["mode"] == "none" and n["sensor_offsets"]["applied"] == []
assert {x["sensor"] for x in n["sensor_noise"]} == {"landsat8", "sentinel2a", "sentinel2b", "smallsat"}
PY

expect_error() {  # NAME PATTERN ARGS...: exit 2 and PATTERN in stderr
  local name=$1 pattern=$2; shift 2
  "$bin" correct "${inputs[@]}" --out "$work/x.csv" "$@" 2> "$work/err.txt"
  local rc=$?
  if [ "$rc" -eq 2 ] && grep -q -- "$pattern" "$work/err.txt"; then ok "$name"; else
    bad "$name: exit $rc, $(cat "$work/err.txt")"; fi
}
expect_error "bad FILE row names file, line and field" "bad.csv:3: offset_m \"five\"" --sensor-offsets "$work/bad.csv"
expect_error "unknown mode" "option --sensor-offsets \"always\"" --sensor-offsets always
echo '{"sensor_offsets": "given"}' > "$work/given.json"
expect_error "given without offset_m" "lists no offset_m" --config "$work/given.json"
echo '{"sensor_offsets": "sometimes"}' > "$work/bad_config.json"
expect_error "bad configuration value names the pointer" "/sensor_offsets" --config "$work/bad_config.json"
finish
