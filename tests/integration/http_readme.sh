#!/usr/bin/env bash
# Runs the HTTP examples of server/FORMATS.md ("HTTP service" > "Examples")
# verbatim against a live `strandline serve` on loopback, then checks what
# they produced.
set -euo pipefail
build=$1 source=$2
bin=$build/server/strandline
work=$(mktemp -d /tmp/strandline-readme-XXXXXX)
server_pid=
cleanup() { [ -n "$server_pid" ] && kill "$server_pid" 2>/dev/null; wait 2>/dev/null; rm -rf "$work"; }
trap cleanup EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

sed -n '/<!-- http-examples -->/,/<!-- \/http-examples -->/p' "$source/server/FORMATS.md" |
  sed '1,2d;$d' | sed '$d' > "$work/examples.sh"
[ "$(wc -l < "$work/examples.sh")" -gt 5 ] || fail "examples not found in server/FORMATS.md"
# A fixed `sleep` in the examples (waiting for the run) becomes a bounded poll of
# the run's state, so the test does not depend on the machine's speed.
{
  cat <<'POLL'
wait_for_run() {  # RUN_ID: poll until done or failed, at most 120 s
  local deadline=$(( $(date +%s) + 120 )) state
  while :; do
    state=$(curl -sf "$BASE/v1/runs/$1" | sed -n 's/.*"state":"\([a-z]*\)".*/\1/p')
    case $state in done|failed) return 0 ;; esac
    [ "$(date +%s)" -lt "$deadline" ] || { echo "run $1 still '$state' after 120 s" >&2; return 1; }
    sleep 0.1
  done
}
POLL
  sed 's/^sleep [0-9.]*$/wait_for_run 1/' "$work/examples.sh"
} > "$work/examples.polled.sh"
mv "$work/examples.polled.sh" "$work/examples.sh"
grep -q '^sleep' "$work/examples.sh" && fail "an example still waits with sleep"

KEY=$("$bin" keys add --db "$work/db" --name readme --role write 2> /dev/null)
"$bin" serve --db "$work/db" --port 0 > "$work/serve.log" 2>&1 &
server_pid=$!
for _ in $(seq 100); do grep -q "serving http" "$work/serve.log" && break; sleep 0.1; done
BASE=$(sed -n 's/.*serving \(http:\/\/127\.0\.0\.1:[0-9]*\).*/\1/p' "$work/serve.log")
[ -n "$BASE" ] || fail "server did not start: $(cat "$work/serve.log")"
export BASE KEY

bash -euo pipefail "$work/examples.sh" > "$work/out.txt" || fail "an example failed: $(cat "$work/out.txt")"
grep -q '"status":"ok"' "$work/out.txt" || fail "healthz"
grep -q '"state":"done"' "$work/out.txt" || fail "the run did not finish: $(cat "$work/out.txt")"
grep -q '^T1,2024-01-01T00:30:00Z,sentinel2a,S2A_20240101,152.300' "$work/out.txt" || fail "series row: $(cat "$work/out.txt")"
grep -q '"chainage_raw_m":152.3,' "$work/out.txt" || fail "JSON series row (--compressed): $(cat "$work/out.txt")"
# The values of the one corrected row, in both formats: the gauge gives 0.5 m at
# 00:30 (halfway between 0.4 and 0.6), one image cannot identify a slope so the
# site's default 0.1 is used (flagged), z_ref 0: correction (0.5 - 0) / 0.1 = 5 m.
curl -sf "$BASE/v1/sites/cove/transects/T1/series?format=json" > "$work/series.json"
curl -sf "$BASE/v1/sites/cove/transects/T1/series?format=csv" > "$work/series.csv"
/usr/bin/python3 - "$work/series.json" "$work/series.csv" <<'PY' || fail "series values"
import csv, json, sys
doc = json.load(open(sys.argv[1]))
rows = doc["rows"]
assert doc["site"] == "cove" and doc["transect_id"] == "T1", doc
assert len(rows) == 1, f"{len(rows)} JSON rows, expected 1"
csv_rows = list(csv.DictReader(open(sys.argv[2], newline="")))
assert len(csv_rows) == 1, f"{len(csv_rows)} CSV rows, expected 1"
r, c = rows[0], csv_rows[0]
want = {"transect_id": "T1", "time": "2024-01-01T00:30:00Z", "sensor": "sentinel2a", "image_id": "S2A_20240101",
        "chainage_raw_m": 152.3, "water_level_m": 0.5, "z_ref_m": 0.0, "slope": 0.1, "correction_m": 5.0,
        "chainage_m": 157.3, "setup_m": None, "runup_m": None, "wave_level_m": None}
for key, value in want.items():
    assert r[key] == value, f"JSON {key}: {r[key]!r}, expected {value!r}"
    text = "" if value is None else (value if isinstance(value, str) else None)
    if text is not None:
        assert c[key] == text, f"CSV {key}: {c[key]!r}, expected {text!r}"
    else:
        assert abs(float(c[key]) - value) < 1e-9, f"CSV {key}: {c[key]!r}, expected {value!r}"
flags = r["flags"]
for name in ("slope_not_identifiable", "default_slope"):
    assert name in flags, f"flag {name} missing: {flags}"
for name in ("no_water_level", "no_slope", "tide_predicted"):
    assert name not in flags, f"unexpected flag {name}: {flags}"
assert c["flags"] == ";".join(flags), f"CSV flags {c['flags']!r} vs JSON {flags}"
assert r["accepted"] is True and c["accepted"] == "1", (r["accepted"], c["accepted"])
assert r["sigma_m"] is not None and r["sigma_m"] > 0, r["sigma_m"]
print("series values checked: 1 row, correction 5.000 m, flags " + ";".join(flags))
PY
# The stored gzip member decodes, with GNU gzip and with curl's zlib, to the
# identity document byte for byte.
series="$BASE/v1/sites/cove/transects/T1/series?format=json"
curl -sf "$series" > "$work/identity.json"
curl -sf -D "$work/gz.headers" -H 'Accept-Encoding: gzip' "$series" > "$work/series.gz"
grep -qi '^Content-Encoding: gzip' "$work/gz.headers" || fail "no gzip member: $(cat "$work/gz.headers")"
gzip -dc "$work/series.gz" | cmp -s - "$work/identity.json" || fail "gzip -dc of the member differs from the document"
curl -sf --compressed "$series" | cmp -s - "$work/identity.json" || fail "curl --compressed differs from the document"
# The changes feed itself (not any reply naming T1): one item, T1 of run 1, with
# the ETag of the series it points at, and a cursor that reports nothing newer.
curl -sf "$BASE/v1/sites/cove/changes?since=0" > "$work/changes.json"
curl -sf -D "$work/series.headers" -o /dev/null "$BASE/v1/sites/cove/transects/T1/series?format=json"
cursor=$(/usr/bin/python3 - "$work/changes.json" "$work/series.headers" <<'PY'
import json, sys
doc = json.load(open(sys.argv[1]))
items = doc["items"]
assert len(items) == 1, f"{len(items)} change items, expected 1: {doc}"
item = items[0]
assert item["transect_id"] == "T1" and item["run_id"] == 1, item
assert "T1/series" in item["series"], item
etag = [l.split(":", 1)[1].strip() for l in open(sys.argv[2]) if l.lower().startswith("etag:")]
assert etag and item["etag"].strip('"') in etag[0], (item["etag"], etag)
assert doc["more"] is False, doc
print(doc["cursor"])
PY
) || fail "changes: $(cat "$work/changes.json")"
curl -sf "$BASE/v1/sites/cove/changes?since=$cursor" | grep -q '"items":\[\]' || fail "changes after the cursor are not empty"
# Keys: list shows no secret; a revoked key is refused.
"$bin" keys list --db "$work/db" | grep -q '^readme,write,' || fail "keys list"
"$bin" keys list --db "$work/db" | grep -qF "$KEY" && fail "keys list shows the secret"
"$bin" keys revoke --db "$work/db" --name readme 2> /dev/null
status=$(curl -s -o /dev/null -w '%{http_code}' -H "Authorization: Bearer $KEY" -H 'Content-Type: application/json' \
  -d '{}' "$BASE/v1/sites/cove/runs")
[ "$status" = 401 ] || fail "revoked key gave HTTP $status"
echo "README examples ran: $(grep -c . "$work/examples.sh") lines"
