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
# The stored gzip member decodes, with GNU gzip and with curl's zlib, to the
# identity document byte for byte.
series="$BASE/v1/sites/cove/transects/T1/series?format=json"
curl -sf "$series" > "$work/identity.json"
curl -sf -D "$work/gz.headers" -H 'Accept-Encoding: gzip' "$series" > "$work/series.gz"
grep -qi '^Content-Encoding: gzip' "$work/gz.headers" || fail "no gzip member: $(cat "$work/gz.headers")"
gzip -dc "$work/series.gz" | cmp -s - "$work/identity.json" || fail "gzip -dc of the member differs from the document"
curl -sf --compressed "$series" | cmp -s - "$work/identity.json" || fail "curl --compressed differs from the document"
grep -q '"items":\[{"etag"' "$work/out.txt" || grep -q '"transect_id":"T1"' "$work/out.txt" || fail "changes"
# Keys: list shows no secret; a revoked key is refused.
"$bin" keys list --db "$work/db" | grep -q '^readme,write,' || fail "keys list"
"$bin" keys list --db "$work/db" | grep -qF "$KEY" && fail "keys list shows the secret"
"$bin" keys revoke --db "$work/db" --name readme 2> /dev/null
status=$(curl -s -o /dev/null -w '%{http_code}' -H "Authorization: Bearer $KEY" -H 'Content-Type: application/json' \
  -d '{}' "$BASE/v1/sites/cove/runs")
[ "$status" = 401 ] || fail "revoked key gave HTTP $status"
echo "README examples ran: $(grep -c . "$work/examples.sh") lines"
