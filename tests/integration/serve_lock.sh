#!/usr/bin/env bash
# One server per database: a second `serve` on the same file exits 2 naming the
# first (before, it opened the file and marked the first server's running runs
# failed); `keys` keeps working beside the running server; after the first is
# killed with SIGKILL the kernel drops its lock and a new server starts.
set -uo pipefail
build=$1
bin=$build/server/strandline
work=$(mktemp -d /tmp/strandline-serve-lock-XXXXXX)
first= second=
cleanup() {
  for pid in $first $second; do kill -KILL "$pid" 2> /dev/null; done
  wait 2> /dev/null
  rm -rf "$work"
}
trap cleanup EXIT
passed=0 failures=0
ok() { passed=$((passed + 1)); echo "ok: $1"; }
bad() { failures=$((failures + 1)); echo "FAIL: $1" >&2; }

start() {  # LOG: serve on a free port in the background; sets $pid and $base
  "$bin" serve --db "$work/service.db" --port 0 > "$1" 2>&1 &
  pid=$!
  for _ in $(seq 100); do grep -q "serving http" "$1" && break; kill -0 $pid 2> /dev/null || break; sleep 0.1; done
  base=$(sed -n 's/.*serving \(http:\/\/127\.0\.0\.1:[0-9]*\).*/\1/p' "$1")
}

"$bin" keys add --db "$work/service.db" --name first-key --role write > /dev/null 2>&1 || bad "keys add on a new database"
start "$work/first.log"; first=$pid
[ -n "$base" ] || { bad "the first server did not start: $(cat "$work/first.log")"; exit 1; }

status=0
timeout 20 "$bin" serve --db "$work/service.db" --port 0 > "$work/second.log" 2>&1 || status=$?
if [ "$status" = 2 ] && grep -q "is already being served by pid $first on" "$work/second.log"; then
  ok "second serve refused, naming the holder: $(head -1 "$work/second.log")"
else
  bad "second serve: exit $status: $(cat "$work/second.log")"
fi

if "$bin" keys add --db "$work/service.db" --name beside --role read > "$work/key" 2> "$work/keys.err" &&
   "$bin" keys list --db "$work/service.db" 2>&1 | grep -q '^beside,read'; then
  ok "keys add and list work beside the running server"
else
  bad "keys beside the server: $(cat "$work/keys.err")"
fi
code=$(curl -s -o /dev/null -w '%{http_code}' -H "Authorization: Bearer $(cat "$work/key")" "$base/v1/sites")
[ "$code" = 200 ] && ok "the first server accepts the key added beside it" || bad "new key: HTTP $code"

kill -KILL "$first"; wait "$first" 2> /dev/null; first=
start "$work/third.log"; second=$pid
if [ -n "$base" ] && [ "$(curl -s -o /dev/null -w '%{http_code}' "$base/healthz")" = 200 ]; then
  ok "after SIGKILL of the holder a new server starts"
else
  bad "restart after SIGKILL: $(cat "$work/third.log")"
fi
echo "$passed passed, $failures failed"
[ "$failures" -eq 0 ]
