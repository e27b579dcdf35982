#!/usr/bin/env bash
# The dashboard in a real browser: starts `strandline serve --demo --port 0` and runs
# tests/browser/dashboard.test.mjs against it (Debian's Chromium through
# playwright-core) with the demo's write key; screenshots go to BUILD/dashboard-screenshots.
# DASHBOARD_FROM_SOURCE=1 serves web_static/ from the source tree (--static) instead of
# the files built into the binary, for work on the dashboard without a rebuild.
set -euo pipefail
build=$1 source=$2
bin=$build/server/strandline
out=$build/dashboard-screenshots
work=$(mktemp -d /tmp/strandline-dashboard-XXXXXX)
server_pid=
cleanup() { [ -n "$server_pid" ] && kill "$server_pid" 2> /dev/null; wait 2> /dev/null; rm -rf "$work"; }
trap cleanup EXIT
fail() { echo "FAIL: $*" >&2; echo "0 passed, 1 failed"; exit 1; }

setup_hint="run: bash tests/setup_debian.sh"
command -v node > /dev/null || fail "node is not installed ($setup_hint)"
[ -x /usr/bin/chromium ] || fail "Debian's chromium is not installed ($setup_hint)"
[ -f "$source/tests/browser/node_modules/playwright-core/package.json" ] ||
  fail "tests/browser/node_modules is missing ($setup_hint)"
[ -x "$bin" ] || fail "no server binary at $bin"

static_args=()
if [ "${DASHBOARD_FROM_SOURCE:-0}" = 1 ]; then
  dist=$source/web_static/node_modules/uplot/dist
  [ -f "$dist/uPlot.iife.min.js" ] || fail "web_static/node_modules is missing ($setup_hint)"
  # The URL layout of the embedded files: / → index.html, /assets/ → src/, /vendor/ → uPlot's dist/.
  mkdir -p "$work/static/vendor"
  cp "$source/web_static/src/index.html" "$work/static/"
  cp -r "$source/web_static/src" "$work/static/assets"
  cp "$dist/uPlot.iife.min.js" "$dist/uPlot.min.css" "$work/static/vendor/"
  static_args=(--static "$work/static")
fi

"$bin" serve --demo --port 0 "${static_args[@]}" > "$work/serve.log" 2>&1 &
server_pid=$!
for _ in $(seq 1800); do  # the demo site takes ~20 s to load; allow 3 min on a busy machine
  grep -q "serving http" "$work/serve.log" && break
  kill -0 "$server_pid" 2> /dev/null || fail "the demo server exited: $(cat "$work/serve.log")"
  sleep 0.1
done
base=$(sed -n 's/.*serving \(http:\/\/127\.0\.0\.1:[0-9]*\).*/\1/p' "$work/serve.log")
key=$(sed -n 's/^demo write key: \([^ ]*\)$/\1/p' "$work/serve.log")
[ -n "$base" ] || fail "the demo server did not start: $(cat "$work/serve.log")"
[ -n "$key" ] || fail "the demo server printed no write key: $(cat "$work/serve.log")"

rm -rf "$out"
# The test prints its checks and the closing "N passed, N failed" line itself.
status=0
STRANDLINE_WRITE_KEY=$key timeout 600 node "$source/tests/browser/dashboard.test.mjs" "$base" "$out" || status=$?
[ "$status" = 124 ] && echo "FAIL: the browser test did not finish in 600 s" >&2
exit "$status"
