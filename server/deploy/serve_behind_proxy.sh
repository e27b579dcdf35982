#!/usr/bin/env bash
# Runs `strandline serve` on a private loopback port with nginx in front of it on --port: the
# front enforces request deadlines, buffers request bodies, limits connections and rates per
# client and refuses overload at once (see nginx.conf.template). Both processes' output is passed
# through, each line prefixed "serve |" or "front |". Stopping this script (SIGINT/SIGTERM) stops
# both; if either dies the other is stopped and the script exits 1.
set -uo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"

usage="usage: serve_behind_proxy.sh [--bin PATH] --port P [--host H] [--tls-cert C --tls-key K]
         [--conn-per-ip N] [--rate-per-ip N] -- <strandline serve arguments>
  e.g.   serve_behind_proxy.sh --port 8080 -- --db strandline.db --max-body-mb 256"
say() { echo "serve_behind_proxy: $*" >&2; }
die_usage() { say "$*"; echo "$usage" >&2; exit 2; }

# The built program in a source tree (server/deploy -> build/server), else an installed one
# (share/strandline/deploy -> bin), else the one on PATH.
bin=
for candidate in "$here/../../build/server/strandline" "$here/../../../bin/strandline"; do
  if [[ -x $candidate ]]; then bin=$(realpath "$candidate"); break; fi
done
[[ -n $bin ]] || bin=$(command -v strandline || true)

port= host=127.0.0.1 tls_cert= tls_key= render_opts=()
while (($#)); do
  case $1 in
    --bin|--port|--host|--tls-cert|--tls-key|--conn-per-ip|--rate-per-ip)
      (($# >= 2)) || die_usage "option $1 needs a value"
      case $1 in
        --bin) bin=$2 ;;
        --port) port=$2 ;;
        --host) host=$2 ;;
        --tls-cert) tls_cert=$2 ;;
        --tls-key) tls_key=$2 ;;
        *) [[ $2 =~ ^[0-9]+$ ]] && (( 10#$2 >= 1 && 10#$2 <= 1000000 )) ||
             die_usage "$1: expected a positive integer, got \"$2\""
           render_opts+=("$1" "$2") ;;
      esac
      shift 2 ;;
    --) shift; break ;;
    -h|--help) echo "$usage"; exit 0 ;;
    *) die_usage "unknown argument \"$1\" (serve's own arguments go after --)" ;;
  esac
done
serve_args=("$@")

[[ -n $port ]] || die_usage "--port is required"
[[ $port =~ ^[0-9]+$ ]] && (( 10#$port >= 1 && 10#$port <= 65535 )) || die_usage "--port: expected 1..65535, got \"$port\""
[[ -n $bin && -x $bin && ! -d $bin ]] || die_usage "--bin: no strandline program at \"${bin:-(none found)}\""
[[ -z $tls_cert && -z $tls_key || -n $tls_cert && -n $tls_key ]] || die_usage "--tls-cert and --tls-key go together"
for a in "${serve_args[@]}"; do
  case $a in
    --host|--host=*|--port|--port=*) die_usage "serve's $a is chosen by this script (the front's are --host/--port before --)" ;;
  esac
done
command -v curl > /dev/null || { say "curl is needed (apt-get install curl)"; exit 1; }
command -v nginx > /dev/null || [[ -x /usr/sbin/nginx ]] || { say "nginx is needed (apt-get install nginx)"; exit 1; }
[[ -n $tls_cert ]] && render_opts+=(--tls-cert "$tls_cert" --tls-key "$tls_key")
nginx=$(command -v nginx || echo /usr/sbin/nginx)

run=$(mktemp -d /tmp/strandline-front-XXXXXX)
render() {  # UPSTREAM_PORT: write $run/nginx/nginx.conf; exits as the renderer does
  bash "$here/render_nginx_conf.sh" --run-dir "$run/nginx" --port "$port" --host "$host" \
    --upstream "127.0.0.1:$1" "${render_opts[@]}" -- "${serve_args[@]}" > /dev/null
}
# Arguments the front refuses are refused before anything starts.
render 9 2> "$run/render.err" || {
  status=$?; say "$(head -1 "$run/render.err")"; rm -rf "$run"
  (( status == 2 )) && echo "$usage" >&2
  exit "$status"
}

serve_pid= nginx_pid= nginx_workers= serve_job= nginx_job= stopping=
stop_pid() {  # PID NAME: TERM, then KILL after 10 s
  local pid=$1 i
  [[ -n $pid ]] && kill -0 "$pid" 2> /dev/null || return 0
  kill -TERM "$pid" 2> /dev/null
  for ((i = 0; i < 100; i++)); do kill -0 "$pid" 2> /dev/null || return 0; sleep 0.1; done
  say "$2 (pid $pid) did not stop in 10 s; killing it"
  kill -KILL "$pid" 2> /dev/null
}
stop_all() {
  stopping=1
  trap '' INT TERM
  stop_pid "$nginx_pid" nginx      # the front first: no new requests reach the service
  # Workers outlive a master that was killed (and hold its output pipe open).
  local w
  for w in $nginx_workers; do kill -0 "$w" 2> /dev/null && kill -KILL "$w" 2> /dev/null; done
  stop_pid "$serve_pid" "strandline serve"
  wait 2> /dev/null                # the output prefixers end with their processes
  rm -rf "$run"
}
trap 'say "stopping"; stop_all; exit 0' INT TERM
trap '[[ -n $stopping ]] || stop_all' EXIT
fail() { say "$*"; stop_all; exit 1; }
alive() { [[ -n $1 ]] && kill -0 "$1" 2> /dev/null; }
read_pid() {  # FILE: the pid a starter wrote, waiting for it briefly
  local i
  for ((i = 0; i < 50; i++)); do [[ -s $1 ]] && { cat "$1"; return; }; sleep 0.02; done
}

# The service, on a loopback port of its own choosing (--port 0 prints the bound one).
( echo "$BASHPID" > "$run/serve.pid"; exec "$bin" serve "${serve_args[@]}" --host 127.0.0.1 --port 0 ) 2>&1 |
  tee "$run/serve.out" | sed -u 's/^/serve | /' &
serve_job=$!
serve_pid=$(read_pid "$run/serve.pid")
upstream_port=
for ((i = 0; i < 1200; i++)); do  # up to 120 s: --demo loads the demo site before it listens
  upstream_port=$(sed -n 's|.*serving http://127\.0\.0\.1:\([0-9]*\)/.*|\1|p' "$run/serve.out" 2> /dev/null | head -1)
  [[ -n $upstream_port ]] && break
  alive "$serve_pid" || fail "strandline serve exited before listening (its output is above)"
  sleep 0.1
done
[[ -n $upstream_port ]] || fail "strandline serve did not listen within 120 s"
for ((i = 0; i < 100; i++)); do
  curl -sf -m 2 -o /dev/null "http://127.0.0.1:$upstream_port/healthz" && break
  alive "$serve_pid" || fail "strandline serve exited before answering /healthz"
  sleep 0.1
done
curl -sf -m 2 -o /dev/null "http://127.0.0.1:$upstream_port/healthz" ||
  fail "strandline serve does not answer http://127.0.0.1:$upstream_port/healthz"

# The front, from its private run folder.
render "$upstream_port" || fail "cannot render the front's configuration"
( echo "$BASHPID" > "$run/nginx.pid.start"; exec "$nginx" -p "$run/nginx" -c "$run/nginx/nginx.conf" -e stderr ) 2>&1 |
  sed -u 's/^/front | /' &
nginx_job=$!
nginx_pid=$(read_pid "$run/nginx.pid.start")
scheme=http
[[ -n $tls_cert ]] && scheme=https
connect_host=$host
case $host in 0.0.0.0|'*') connect_host=127.0.0.1 ;; ::|'[::]') connect_host='[::1]' ;; esac
[[ $connect_host == *:* && $connect_host != \[* ]] && connect_host="[$connect_host]"
front_url="$scheme://$connect_host:$port"
for ((i = 0; i < 100; i++)); do
  alive "$nginx_pid" || fail "nginx exited at start (port $port in use? its output is above)"
  curl -sfk -m 2 -o /dev/null "$front_url/healthz" && break
  sleep 0.1
done
curl -sfk -m 2 -o /dev/null "$front_url/healthz" || fail "the front does not answer $front_url/healthz"
nginx_workers=$(ps -o pid= --ppid "$nginx_pid" | tr -d ' ' | tr '\n' ' ')
say "front $front_url/ -> strandline serve http://127.0.0.1:$upstream_port/ (pids: front $nginx_pid, serve $serve_pid; run folder $run)"

# Until one of them ends (or a signal runs the trap). The processes themselves
# are watched, not their output pipes: a killed nginx master leaves workers
# holding its pipe. `wait` on a short sleep lets a signal's trap run at once.
while :; do
  sleep 0.2 &
  wait $! 2> /dev/null
  [[ -n $stopping ]] && exit 0
  if ! alive "$serve_pid"; then fail "strandline serve (pid $serve_pid) exited; stopping the front"; fi
  if ! alive "$nginx_pid"; then fail "nginx (pid $nginx_pid) exited; stopping strandline serve"; fi
done
