#!/usr/bin/env bash
# server/deploy/serve_behind_proxy.sh as a program: bad arguments exit 2 with the usage line;
# --bin chooses the program; stopping the script (TERM, INT) stops nginx, its workers and the
# service and removes its run folder; if the service dies the script stops nginx and exits 1;
# TLS with a self-signed certificate.
set -euo pipefail
build=$1 source=$2
bin=$build/server/strandline
script=$source/server/deploy/serve_behind_proxy.sh
work=$(mktemp -d /tmp/strandline-front-life-XXXXXX)
script_pid= all_pids=
passed=0 failed=0
cleanup() {
  [ -n "$script_pid" ] && kill -TERM "$script_pid" 2> /dev/null
  wait 2> /dev/null
  for pid in $all_pids; do kill -KILL "$pid" 2> /dev/null || true; done
  rm -rf "$work"
}
trap cleanup EXIT
fail() { echo "FAIL: $*" >&2; echo "$passed passed, $((failed + 1)) failed"; exit 1; }
ok() { echo "ok: $*"; passed=$((passed + 1)); }
free_port() { /usr/bin/python3 -c 'import socket; s = socket.socket(); s.bind(("127.0.0.1", 0)); print(s.getsockname()[1])'; }
command -v nginx > /dev/null || [ -x /usr/sbin/nginx ] || fail "nginx is not installed (bash tests/setup_debian.sh)"

# --- bad arguments: exit 2, a usage line, nothing started
expect_usage() {  # WHAT ARGS...
  local what=$1 status=0; shift
  timeout 20 bash "$script" "$@" > "$work/usage.out" 2> "$work/usage.err" || status=$?
  [ "$status" = 2 ] || fail "$what: exit $status, expected 2: $(cat "$work/usage.err")"
  grep -q '^usage: serve_behind_proxy.sh' "$work/usage.err" || fail "$what: no usage line: $(cat "$work/usage.err")"
  ok "$what: exit 2 ($(head -1 "$work/usage.err"))"
}
expect_usage "no --port" --bin "$bin" -- --db "$work/db"
expect_usage "--port not a number" --bin "$bin" --port eighty -- --db "$work/db"
expect_usage "--port out of range" --bin "$bin" --port 70000 -- --db "$work/db"
expect_usage "an unknown option" --bin "$bin" --port 8080 --prot 1 -- --db "$work/db"
expect_usage "--port without a value" --bin "$bin" --port
expect_usage "--tls-cert without --tls-key" --bin "$bin" --port 8080 --tls-cert "$work/none.pem" -- --db "$work/db"
expect_usage "--bin not a program" --bin "$work/missing" --port 8080 -- --db "$work/db"
expect_usage "serve's --port after --" --bin "$bin" --port 8080 -- --db "$work/db" --port 9000
expect_usage "--conn-per-ip 0" --bin "$bin" --port 8080 --conn-per-ip 0 -- --db "$work/db"
[ -z "$(ls -d /tmp/strandline-front-?????? 2> /dev/null | grep -v "$work" || true)" ] ||
  echo "note: other run folders exist (another front running on this machine?)"

# --- start: --bin is a copy of the program, so the service's executable shows which one ran
mkdir -p "$work/bin"
cp "$bin" "$work/bin/strandline-copy"
start() {  # LOG SCRIPT-OPTIONS... -- SERVE-ARGS...
  local log=$1 line; shift
  port=$(free_port)
  # A background job of a script starts with SIGINT ignored; the script is tested as run from a terminal.
  env --default-signal=INT bash "$script" --bin "$work/bin/strandline-copy" --port "$port" "$@" > "$log" 2>&1 &
  script_pid=$!
  for _ in $(seq 300); do
    grep -q '^serve_behind_proxy: front ' "$log" && break
    kill -0 "$script_pid" 2> /dev/null || fail "the front did not start: $(cat "$log")"
    sleep 0.1
  done
  line=$(grep '^serve_behind_proxy: front ' "$log") || fail "the front did not start in 30 s: $(cat "$log")"
  nginx_pid=$(echo "$line" | sed -n 's/.*pids: front \([0-9]*\),.*/\1/p')
  serve_pid=$(echo "$line" | sed -n 's/.*, serve \([0-9]*\);.*/\1/p')
  run_dir=$(echo "$line" | sed -n 's/.*run folder \(.*\))$/\1/p')
  workers=$(ps -o pid= --ppid "$nginx_pid" | tr -d ' ' | tr '\n' ' ')
  all_pids="$all_pids $nginx_pid $serve_pid $workers"
  [ -n "$nginx_pid" ] && [ -n "$serve_pid" ] && [ -n "$workers" ] && [ -d "$run_dir" ] ||
    fail "pids or run folder missing: '$line' workers '$workers'"
}
gone_within() {  # SECONDS PID...: true when every PID has exited within SECONDS
  local deadline=$(( $(date +%s%N) + $1 * 1000000000 )) pid; shift
  while [ "$(date +%s%N)" -lt "$deadline" ]; do
    for pid in "$@"; do kill -0 "$pid" 2> /dev/null && continue 2; done
    return 0
  done
  return 1
}
stop_script() {  # SIGNAL EXPECTED-STATUS
  local status=0 t0=$(date +%s%N)
  kill "-$1" "$script_pid"
  wait "$script_pid" || status=$?
  script_pid=
  [ "$status" = "$2" ] || fail "after SIG$1 the script exited $status, expected $2: $(tail -5 "$work/run.log")"
  gone_within 5 $nginx_pid $serve_pid $workers ||
    fail "left running after SIG$1: $(ps -o pid=,args= -p "$nginx_pid,$serve_pid,${workers// /,}" || true)"
  [ ! -d "$run_dir" ] || fail "run folder $run_dir left after SIG$1"
  ok "SIG$1: script exited $status in $(( ($(date +%s%N) - t0) / 1000000 )) ms; nginx $nginx_pid, workers $workers, serve $serve_pid gone; run folder removed"
}

start "$work/run.log" -- --db "$work/db"
serve_cmd=$(tr '\0' ' ' < "/proc/$serve_pid/cmdline")
case " $serve_cmd" in
  *" $work/bin/strandline-copy serve "*) ;;
  *) fail "--bin: the service runs '$serve_cmd', expected $work/bin/strandline-copy" ;;
esac
ok "--bin: the service is $work/bin/strandline-copy"
curl -s -m 2 -D "$work/h" -o "$work/b" "http://127.0.0.1:$port/healthz" || fail "healthz through the front"
grep -q '^HTTP/1.1 200' "$work/h" && grep -q '"status":"ok"' "$work/b" || fail "healthz: $(cat "$work/h" "$work/b")"
grep -qix $'Server: nginx\r' "$work/h" || fail "server_tokens off: $(grep -i '^Server' "$work/h")"
status=$(curl -s -m 2 -o "$work/b" -w '%{http_code}' -H 'X-Forwarded-For: 192.0.2.1' "http://127.0.0.1:$port/metrics")
[ "$status" = 200 ] || fail "/metrics from this machine: $status"
grep -q '^serve | strandline serving http://127.0.0.1:' "$work/run.log" && grep -q '^front | 127.0.0.1 "GET /healthz' "$work/run.log" ||
  fail "the two processes' prefixed output is not passed through: $(cat "$work/run.log")"
ok "HTTP through the front: 200, 'Server: nginx' without version, output prefixed 'serve |' and 'front |'"
stop_script TERM 0

# --- the service dies: the script stops nginx and exits 1 with a message
start "$work/run.log" -- --db "$work/db"
kill -KILL "$serve_pid"
status=0
timeout 15 tail --pid="$script_pid" -f /dev/null || true
wait "$script_pid" || status=$?
script_pid=
[ "$status" = 1 ] || fail "after the service was killed the script exited $status, expected 1"
grep -q 'strandline serve (pid [0-9]*) exited; stopping the front' "$work/run.log" || fail "no message: $(tail -5 "$work/run.log")"
gone_within 5 $nginx_pid $workers || fail "nginx left running after the service died"
[ ! -d "$run_dir" ] || fail "run folder $run_dir left after the service died"
ok "the service killed: script exited 1 ('$(grep -o 'strandline serve (pid [0-9]*) exited.*' "$work/run.log")'), nginx stopped"

# --- nginx dies: the script stops the service and exits 1
start "$work/run.log" -- --db "$work/db"
kill -KILL "$nginx_pid"
status=0
timeout 15 tail --pid="$script_pid" -f /dev/null || true
wait "$script_pid" || status=$?
script_pid=
[ "$status" = 1 ] || fail "after nginx was killed the script exited $status, expected 1"
grep -q 'nginx (pid [0-9]*) exited; stopping strandline serve' "$work/run.log" || fail "no message: $(tail -5 "$work/run.log")"
gone_within 5 $serve_pid || fail "the service left running after nginx died"
# Workers of a killed master exit on their own when they notice; give them the same 5 s.
gone_within 5 $workers || fail "nginx workers left after their master was killed: $workers"
ok "nginx killed: script exited 1, the service stopped"

# --- TLS with a self-signed certificate, stopped with SIGINT
openssl req -x509 -newkey rsa:2048 -nodes -days 1 -subj /CN=localhost \
  -keyout "$work/key.pem" -out "$work/cert.pem" 2> "$work/openssl.err" || fail "openssl: $(cat "$work/openssl.err")"
start "$work/run.log" --tls-cert "$work/cert.pem" --tls-key "$work/key.pem" -- --db "$work/db"
grep -q "front https://127.0.0.1:$port/" "$work/run.log" || fail "the script does not announce https: $(tail -3 "$work/run.log")"
result=$(curl -sk -m 2 -o "$work/b" -w '%{http_code} %{ssl_verify_result}' "https://127.0.0.1:$port/healthz") || fail "https healthz failed"
[ "${result%% *}" = 200 ] && grep -q '"status":"ok"' "$work/b" || fail "https healthz: $result $(cat "$work/b")"
status=$(curl -s -m 2 -o /dev/null -w '%{http_code}' "https://127.0.0.1:$port/healthz") && fail "curl trusted the self-signed certificate (HTTP $status)"
status=$(curl -s -m 2 -o /dev/null -w '%{http_code}' "http://127.0.0.1:$port/healthz") || true
[ "$status" = 400 ] || fail "plain HTTP to the TLS port gave $status, expected 400"
ok "TLS: https 200 with curl -k, refused without -k, plain HTTP on the TLS port 400"
stop_script INT 0
echo "$passed passed, $failed failed"
