# Sourced by the tests/integration/front_*.sh checks (not a test itself: the
# integration glob takes only tests/integration/*.sh). Gives a work folder
# removed at exit, ok/fail counters, and start_front, which runs
# server/deploy/serve_behind_proxy.sh in the background and waits until it
# announces the front. Set `extra_pids` to processes the test starts itself.
# Uses: $build $source $name (the work folder's tag).
bin=$build/server/strandline
work=$(mktemp -d "/tmp/strandline-front-$name-XXXXXX")
script_pid= front_pids= extra_pids=
passed=0 failed=0
cleanup() {
  for pid in $extra_pids; do kill "$pid" 2> /dev/null; done
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

# start_front SCRIPT-OPTIONS... -- SERVE-ARGS...: sets $port, $base, $script_pid, $front_pids.
start_front() {
  port=$(free_port)
  bash "$source/server/deploy/serve_behind_proxy.sh" --bin "$bin" --port "$port" "$@" > "$work/front.log" 2>&1 &
  script_pid=$!
  local line
  for _ in $(seq 300); do
    grep -q '^serve_behind_proxy: front ' "$work/front.log" && break
    kill -0 "$script_pid" 2> /dev/null || fail "the front did not start: $(cat "$work/front.log")"
    sleep 0.1
  done
  line=$(grep '^serve_behind_proxy: front ' "$work/front.log") || fail "the front did not start in 30 s: $(cat "$work/front.log")"
  front_pids=$(echo "$line" | sed -n 's/.*pids: front \([0-9]*\), serve \([0-9]*\);.*/\1 \2/p')
  base=http://127.0.0.1:$port
}
