#!/usr/bin/env bash
# `strandline backup` of a LIVE server's database while a client keeps
# uploading, then `strandline restore` into a fresh path and a second server on
# the restored copy: the uploads it lists are a prefix of those the first
# server acknowledged (at least every upload acknowledged before the backup
# began), each whole (its stored rows = the rows acknowledged). Also: an
# existing backup is not overwritten, a restore into the served database is
# refused, and a non-database is refused with its name.
set -uo pipefail
build=$1 source=$2
bin=$build/server/strandline
work=$(mktemp -d /tmp/strandline-backup-XXXXXX)
server_pid= restored_pid= loop_pid=
cleanup() {
  for pid in $loop_pid $server_pid $restored_pid; do kill "$pid" 2>/dev/null; done
  wait 2>/dev/null
  rm -rf "$work"
}
trap cleanup EXIT
passed=0 failures=0
ok() { passed=$((passed + 1)); echo "ok: $1"; }
bad() { failures=$((failures + 1)); echo "FAIL: $1" >&2; }
finish() { echo "$passed passed, $failures failed"; [ "$failures" -eq 0 ]; exit $?; }

start_server() {  # DB LOG: starts `serve` on a free port, prints its base URL
  "$bin" serve --db "$1" --port 0 > "$2" 2>&1 &
  echo $! > "$2.pid"
  for _ in $(seq 100); do grep -q "serving http" "$2" && break; sleep 0.1; done
  sed -n 's/.*serving \(http:\/\/127\.0\.0\.1:[0-9]*\).*/\1/p' "$2"
}

KEY=$("$bin" keys add --db "$work/live.db" --name loader --role write 2> /dev/null)
BASE=$(start_server "$work/live.db" "$work/live.log")
server_pid=$(cat "$work/live.log.pid")
[ -n "$BASE" ] || { bad "server did not start: $(cat "$work/live.log")"; finish; }
auth=(-H "Authorization: Bearer $KEY")
curl -sf "${auth[@]}" -H 'Content-Type: application/json' \
  -d '{"id":"cove","name":"Invented Cove","crs":"EPSG:32631","reference_elevation_m":0,"default_slope":0.1}' \
  "$BASE/v1/sites" > /dev/null || { bad "create site"; finish; }
curl -sf -X PUT "${auth[@]}" -H 'Content-Type: application/json' --data-binary '{
  "type":"FeatureCollection",
  "crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::32631"}},
  "features":[{"type":"Feature","properties":{"transect_id":"T1","azimuth_deg":180,"length_m":400},
               "geometry":{"type":"Point","coordinates":[431000,5902000]}},
              {"type":"Feature","properties":{"transect_id":"T2","azimuth_deg":180,"length_m":400},
               "geometry":{"type":"Point","coordinates":[431100,5902000]}}]}' \
  "$BASE/v1/sites/cove/transects" > /dev/null || { bad "put transects"; finish; }

# The client: uploads of 60 new rows, one after another, until told to stop;
# every acknowledged upload is logged as "upload_id inserted".
rows=60
: > "$work/acked"
(
  i=0
  while [ ! -e "$work/stop" ]; do
    i=$((i + 1))
    time=$(date -u -d "@$((1704067200 + i * 3600))" +%Y-%m-%dT%H:%M:%SZ)
    awk -v i="$i" -v t="$time" -v n="$rows" 'BEGIN {
      print "transect_id,time,chainage_m,sensor,image_id"
      for (j = 0; j < n; j++) printf "T%d,%s,%.1f,sentinel2a,IMG-%d-%d\n", j % 2 + 1, t, 100 + j * 0.5, i, j }' \
      > "$work/upload.csv"
    reply=$(curl -sf "${auth[@]}" -H 'Content-Type: text/csv' --data-binary @"$work/upload.csv" \
      "$BASE/v1/sites/cove/observations") || { echo "upload $i failed" >> "$work/loop.err"; continue; }
    id=$(printf '%s' "$reply" | sed -n 's/.*"upload_id":\([0-9]*\).*/\1/p')
    inserted=$(printf '%s' "$reply" | sed -n 's/.*"inserted":\([0-9]*\).*/\1/p')
    echo "$id $inserted" >> "$work/acked"
  done
) &
loop_pid=$!
for _ in $(seq 300); do [ "$(wc -l < "$work/acked")" -ge 5 ] && break; sleep 0.1; done

before=$(wc -l < "$work/acked")
if "$bin" backup --db "$work/live.db" --out "$work/nightly.db" --pages-per-step 4 > "$work/backup.out" 2>&1; then
  ok "backup of the live database: $(cat "$work/backup.out")"
else
  bad "backup: $(cat "$work/backup.out")"
fi
after=$(wc -l < "$work/acked")
sleep 0.5  # uploads go on after the backup; none of them may appear in it
touch "$work/stop"
wait "$loop_pid"
loop_pid=
total=$(wc -l < "$work/acked")
echo "uploads acknowledged: $before before the backup, $after when it ended, $total in all"
[ "$total" -gt "$after" ] && ok "uploads went on after the backup" || bad "no upload after the backup"
[ -s "$work/loop.err" ] && bad "client: $(cat "$work/loop.err")"
grep -q 'integrity check ok' "$work/backup.out" && ok "backup reports its check" || bad "backup report"
ls "$work" | grep -q '\.partial' && bad "a partial file was left: $(ls "$work")" || ok "no partial file left"

# An existing backup is kept, unless --force.
cp "$work/nightly.db" "$work/nightly.copy"
if "$bin" backup --db "$work/live.db" --out "$work/nightly.db" > "$work/again.out" 2>&1; then
  bad "an existing backup was overwritten"
else
  code=$?
  [ "$code" = 2 ] && grep -q "nightly.db already exists" "$work/again.out" && ok "existing output refused" ||
    bad "existing output: exit $code, $(cat "$work/again.out")"
fi
cmp -s "$work/nightly.db" "$work/nightly.copy" && ok "existing output untouched" || bad "existing output changed"

# A restore over the database the server uses is refused, and changes nothing.
if "$bin" restore --from "$work/nightly.db" --db "$work/live.db" > "$work/busy.out" 2>&1; then
  bad "restore into a served database went ahead"
else
  grep -q "live.db" "$work/busy.out" && grep -Eq "served|in use" "$work/busy.out" &&
    ok "restore into a served database refused: $(head -1 "$work/busy.out")" || bad "busy restore: $(cat "$work/busy.out")"
fi
curl -sf "$BASE/v1/sites/cove/uploads?limit=1" > /dev/null && ok "the live server still answers" || bad "live server"

# Not a database.
head -c 9000 /dev/urandom > "$work/noise.db"
if "$bin" restore --from "$work/noise.db" --db "$work/other.db" > "$work/noise.out" 2>&1; then
  bad "noise restored"
else
  grep -q "noise.db is not a" "$work/noise.out" && ok "non-database refused" || bad "noise: $(cat "$work/noise.out")"
fi
[ -e "$work/other.db" ] && bad "a refused restore created other.db"

# Restore into a fresh path and serve it.
if "$bin" restore --from "$work/nightly.db" --db "$work/restored.db" > "$work/restore.out" 2>&1; then
  ok "restore: $(cat "$work/restore.out")"
else
  bad "restore: $(cat "$work/restore.out")"; finish
fi
BASE2=$(start_server "$work/restored.db" "$work/restored.log")
restored_pid=$(cat "$work/restored.log.pid")
[ -n "$BASE2" ] || { bad "server on the restored copy did not start: $(cat "$work/restored.log")"; finish; }
curl -sf "$BASE2/v1/sites/cove/uploads?limit=1000" > "$work/listed.json" || bad "list uploads of the restored copy"
if /usr/bin/python3 - "$work/listed.json" "$work/acked" "$work/restored.db" "$before" "$after" "$rows" <<'PY'; then
import json, sqlite3, sys
listed = json.load(open(sys.argv[1]))["items"]
acked = {int(a): int(b) for a, b in (line.split() for line in open(sys.argv[2]) if line.strip())}
before, after, rows = int(sys.argv[4]), int(sys.argv[5]), int(sys.argv[6])
ids = sorted(u["upload_id"] for u in listed)
assert ids == list(range(1, len(ids) + 1)), f"uploads are not a prefix: {ids}"
assert before <= len(ids) <= after + 1, f"{len(ids)} uploads in the copy, acknowledged {before}..{after}"
db = sqlite3.connect(f"file:{sys.argv[3]}?mode=ro", uri=True)
stored = dict(db.execute("SELECT upload_id, COUNT(*) FROM observations GROUP BY upload_id"))
for u in listed:
    i = u["upload_id"]
    assert i in acked, f"upload {i} is in the copy but was never acknowledged"
    assert u["inserted"] == acked[i] == rows, f"upload {i}: inserted {u['inserted']}, acknowledged {acked[i]}"
    assert stored.get(i, 0) == acked[i], f"upload {i}: {stored.get(i, 0)} rows stored, {acked[i]} acknowledged"
assert sum(stored.values()) == len(ids) * rows, (sum(stored.values()), len(ids))
print(f"restored copy: uploads 1..{len(ids)}, {sum(stored.values())} rows, each upload whole")
PY
  ok "restored uploads are a whole prefix of the acknowledged ones"
else
  bad "restored uploads"
fi
# The keys came back with the data: the restored server takes the next upload.
printf 'transect_id,time,chainage_m,sensor,image_id\nT1,2030-01-01T00:00:00Z,150.0,sentinel2a,AFTER-RESTORE\n' |
  curl -sf "${auth[@]}" -H 'Content-Type: text/csv' --data-binary @- "$BASE2/v1/sites/cove/observations" \
  > "$work/next.json" && ok "restored server accepts the restored key" || bad "upload to the restored server"
finish
