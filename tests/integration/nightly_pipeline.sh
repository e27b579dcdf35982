#!/usr/bin/env bash
# The nightly pipeline (demo_data/nightly_pipeline.sh, curl only) against a
# live `strandline serve` on loopback: first night loads the history, the
# second adds one day, the third resends it (nothing new, nothing changed).
set -euo pipefail
build=$1 source=$2
bin=$build/server/strandline
gen=$build/demo_data/strandline-demo-gen
work=$(mktemp -d /tmp/strandline-nightly-XXXXXX)
server_pid=
cleanup() { [ -n "$server_pid" ] && kill "$server_pid" 2>/dev/null; wait 2>/dev/null; rm -rf "$work"; }
trap cleanup EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

"$gen" "$work/site" --transects 4 --no-storms > /dev/null
obs=$work/site/observations.csv
total=$(($(wc -l < "$obs") - 1))
# Observations are in image order: the last 4 rows (one image, 4 transects) are "today".
head -n $((total + 1 - 4)) "$obs" > "$work/history.csv"
{ head -n 1 "$obs"; tail -n 4 "$obs"; } > "$work/today.csv"
cut -d, -f1-3 "$work/site/transect_params.csv" > "$work/slopes.csv"

db=$work/service.db
key=$("$bin" keys add --db "$db" --name nightly --role write 2> /dev/null)
"$bin" serve --db "$db" --port 0 > "$work/serve.log" 2>&1 &
server_pid=$!
for _ in $(seq 100); do grep -q "serving http" "$work/serve.log" && break; sleep 0.1; done
base=$(sed -n 's/.*serving \(http:\/\/[0-9.:]*\).*/\1/p' "$work/serve.log")
[ -n "$base" ] || fail "server did not start: $(cat "$work/serve.log")"
case $base in http://127.0.0.1:*) ;; *) fail "not on loopback: $base" ;; esac

auth=(-H "Authorization: Bearer $key")
curl -sSf "${auth[@]}" -H 'Content-Type: application/json' \
  -d '{"id":"bay","name":"Invented bay","crs":"EPSG:32631","reference_elevation_m":0}' "$base/v1/sites" > /dev/null
curl -sSf "${auth[@]}" -X PUT -H 'Content-Type: application/json' --data-binary "@$work/site/transects.geojson" \
  "$base/v1/sites/bay/transects" > /dev/null
curl -sSf "${auth[@]}" -H 'Content-Type: text/csv' --data-binary "@$work/site/water_levels.csv" \
  "$base/v1/sites/bay/water-levels" > /dev/null
curl -sSf "${auth[@]}" -H 'Content-Type: text/csv' --data-binary "@$work/slopes.csv" "$base/v1/sites/bay/slopes" > /dev/null

nightly=$source/demo_data/nightly_pipeline.sh
bash "$nightly" "$base" bay "$key" "$work/history.csv" "$work/out1" > "$work/night1.log" || fail "night 1: $(cat "$work/night1.log")"
n1=$(ls "$work/out1"/*.csv | wc -l)
[ "$n1" -eq 4 ] || fail "night 1 downloaded $n1 series, expected 4"
head -n 1 "$work/out1/T001.csv" | grep -q '^transect_id,time,' || fail "series CSV header"

cp "$work/out1/cursor" "$work/cursor.1"
mkdir -p "$work/out2" && cp "$work/out1/cursor" "$work/out2/cursor"
bash "$nightly" "$base" bay "$key" "$work/today.csv" "$work/out2" > "$work/night2.log" || fail "night 2: $(cat "$work/night2.log")"
grep -q "inserted 4," "$work/night2.log" || fail "night 2 should insert 4 rows: $(cat "$work/night2.log")"
n2=$(ls "$work/out2"/*.csv | wc -l)
[ "$n2" -eq 4 ] || fail "night 2 downloaded $n2 series, expected the 4 transects of the new image"
rows_before=$(wc -l < "$work/out1/T001.csv")
rows_after=$(wc -l < "$work/out2/T001.csv")
[ "$rows_after" -eq $((rows_before + 1)) ] || fail "T001 should have one more row ($rows_before -> $rows_after)"

mkdir -p "$work/out3" && cp "$work/out2/cursor" "$work/out3/cursor"
bash "$nightly" "$base" bay "$key" "$work/today.csv" "$work/out3" > "$work/night3.log" || fail "night 3: $(cat "$work/night3.log")"
grep -q "inserted 0, duplicates 4" "$work/night3.log" || fail "night 3 should be all duplicates: $(cat "$work/night3.log")"
grep -q "0 changed series" "$work/night3.log" || fail "night 3 should change nothing: $(cat "$work/night3.log")"
echo "nightly pipeline: history $n1 series, new day $n2 series, resend 0 changes"
