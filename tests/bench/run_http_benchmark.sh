#!/usr/bin/env bash
# HTTP service benchmark on loopback (never another host), bounded in time:
#   1. CSV upload of N observations (default 1,000,000) in one request: rows
#      stored durably per second (the reply comes after the WAL fsync).
#   2. Series reads with wrk at 64 connections while runs are active on a
#      second site, with and without Accept-Encoding gzip: latency
#      percentiles and errors.
#   bash tests/bench/run_http_benchmark.sh [BUILD_DIR]   -> prints Markdown
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
build="${1:-$root/build}"
rows=${BENCH_ROWS:-1000000}
read_s=${BENCH_READ_S:-15}
bin=$build/server/strandline
gen=$build/demo_data/strandline-demo-gen
command -v wrk > /dev/null || { echo "needs wrk (apt-get install wrk)"; exit 2; }
tmp=$(mktemp -d /tmp/strandline-http-bench-XXXXXX)
pid=
trap '[ -n "$pid" ] && kill $pid 2>/dev/null; wait 2>/dev/null; rm -rf "$tmp"' EXIT

key=$("$bin" keys add --db "$tmp/bench.db" --name bench --role write 2> /dev/null)
"$bin" serve --db "$tmp/bench.db" --port 0 --threads 96 --max-concurrent 80 > "$tmp/serve.log" 2>&1 &
pid=$!
for _ in $(seq 100); do grep -q "serving http" "$tmp/serve.log" && break; sleep 0.1; done
base=$(sed -n 's/.*serving \(http:\/\/127\.0\.0\.1:[0-9]*\).*/\1/p' "$tmp/serve.log")
[ -n "$base" ] || { cat "$tmp/serve.log"; exit 1; }
auth="Authorization: Bearer $key"

# ---- 1. bulk upload: 1000 transects x (rows/1000) images
"$gen" "$tmp/site" --transects 20 --no-storms > /dev/null
transects=1000
awk -v n=$transects 'BEGIN {
  printf "{\"type\":\"FeatureCollection\",\"crs\":{\"type\":\"name\",\"properties\":{\"name\":\"urn:ogc:def:crs:EPSG::32631\"}},\"features\":[";
  for (i = 1; i <= n; i++) printf "%s{\"type\":\"Feature\",\"properties\":{\"transect_id\":\"B%04d\"},\"geometry\":{\"type\":\"LineString\",\"coordinates\":[[%d,5900000],[%d,5899600]]}}", (i > 1 ? "," : ""), i, 400000 + 20 * i, 400000 + 20 * i;
  print "]}" }' > "$tmp/bulk_transects.geojson"
awk -v n=$transects -v rows=$rows 'BEGIN {
  print "transect_id,time,chainage_m,sensor,image_id,cloud_fraction,georef_rmse_m";
  images = int(rows / n); t0 = 1420070400;
  for (j = 0; j < images; j++) {
    t = t0 + j * 43200; s = strftime("%Y-%m-%dT%H:%M:%SZ", t, 1);
    for (i = 1; i <= n; i++) printf "B%04d,%s,%.2f,sentinel2a,S2_%06d,0.05,4.0\n", i, s, 150 + (i * 7 + j * 13) % 50, j;
  } }' > "$tmp/bulk.csv"
curl -sSf -H "$auth" -H 'Content-Type: application/json' \
  -d '{"id":"bulk","name":"bulk","crs":"EPSG:32631"}' "$base/v1/sites" > /dev/null
curl -sSf -H "$auth" -X PUT -H 'Content-Type: application/json' --data-binary "@$tmp/bulk_transects.geojson" \
  "$base/v1/sites/bulk/transects" > /dev/null
bytes=$(stat -c %s "$tmp/bulk.csv")
curl -sSf -H "$auth" -H 'Content-Type: text/csv' --data-binary "@$tmp/bulk.csv" \
  -w '%{time_total}\n' -o "$tmp/upload.json" "$base/v1/sites/bulk/observations" > "$tmp/upload.time"
upload_s=$(cat "$tmp/upload.time")
inserted=$(sed -n 's/.*"inserted":\([0-9]*\).*/\1/p' "$tmp/upload.json")
echo "### CSV upload"
echo "| rows | body MiB | seconds (request to reply) | rows stored/s |"
echo "| ---: | ---: | ---: | ---: |"
awk -v r="$inserted" -v b="$bytes" -v s="$upload_s" 'BEGIN { printf "| %d | %.1f | %.2f | %.0f |\n", r, b / 1048576, s, r / s }'

# ---- 2. series reads while runs are active (the 20-transect demo site, fixed slopes)
site=$tmp/site
curl -sSf -H "$auth" -H 'Content-Type: application/json' \
  -d '{"id":"demo","name":"demo","crs":"EPSG:32631"}' "$base/v1/sites" > /dev/null
curl -sSf -H "$auth" -X PUT -H 'Content-Type: application/json' --data-binary "@$site/transects.geojson" \
  "$base/v1/sites/demo/transects" > /dev/null
curl -sSf -H "$auth" -H 'Content-Type: text/csv' --data-binary "@$site/water_levels.csv" "$base/v1/sites/demo/water-levels" > /dev/null
cut -d, -f1-3 "$site/transect_params.csv" > "$tmp/slopes.csv"
curl -sSf -H "$auth" -H 'Content-Type: text/csv' --data-binary "@$tmp/slopes.csv" "$base/v1/sites/demo/slopes" > /dev/null
curl -sSf -H "$auth" -H 'Content-Type: text/csv' --data-binary "@$site/observations.csv" "$base/v1/sites/demo/observations" > /dev/null
wait_idle() {
  for _ in $(seq 600); do
    curl -sSf "$base/healthz" | grep -q '"runs_active":0' && return 0
    sleep 0.5
  done
  return 1
}
curl -sSf -H "$auth" -H "Content-Type: application/json" -d "{}" "$base/v1/sites/demo/runs?transects=all" > /dev/null
wait_idle
# Keep runs going through the whole read window: the bulk site (1000 transects)
# and the demo site, queued back to back.
for _ in 1 2 3; do
  curl -sSf -H "$auth" -H "Content-Type: application/json" -d "{}" "$base/v1/sites/bulk/runs?transects=all" > /dev/null
  curl -sSf -H "$auth" -H "Content-Type: application/json" -d "{}" "$base/v1/sites/demo/runs?transects=all" > /dev/null
done
sleep 1
# The dashboard's reads: a browser sends Accept-Encoding, and the series is
# stored gzip-compressed by its run. A second window without it (curl, wrk's
# default) measures the identity documents.
series_lua() {
  cat <<LUA
local n = 0
request = function()
  n = n + 1
  return wrk.format("GET", string.format("/v1/sites/demo/transects/T%03d/series?format=json", (n % 20) + 1), {$1})
end
LUA
}
# State and progress of the bulk site's runs (newest first), to show a run is
# really executing during a read window.
run_states() {
  curl -sSf "$base/v1/sites/bulk/runs" | tr '{' '\n' |
    sed -n 's/.*"run_id":\([0-9]*\).*"state":"\([a-z]*\)".*/run \1 \2/p' | tr '\n' ' '
  curl -sSf "$base/v1/sites/bulk/runs" | tr '{' '\n' |
    sed -n 's/.*"transects_done":\([0-9]*\),"transects_total":\([0-9]*\).*/\1\/\2/p' | tr '\n' ' '
}
series_lua '["Accept-Encoding"] = "gzip, deflate, br"' > "$tmp/series_gzip.lua"
series_lua '' > "$tmp/series_identity.lua"
runs_before=$(run_states)
wrk -t2 -c64 -d"${read_s}s" --latency -s "$tmp/series_gzip.lua" "$base" > "$tmp/wrk_gzip.txt"
runs_between=$(run_states)
active_gzip=$(curl -sSf "$base/healthz" | sed -n 's/.*"runs_active":\([0-9]*\).*/\1/p')
wrk -t2 -c64 -d"${read_s}s" --latency -s "$tmp/series_identity.lua" "$base" > "$tmp/wrk_identity.txt"
active_identity=$(curl -sSf "$base/healthz" | sed -n 's/.*"runs_active":\([0-9]*\).*/\1/p')
runs_after=$(run_states)
series_kib=$(( $(curl -sSf "$base/v1/sites/demo/transects/T001/series" | wc -c) / 1024 ))
gzip_kib=$(( $(curl -sSf -H 'Accept-Encoding: gzip' "$base/v1/sites/demo/transects/T001/series" | wc -c) / 1024 ))
echo
echo "### Series reads at 64 connections during runs"
echo "wrk -t2 -c64 -d${read_s}s, 20 transects in rotation; one reply is ${gzip_kib} KiB gzip (${series_kib} KiB JSON)"
echo
echo "Bulk-site runs (state, then transects done/total) before, between and after the windows:"
echo "- $runs_before"
echo "- $runs_between"
echo "- $runs_after"
echo
echo "Accept-Encoding: gzip (as a browser); runs still queued or active at the end: $active_gzip"
echo '```'
sed -n '/Thread Stats/,$p' "$tmp/wrk_gzip.txt"
echo '```'
echo "No Accept-Encoding (identity); runs still queued or active at the end: $active_identity"
echo '```'
sed -n '/Thread Stats/,$p' "$tmp/wrk_identity.txt"
echo '```'
