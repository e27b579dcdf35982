#!/usr/bin/env bash
# Overload through the front (server/deploy/serve_behind_proxy.sh) is refused at once with an
# RFC 7807 problem (type /problems/overloaded), never queued: past the per-client connection limit,
# past the cap on requests passed to the service, past the per-client rate; and a body over the
# service's --max-body-mb is refused by the front with /problems/payload-too-large.
set -euo pipefail
build=$1 source=$2
name=overload
source "$source/tests/integration/lib/front_harness.bash"

# 4 requests at once and 5 per second (burst 10) per client; the service's --max-concurrent 6 (its 24 threads leave 8 beside
# the front's 16 keep-alive connections) caps what the front passes at 6; 1 MiB bodies.
start_front --conn-per-ip 4 --rate-per-ip 5 -- --db "$work/db" --threads 24 --max-concurrent 6 --max-body-mb 1

# Requests in progress are held as uploads whose body never finishes (the front has read their
# header, so they count); every other client is 127.0.0.x on the loopback.
/usr/bin/python3 - "$port" > "$work/overload.out" 2>&1 <<'PY' || fail "$(cat "$work/overload.out")"
import json, socket, sys, threading, time
port = int(sys.argv[1])

def connect(source):
    s = socket.create_connection(("127.0.0.1", port), timeout=5, source_address=(source, 0))
    return s

def hold(source):
    s = connect(source)
    s.sendall(b"POST /v1/sites/cove/runs HTTP/1.1\r\nHost: front\r\nContent-Type: application/json\r\n"
              b"Content-Length: 1000\r\n\r\n{")
    return s

def read_reply(s):
    data = b""
    while b"\r\n\r\n" not in data:
        chunk = s.recv(65536)
        if not chunk:
            break
        data += chunk
    head, _, body = data.partition(b"\r\n\r\n")
    lines = head.decode("latin-1").split("\r\n")
    status = int(lines[0].split()[1])
    headers = {k.strip().lower(): v.strip() for k, v in (l.split(":", 1) for l in lines[1:])}
    length = int(headers.get("content-length", "0"))
    while len(body) < length:
        chunk = s.recv(65536)
        if not chunk:
            break
        body += chunk
    return status, headers, body

def get(source, path="/v1/openapi.json", s=None):
    own = s is None
    s = s or connect(source)
    start = time.monotonic()
    s.sendall(f"GET {path} HTTP/1.1\r\nHost: front\r\n\r\n".encode())
    status, headers, body = read_reply(s)
    elapsed = time.monotonic() - start
    if own:
        s.close()
    return status, headers, body, elapsed

def check_problem(what, reply, status, limit_s=0.5):
    got, headers, body, elapsed = reply
    assert got == status, f"{what}: HTTP {got}, expected {status}: {body[:200]!r}"
    assert elapsed < limit_s, f"{what}: answered in {elapsed:.3f} s, expected under {limit_s} s (queued?)"
    assert headers.get("content-type") == "application/problem+json", f"{what}: {headers.get('content-type')}"
    problem = json.loads(body)
    assert problem["status"] == status and problem["type"].startswith("/problems/"), f"{what}: {problem}"
    if status in (429, 503):
        assert problem["type"] == "/problems/overloaded", f"{what}: {problem}"
        assert headers.get("retry-after") == "1", f"{what}: Retry-After {headers.get('retry-after')}"
    print(f"ok: {what}: {status} {problem['type']} in {elapsed:.3f} s")
    return problem

def check_ok(what, reply):
    got, _, body, elapsed = reply
    assert got == 200, f"{what}: HTTP {got}, expected 200: {body[:200]!r}"
    assert elapsed < 2, f"{what}: {elapsed:.3f} s"
    print(f"ok: {what}: 200 in {elapsed:.3f} s")

def once_held(source, path="/v1/openapi.json", status=503, within_s=5.0):
    """The reply once the held requests have reached the front and the service: they are
    sent at once but arrive when the (possibly busy) machine delivers them, so a request
    is repeated until it gets `status` or `within_s` passes; a limit never enforced fails."""
    deadline = time.monotonic() + within_s
    while True:
        reply = get(source, path)
        if reply[0] == status or time.monotonic() > deadline:
            return reply
        time.sleep(0.1)

# Per client: 4 held from 127.0.0.1, the 5th is refused; another client still passes.
held = [hold("127.0.0.1") for _ in range(4)]
problem = check_problem("5th request from one client", once_held("127.0.0.1"), 503)
assert "4 per client" in problem["detail"], problem
check_problem("5th request from one client (/healthz)", get("127.0.0.1", "/healthz"), 503)
check_ok("a request from another client meanwhile", get("127.0.0.2"))

# In all: 2 more held from 127.0.0.2 make 6 in progress, the service's cap; a third client is refused.
held += [hold("127.0.0.2") for _ in range(2)]
check_problem("7th request in all, from a third client", once_held("127.0.0.3"), 503)

# Released, the same clients pass again.
for s in held:
    s.close()
time.sleep(0.3)
check_ok("after the held requests ended, the first client", get("127.0.0.1"))
check_ok("after the held requests ended, a third client", get("127.0.0.3"))

# Rate: 5 r/s with a burst of 10 per client; of 40 requests in a row on one connection, about 11
# pass and each of the others is answered at once with 429.
s = connect("127.0.0.4")
replies = [get("127.0.0.4", "/v1/openapi.json", s) for _ in range(40)]
s.close()
counts = {}
for r in replies:
    counts[r[0]] = counts.get(r[0], 0) + 1
assert set(counts) <= {200, 429}, counts
assert counts.get(429, 0) >= 15 and 10 <= counts.get(200, 0) <= 25, f"statuses over 40 quick requests: {counts}"
slowest = max(r[3] for r in replies)
assert slowest < 0.5, f"slowest reply of the burst took {slowest:.3f} s"
check_problem("request past the rate limit", next(r for r in replies if r[0] == 429), 429)
print(f"ok: 40 quick requests from one client: {counts.get(200)} x 200, {counts.get(429)} x 429, slowest {slowest:.3f} s")

# Body size: the service's --max-body-mb 1 is the front's limit too; 2 MiB is refused at once.
s = connect("127.0.0.5")
start = time.monotonic()
s.sendall(b"POST /v1/sites/cove/runs HTTP/1.1\r\nHost: front\r\nContent-Type: application/json\r\n"
          b"Content-Length: 2097152\r\n\r\n")
status, headers, body = read_reply(s)
check_problem("a 2 MiB body over --max-body-mb 1", (status, headers, body, time.monotonic() - start), 413)
s.close()
PY
cat "$work/overload.out"
passed=$(grep -c '^ok:' "$work/overload.out")
kill -0 "$script_pid" 2> /dev/null || fail "the front exited: $(cat "$work/front.log")"
echo "$passed passed, $failed failed"
