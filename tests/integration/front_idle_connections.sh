#!/usr/bin/env bash
# 400 idle connections held open to the front (server/deploy/serve_behind_proxy.sh) take none of
# the service's threads: a fresh request is answered within 2 s while they stay open.
set -euo pipefail
build=$1 source=$2
bin=$build/server/strandline
work=$(mktemp -d /tmp/strandline-front-idle-XXXXXX)
script_pid= idle_pid= front_pids=
passed=0 failed=0
cleanup() {
  [ -n "$idle_pid" ] && kill "$idle_pid" 2> /dev/null
  [ -n "$script_pid" ] && kill -TERM "$script_pid" 2> /dev/null
  wait 2> /dev/null
  for pid in $front_pids; do kill -KILL "$pid" 2> /dev/null || true; done
  rm -rf "$work"
}
trap cleanup EXIT
fail() { echo "FAIL: $*" >&2; echo "$passed passed, $((failed + 1)) failed"; exit 1; }
ok() { echo "ok: $*"; passed=$((passed + 1)); }
free_port() { /usr/bin/python3 -c 'import socket; s = socket.socket(); s.bind(("127.0.0.1", 0)); print(s.getsockname()[1])'; }
command -v nginx > /dev/null || [ -x /usr/sbin/nginx ] || fail "nginx is not installed (bash tests/setup_debian.sh)"

# A service with few threads: without the front, 400 idle connections would hold all of them.
port=$(free_port)
bash "$source/server/deploy/serve_behind_proxy.sh" --bin "$bin" --port "$port" -- --db "$work/db" \
  --threads 24 --max-concurrent 6 > "$work/front.log" 2>&1 &
script_pid=$!
for _ in $(seq 300); do
  grep -q '^serve_behind_proxy: front ' "$work/front.log" && break
  kill -0 "$script_pid" 2> /dev/null || fail "the front did not start: $(cat "$work/front.log")"
  sleep 0.1
done
line=$(grep '^serve_behind_proxy: front ' "$work/front.log") || fail "the front did not start in 30 s: $(cat "$work/front.log")"
front_pids=$(echo "$line" | sed -n 's/.*pids: front \([0-9]*\), serve \([0-9]*\);.*/\1 \2/p')
base=http://127.0.0.1:$port

# 400 connections that send nothing; the holder reports how many are still open when asked.
/usr/bin/python3 - "$port" "$work/check" > "$work/idle.out" 2>&1 <<'PY' &
import os, select, socket, sys, time
port, check = int(sys.argv[1]), sys.argv[2]
socks = [socket.create_connection(("127.0.0.1", port), timeout=5) for _ in range(400)]
print("connected", len(socks), flush=True)
while not os.path.exists(check):
    time.sleep(0.05)
readable, _, _ = select.select(socks, [], [], 0)  # a closed connection reads as readable (EOF)
print("open", len(socks) - len(readable), flush=True)
time.sleep(30)
PY
idle_pid=$!
for _ in $(seq 100); do grep -q connected "$work/idle.out" && break; sleep 0.1; done
grep -q 'connected 400' "$work/idle.out" || fail "the 400 idle connections were not made: $(cat "$work/idle.out")"
ok "400 idle connections open"
sleep 0.5

for path in /healthz /v1/openapi.json; do
  result=$(curl -s -m 2 -o "$work/reply" -w '%{http_code} %{time_total}' "$base$path") || true
  status=${result%% *} seconds=${result#* }
  [ "$status" = 200 ] || fail "GET $path through the front gave '${result:-no answer}' within 2 s, expected 200"
  ok "GET $path: 200 in ${seconds} s"
done
grep -q '"openapi"' "$work/reply" || fail "openapi body: $(head -c 300 "$work/reply")"

touch "$work/check"
for _ in $(seq 50); do grep -q '^open' "$work/idle.out" && break; sleep 0.1; done
grep -q '^open 400' "$work/idle.out" || fail "idle connections were closed early: $(cat "$work/idle.out")"
ok "the 400 idle connections were still open afterwards"
echo "$passed passed, $failed failed"
