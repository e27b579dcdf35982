#!/usr/bin/env bash
# 400 idle connections held open to the front (server/deploy/serve_behind_proxy.sh) take none of
# the service's threads: a fresh request is answered within 2 s while they stay open.
set -euo pipefail
build=$1 source=$2
name=idle
source "$source/tests/integration/lib/front_harness.bash"

# A service with few threads: without the front, 400 idle connections would hold all of them.
start_front -- --db "$work/db" --threads 24 --max-concurrent 6

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
extra_pids=$idle_pid
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
