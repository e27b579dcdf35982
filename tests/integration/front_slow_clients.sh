#!/usr/bin/env bash
# The front (server/deploy/serve_behind_proxy.sh: nginx before `strandline serve`) keeps answering
# while 100 clients each dribble a request at one byte per second: /healthz through the front
# still answers 200 within 1 s, every time.
set -euo pipefail
build=$1 source=$2
name=slow
source "$source/tests/integration/lib/front_harness.bash"

start_front -- --db "$work/db"

# 100 connections, each sending "GET /healthz ..." one byte per second (all in step), for 6 s.
/usr/bin/python3 - "$port" > "$work/slow.out" 2>&1 <<'PY' &
import socket, sys, time
port = int(sys.argv[1])
request = b"GET /healthz HTTP/1.1\r\nHost: slow\r\nUser-Agent: one-byte-per-second\r\n\r\n"
socks = [socket.create_connection(("127.0.0.1", port), timeout=5) for _ in range(100)]
print("connected", len(socks), flush=True)
for i in range(6):
    for s in socks:
        s.send(request[i:i + 1])
    time.sleep(1)
print("sent", 6, "bytes each", flush=True)
time.sleep(30)
PY
slow_pid=$!
extra_pids=$slow_pid
for _ in $(seq 100); do grep -q connected "$work/slow.out" && break; sleep 0.1; done
grep -q 'connected 100' "$work/slow.out" || fail "the 100 slow clients did not connect: $(cat "$work/slow.out")"
ok "100 clients connected, sending one byte per second"

# Five fresh requests while they dribble: each 200 within 1 s.
sleep 1
for i in 1 2 3 4 5; do
  result=$(curl -s -m 1 -o "$work/healthz.json" -w '%{http_code} %{time_total}' "$base/healthz") || true
  status=${result%% *} seconds=${result#* }
  [ "$status" = 200 ] || fail "healthz $i through the front gave '${result:-no answer}' within 1 s, expected 200"
  grep -q '"status":"ok"' "$work/healthz.json" || fail "healthz $i body: $(cat "$work/healthz.json")"
  ok "healthz $i: 200 in ${seconds} s"
  sleep 0.5
done
for _ in $(seq 50); do grep -q 'sent 6' "$work/slow.out" && break; sleep 0.1; done
grep -q 'sent 6' "$work/slow.out" || fail "the slow clients stopped early (the front closed them before its 10 s header deadline?): $(cat "$work/slow.out")"
ok "the slow clients were still connected after 6 s"
kill -0 "$script_pid" 2> /dev/null || fail "the front exited: $(cat "$work/front.log")"
echo "$passed passed, $failed failed"
