#!/usr/bin/env bash
# `cmake --install` lays out what the README's deployment section uses: the
# program, the front's scripts and template, and the systemd units; the
# installed serve_behind_proxy.sh finds the installed program and serves
# through nginx; the units name the installed paths.
set -uo pipefail
build=$1
work=$(mktemp -d /tmp/strandline-install-XXXXXX)
script_pid=
cleanup() { [ -n "$script_pid" ] && kill -TERM "$script_pid" 2> /dev/null; wait 2> /dev/null; rm -rf "$work"; }
trap cleanup EXIT
passed=0 failures=0
ok() { passed=$((passed + 1)); echo "ok: $1"; }
bad() { failures=$((failures + 1)); echo "FAIL: $1" >&2; }

cmake --install "$build" --prefix "$work/prefix" > "$work/install.log" 2>&1 || { bad "cmake --install: $(cat "$work/install.log")"; exit 1; }
deploy=$work/prefix/share/strandline/deploy
for f in bin/strandline share/strandline/deploy/serve_behind_proxy.sh share/strandline/deploy/render_nginx_conf.sh \
         share/strandline/deploy/nginx.conf.template share/strandline/deploy/systemd/strandline.service \
         share/strandline/deploy/systemd/strandline-front.service; do
  [ -e "$work/prefix/$f" ] || bad "not installed: $f"
done
[ -x "$deploy/serve_behind_proxy.sh" ] && ok "installed layout complete" || bad "scripts not executable"

# The units agree on the service's loopback port and body limit, and name installed paths.
grep -q -- '--port 8601' "$deploy/systemd/strandline.service" && grep -q -- '--upstream 127.0.0.1:8601' "$deploy/systemd/strandline-front.service" &&
  grep -q -- '--max-body-mb 256' "$deploy/systemd/strandline.service" && grep -q -- '-- --max-body-mb 256' "$deploy/systemd/strandline-front.service" &&
  grep -q '/usr/local/share/strandline/deploy/render_nginx_conf.sh' "$deploy/systemd/strandline-front.service" &&
  ok "units agree on port 8601 and --max-body-mb 256" || bad "the two units disagree"

port=$(/usr/bin/python3 -c 'import socket; s = socket.socket(); s.bind(("127.0.0.1", 0)); print(s.getsockname()[1])')
bash "$deploy/serve_behind_proxy.sh" --port "$port" -- --db "$work/service.db" > "$work/run.log" 2>&1 &
script_pid=$!
for _ in $(seq 300); do grep -q '^serve_behind_proxy: front ' "$work/run.log" && break; kill -0 $script_pid 2> /dev/null || break; sleep 0.1; done
if curl -sf -m 2 "http://127.0.0.1:$port/healthz" | grep -q '"status":"ok"'; then
  serve_exe=$(readlink "/proc/$(sed -n 's/.*, serve \([0-9]*\);.*/\1/p' "$work/run.log")/exe")
  [ "$serve_exe" = "$work/prefix/bin/strandline" ] && ok "the installed front serves the installed program" ||
    bad "the front runs $serve_exe, not the installed program"
else
  bad "the installed front does not answer: $(tail -5 "$work/run.log")"
fi
echo "$passed passed, $failures failed"
[ "$failures" -eq 0 ]
