#!/usr/bin/python3
"""Mixed load on the real service: uploads, runs and reads at once.

Starts `strandline serve --demo` (the invented demo site with one finished
run) and drives it from N closed-loop connections for S seconds: most
connections read (series JSON and gzip, the summary, the upload list), some
upload small observation batches (new images each time, so every upload
stores rows), and one connection queues a run every few seconds. Reports
p50/p99 per kind of request, statuses, throughput and the server's peak RSS
(VmHWM) as Markdown.

  /usr/bin/python3 tests/bench/mixed_load.py --build-dir build                 # 60 s, 64 connections
  /usr/bin/python3 tests/bench/mixed_load.py --build-dir build --seconds 5 --check
With --check (the functional test), exits 1 on any 5xx or transport error.
"""
import argparse
import http.client
import os
import random
import re
import subprocess
import sys
import tempfile
import threading
import time


def percentile(values, q):
    if not values:
        return float("nan")
    values = sorted(values)
    return values[min(len(values) - 1, int(q * len(values)))]


class Stats:
    def __init__(self):
        self.lock = threading.Lock()
        self.latency = {}
        self.status = {}
        self.errors = []

    def add(self, kind, seconds, status):
        with self.lock:
            self.latency.setdefault(kind, []).append(seconds)
            key = (kind, status)
            self.status[key] = self.status.get(key, 0) + 1


def start_server(binary):
    proc = subprocess.Popen([binary, "serve", "--demo", "--port", "0"], stdout=subprocess.PIPE,
                            stderr=subprocess.DEVNULL, text=True)
    key = port = None
    deadline = time.monotonic() + 300
    while time.monotonic() < deadline and port is None:
        line = proc.stdout.readline()
        if not line:
            raise SystemExit("the server exited before listening")
        if line.startswith("demo write key: "):
            key = line.split(": ", 1)[1].strip()
        m = re.search(r"serving http://127\.0\.0\.1:(\d+)/", line)
        if m:
            port = int(m.group(1))
    threading.Thread(target=lambda: proc.stdout.read(), daemon=True).start()
    return proc, port, key


def peak_rss_mb(pid):
    with open(f"/proc/{pid}/status") as f:
        for line in f:
            if line.startswith("VmHWM:"):
                return int(line.split()[1]) / 1024
    return float("nan")


def request(conn, method, path, body=None, headers=None):
    conn.request(method, path, body=body, headers=headers or {})
    r = conn.getresponse()
    r.read()
    return r.status


def reader(port, stop, stats, transects, rng):
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=30)
    while not stop.is_set():
        t = rng.choice(transects)
        kind, path, headers = rng.choice([
            ("series json", f"/v1/sites/demo/transects/{t}/series", {}),
            ("series gzip", f"/v1/sites/demo/transects/{t}/series", {"Accept-Encoding": "gzip"}),
            ("summary", "/v1/sites/demo/summary", {"Accept-Encoding": "gzip"}),
            ("uploads list", "/v1/sites/demo/uploads?limit=20", {}),
        ])
        t0 = time.monotonic()
        try:
            status = request(conn, "GET", path, headers=headers)
        except (OSError, http.client.HTTPException) as e:
            stats.errors.append(f"{kind}: {e!r}")
            conn = http.client.HTTPConnection("127.0.0.1", port, timeout=30)
            continue
        stats.add(kind, time.monotonic() - t0, status)


def uploader(port, key, stop, stats, transects, worker):
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=60)
    n = 0
    while not stop.is_set():
        n += 1
        rows = ["transect_id,time,chainage_m,sensor,image_id,cloud_fraction"]
        # 10 images x every transect; times far from the demo's so no image clashes.
        for i in range(10):
            when = time.strftime("%Y-%m-%dT%H:%M:%SZ", time.gmtime(1893456000 + (worker * 100000 + n * 10 + i) * 600))
            for t in transects:
                rows.append(f"{t},{when},{150 + (i % 7)},sentinel2a,LOAD-{worker}-{n}-{i},0.1")
        body = "\n".join(rows) + "\n"
        t0 = time.monotonic()
        try:
            status = request(conn, "POST", "/v1/sites/demo/observations", body,
                             {"Authorization": f"Bearer {key}", "Content-Type": "text/csv"})
        except (OSError, http.client.HTTPException) as e:
            stats.errors.append(f"upload: {e!r}")
            conn = http.client.HTTPConnection("127.0.0.1", port, timeout=60)
            continue
        stats.add("upload", time.monotonic() - t0, status)


def runner(port, key, stop, stats, every_s):
    while not stop.wait(every_s):
        # A connection per run: one idle for the whole interval would meet the
        # server's 5 s keep-alive timeout, which is not what is measured here.
        conn = http.client.HTTPConnection("127.0.0.1", port, timeout=60)
        t0 = time.monotonic()
        try:
            status = request(conn, "POST", "/v1/sites/demo/runs", "{}",
                             {"Authorization": f"Bearer {key}", "Content-Type": "application/json"})
        except (OSError, http.client.HTTPException) as e:
            stats.errors.append(f"run: {e!r}")
            continue
        finally:
            conn.close()
        stats.add("run queued", time.monotonic() - t0, status)


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--seconds", type=float, default=60)
    ap.add_argument("--connections", type=int, default=64)
    ap.add_argument("--uploaders", type=int, default=4)
    ap.add_argument("--run-every-s", type=float, default=5)
    ap.add_argument("--check", action="store_true")
    args = ap.parse_args()
    proc, port, key = start_server(os.path.join(args.build_dir, "server", "strandline"))
    try:
        conn = http.client.HTTPConnection("127.0.0.1", port, timeout=30)
        conn.request("GET", "/v1/sites/demo/transects")
        import json
        transects = [f["properties"]["transect_id"] for f in json.loads(conn.getresponse().read())["features"]]
        stats, stop = Stats(), threading.Event()
        threads = [threading.Thread(target=uploader, args=(port, key, stop, stats, transects, w), daemon=True)
                   for w in range(args.uploaders)]
        threads.append(threading.Thread(target=runner, args=(port, key, stop, stats, args.run_every_s), daemon=True))
        threads += [threading.Thread(target=reader, args=(port, stop, stats, transects, random.Random(i)), daemon=True)
                    for i in range(args.connections - args.uploaders - 1)]
        t0 = time.monotonic()
        for t in threads:
            t.start()
        time.sleep(args.seconds)
        stop.set()
        for t in threads:
            t.join(timeout=60)
        elapsed = time.monotonic() - t0
        rss = peak_rss_mb(proc.pid)
    finally:
        proc.terminate()
        proc.wait(timeout=30)

    total = sum(stats.status.values())
    print(f"### Mixed load: {args.connections} connections ({args.uploaders} uploading, 1 queueing a run every "
          f"{args.run_every_s:g} s, the rest reading), {elapsed:.0f} s")
    print("| request | count | p50 ms | p99 ms | statuses |")
    print("| --- | ---: | ---: | ---: | --- |")
    for kind in sorted(stats.latency):
        lat = stats.latency[kind]
        statuses = ", ".join(f"{s}: {n}" for (k, s), n in sorted(stats.status.items()) if k == kind)
        print(f"| {kind} | {len(lat)} | {1000 * percentile(lat, 0.5):.1f} | {1000 * percentile(lat, 0.99):.1f} | {statuses} |")
    print(f"\n{total} requests, {total / elapsed:.0f} requests/s; transport errors {len(stats.errors)}; "
          f"server peak RSS {rss:.0f} MB")
    server_errors = sum(n for (k, s), n in stats.status.items() if s >= 500)
    for e in stats.errors[:10]:
        print("transport error:", e)
    if args.check:
        ok = server_errors == 0 and not stats.errors and total > 0
        print(f"{'ok' if ok else 'FAIL'}: {server_errors} responses 5xx, {len(stats.errors)} transport errors")
        return 0 if ok else 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
