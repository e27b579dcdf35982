#!/usr/bin/python3
"""Crash consistency of `strandline serve`: SIGKILL under load, restart, check.

Starts the real server on a fresh database, then repeatedly:
  1. client threads post large observation uploads (100k-300k CSV rows each),
     retract and purge earlier uploads, and post runs of a second site;
  2. after a random, seeded delay the server is killed with SIGKILL;
  3. with the server down, the database file is opened read-only: integrity
     check, every upload's rows all there or none, retractions and purges
     applied, results only for finished runs;
  4. the server is restarted on the same file and the HTTP API is checked:
     every upload acknowledged with a 2xx is listed with exactly the rows it
     was sent, every acknowledged retraction and purge is still applied, runs
     that were queued or running are failed with an "interrupted" reason, and
     a new run of the same site finishes.

Usage: crash_consistency.py --build-dir B [--kills 15] [--budget-s 180] [--seed N]
(also CRASH_KILLS, CRASH_BUDGET_S, CRASH_SEED in the environment). The seed is
printed first; pass it back to replay the same kill delays and upload sizes.
"""
import argparse
import hashlib
import http.client
import json
import math
import os
import random
import re
import shutil
import signal
import sqlite3
import subprocess
import sys
import tempfile
import threading
import time

BULK_SITE = "bulk"          # large observation uploads, retractions, purges
RUN_SITE = "reruns"         # small site whose runs get interrupted
BULK_TRANSECTS = 20
RUN_TRANSECTS = 8
PREFIX_PLACEHOLDER = b"XXXXXXXX"  # 8 bytes, replaced by "U%07d" per upload


class CheckFailed(Exception):
    pass


class Checks:
    def __init__(self):
        self.passed = 0

    def that(self, condition, message):
        if not condition:
            raise CheckFailed(message)
        self.passed += 1


CHECK = Checks()


def log(msg):
    print(f"[{time.strftime('%H:%M:%S')}] {msg}", flush=True)


# ------------------------------------------------------------------ HTTP

class Server:
    """One `strandline serve` process on the test database."""

    def __init__(self, binary, db, workdir):
        self.binary, self.db, self.workdir = binary, db, workdir
        self.proc = None
        self.port = None
        self.starts = 0

    def start(self, timeout=60.0):
        self.starts += 1
        log_path = os.path.join(self.workdir, f"serve.{self.starts}.log")
        self.log_path = log_path
        out = open(log_path, "wb")
        self.proc = subprocess.Popen([self.binary, "serve", "--db", self.db, "--port", "0"],
                                     stdout=out, stderr=subprocess.STDOUT)
        out.close()
        t0 = time.monotonic()
        while time.monotonic() - t0 < timeout:
            text = open(log_path, errors="replace").read()
            m = re.search(r"serving http://127\.0\.0\.1:(\d+)", text)
            if m:
                self.port = int(m.group(1))
                return time.monotonic() - t0
            if self.proc.poll() is not None:
                raise CheckFailed(f"server exited with {self.proc.returncode} at start {self.starts}: {text}")
            time.sleep(0.05)
        raise CheckFailed(f"server did not print its URL within {timeout} s (start {self.starts}): "
                          + open(log_path, errors="replace").read())

    def kill(self):
        os.kill(self.proc.pid, signal.SIGKILL)
        self.proc.wait()
        self.proc = None

    def stop(self):
        if self.proc is not None:
            self.proc.terminate()
            try:
                self.proc.wait(timeout=20)
            except subprocess.TimeoutExpired:
                self.proc.kill()
                self.proc.wait()
            self.proc = None


class Client:
    def __init__(self, server, key):
        self.server, self.key = server, key

    def request(self, method, path, body=None, content_type=None, timeout=120.0, auth=True):
        """(status, parsed JSON or text, headers). Raises OSError/HTTPException when the server is gone."""
        conn = http.client.HTTPConnection("127.0.0.1", self.server.port, timeout=timeout)
        try:
            headers = {"Connection": "close"}
            if auth:
                headers["Authorization"] = f"Bearer {self.key}"
            if content_type:
                headers["Content-Type"] = content_type
            conn.request(method, path, body=body, headers=headers)
            resp = conn.getresponse()
            data = resp.read()
            hdrs = {k.lower(): v for k, v in resp.getheaders()}
            ctype = hdrs.get("content-type", "")
            if "json" in ctype:
                try:
                    return resp.status, json.loads(data), hdrs
                except ValueError:
                    pass
            return resp.status, data.decode("utf-8", "replace"), hdrs
        finally:
            conn.close()

    def json_ok(self, method, path, body=None, content_type="application/json", expect=(200, 201, 202)):
        if isinstance(body, (dict, list)):
            body = json.dumps(body)
        status, doc, _ = self.request(method, path, body, content_type if body is not None else None)
        if status not in expect:
            raise CheckFailed(f"{method} {path}: HTTP {status}: {doc}")
        return doc

    def pages(self, path):
        items, cursor = [], None
        while True:
            sep = "&" if "?" in path else "?"
            doc = self.json_ok("GET", f"{path}{sep}limit=1000" + (f"&cursor={cursor}" if cursor else ""))
            items.extend(doc["items"])
            cursor = doc.get("next_cursor")
            if not cursor:
                return items


# ------------------------------------------------------------------ invented data

def iso(t):
    return time.strftime("%Y-%m-%dT%H:%M:%SZ", time.gmtime(t))


def transects_geojson(prefix, count):
    feats = []
    for i in range(count):
        feats.append({"type": "Feature",
                      "properties": {"transect_id": f"{prefix}{i:02d}", "azimuth_deg": 180, "length_m": 400},
                      "geometry": {"type": "Point", "coordinates": [431000 + 50 * i, 5902000]}})
    return {"type": "FeatureCollection",
            "crs": {"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::32631"}},
            "features": feats}


def bulk_template(max_images, rng):
    """CSV of max_images images x BULK_TRANSECTS rows, image-major, with a
    placeholder in every image id; returns (bytes, offsets) where offsets[n] is
    the end of the rows of the first n images (a body of n*BULK_TRANSECTS rows)."""
    sensors = ["sentinel2a", "sentinel2b", "landsat8", "landsat9", "smallsat"]
    base = 946684800  # 2000-01-01
    header = "transect_id,time,chainage_m,sensor,image_id,cloud_fraction\n"
    parts, offsets, size = [header], [len(header)], len(header)
    for k in range(max_images):
        t = iso(base + k * 21600 + 37)
        sensor = sensors[k % len(sensors)]
        cloud = f"{rng.random() * 0.6:.3f}"
        lines = "".join(
            f"B{j:02d},{t},{150 + 40 * math.sin(k * 0.01 + j) + rng.random() * 5:.2f},{sensor},"
            f"XXXXXXXX_{k:05d},{cloud}\n" for j in range(BULK_TRANSECTS))
        parts.append(lines)
        size += len(lines)
        offsets.append(size)
    return "".join(parts).encode(), offsets


def run_site_data(rng):
    """Water levels (hourly, two years) and observations (every 2 days) of the run site."""
    base = 1577836800  # 2020-01-01
    hours = 2 * 365 * 24
    wl = ["time,level_m"]
    level = {}
    for h in range(hours):
        t = base + h * 3600
        v = 1.2 * math.sin(2 * math.pi * h / 12.42) + 0.4 * math.sin(2 * math.pi * h / 12.0)
        level[h] = v
        wl.append(f"{iso(t)},{v:.3f}")
    obs = ["transect_id,time,chainage_m,sensor,image_id"]
    for k in range(365):
        h = k * 48 + 10
        t = base + h * 3600 + 1800
        wlev = 0.5 * (level[h] + level[h + 1])
        for j in range(RUN_TRANSECTS):
            slope = 0.05 + 0.01 * j
            x = 180 + 10 * math.sin(2 * math.pi * k / 182) - wlev / slope + rng.gauss(0, 4)
            obs.append(f"R{j:02d},{iso(t)},{x:.2f},sentinel2a,RIMG_{k:04d}")
    return ("\n".join(wl) + "\n").encode(), ("\n".join(obs) + "\n").encode()


# ------------------------------------------------------------------ model of what was sent

class Upload:
    def __init__(self, seq, rows, sha, cycle):
        self.seq, self.rows, self.sha, self.cycle = seq, rows, sha, cycle
        self.upload_id = None
        self.acked = False            # 201 received by the client
        self.confirmed = False        # seen listed after a restart (durable from then on)
        self.lost = False             # never acknowledged and not listed after the restart
        self.retract = None           # None | "sent" | "acked"
        self.retract_confirmed = False
        self.must_be_purged = False   # covered by an acknowledged purge (or seen purged)

    @property
    def name(self):
        return f"upload U{self.seq:07d} (id {self.upload_id}, {self.rows} rows, cycle {self.cycle})"


class Model:
    def __init__(self):
        self.lock = threading.Lock()
        self.uploads = {}       # seq -> Upload
        self.by_id = {}         # upload_id -> Upload
        self.next_seq = 1
        self.runs = {}          # run_id -> last state seen by a client
        self.stats = {"acked_uploads": 0, "rows_acked": 0, "retractions_acked": 0, "purges_acked": 0,
                      "runs_posted": 0, "interrupted_runs": 0, "reruns_done": 0, "unacked_committed": 0,
                      "unacked_absent": 0, "runs_done_before_kill": 0}


# ------------------------------------------------------------------ client workload (one cycle)

def upload_worker(client, model, template, offsets, rng, stop, cycle, errors):
    while not stop.is_set():
        n_images = rng.randint(1500, 5000)           # 30k-100k rows: large, and the database stays ~1 GB over 15 kills
        with model.lock:
            seq = model.next_seq
            model.next_seq += 1
        body = template[:offsets[n_images]].replace(PREFIX_PLACEHOLDER, b"U%07d" % seq)
        up = Upload(seq, n_images * BULK_TRANSECTS, hashlib.sha256(body).hexdigest(), cycle)
        with model.lock:
            model.uploads[seq] = up
        try:
            status, doc, _ = client.request("POST", f"/v1/sites/{BULK_SITE}/observations", body, "text/csv",
                                            timeout=300)
        except (OSError, http.client.HTTPException):
            return  # the server is gone: the upload's fate is unknown
        if status == 503:
            time.sleep(0.2)
            continue
        if status != 201:
            errors.append(f"U{seq:07d}: HTTP {status} for a valid upload: {str(doc)[:500]}")
            return
        with model.lock:
            up.upload_id = doc["upload_id"]
            up.acked = True
            model.by_id[up.upload_id] = up
            model.stats["acked_uploads"] += 1
            model.stats["rows_acked"] += up.rows
        if not (doc["received"] == up.rows and doc["inserted"] == up.rows and doc["duplicates"] == 0
                and doc["rejected"] == 0):
            errors.append(f"{up.name}: report {doc} does not match the {up.rows} rows sent")
            return
        # Paced, as a monitoring team's uploads are: the purges keep up and the
        # database stays a few hundred MB over 15 kills (the checks read it all).
        if stop.wait(rng.uniform(0.3, 1.2)):
            return


def retract_worker(client, model, rng, stop, errors):
    while not stop.wait(rng.uniform(0.15, 0.6)):
        with model.lock:
            candidates = [u for u in model.uploads.values()
                          if (u.acked or u.confirmed) and u.retract is None and not u.lost]
            # keep the newest few live: the rest are retracted, then purged, so
            # the database stays small whatever the number of kills
            candidates.sort(key=lambda u: u.seq)
            candidates = candidates[:-2] if len(candidates) > 2 else []
            retracted_acked = [u for u in model.uploads.values() if u.retract == "acked" and not u.must_be_purged]
        try:
            if candidates and rng.random() < 0.7:
                up = rng.choice(candidates)
                with model.lock:
                    up.retract = "sent"
                status, doc, _ = client.request(
                    "DELETE", f"/v1/sites/{BULK_SITE}/uploads/{up.upload_id}?reason=crash-test-{up.seq}")
                if status != 200:
                    errors.append(f"retraction of {up.name}: HTTP {status}: {doc}")
                    return
                with model.lock:
                    up.retract = "acked"
                    model.stats["retractions_acked"] += 1
            elif retracted_acked:
                # every retraction acknowledged before the purge is sent must be purged
                covered = list(retracted_acked)
                status, doc, _ = client.request("POST", f"/v1/sites/{BULK_SITE}/purge")
                if status != 200:
                    errors.append(f"purge: HTTP {status}: {doc}")
                    return
                with model.lock:
                    for u in covered:
                        u.must_be_purged = True
                    model.stats["purges_acked"] += 1
        except (OSError, http.client.HTTPException):
            return


def run_worker(client, model, rng, stop, errors):
    current = None
    while not stop.is_set():
        try:
            if current is None:
                status, doc, _ = client.request("POST", f"/v1/sites/{RUN_SITE}/runs?transects=all", b"{}",
                                                "application/json")
                if status == 503:
                    stop.wait(0.3)
                    continue
                if status != 202:
                    errors.append(f"posting a run: HTTP {status}: {doc}")
                    return
                current = doc["run_id"]
                with model.lock:
                    model.runs[current] = doc["state"]
                    model.stats["runs_posted"] += 1
            stop.wait(0.15)
            status, doc, _ = client.request("GET", f"/v1/runs/{current}")
            if status != 200:
                errors.append(f"run {current}: HTTP {status}: {doc}")
                return
            with model.lock:
                model.runs[current] = doc["state"]
            if doc["state"] == "failed":
                errors.append(f"run {current} failed while the server was up: {doc.get('reason')}")
                return
            if doc["state"] == "done":
                current = None
        except (OSError, http.client.HTTPException):
            return


# ------------------------------------------------------------------ checks

def check_database_offline(db_path, model, cycle):
    """With the server killed: the file as the crash left it, opened read-only."""
    con = sqlite3.connect(f"file:{db_path}?mode=ro", uri=True, timeout=30)
    try:
        t0 = time.monotonic()
        rows = con.execute("PRAGMA integrity_check").fetchall()
        CHECK.that(rows == [("ok",)], f"cycle {cycle}: PRAGMA integrity_check after the kill: {rows[:10]}")
        integrity_s = time.monotonic() - t0

        uploads = {}
        for uid, sha, kind, received, inserted, dup, rej, first, last, retracted, purged in con.execute(
                "SELECT u.id, u.sha256, u.kind, u.rows_received, u.rows_inserted, u.rows_duplicate, u.rows_rejected, "
                "u.first_row_id, u.last_row_id, r.upload_id IS NOT NULL, r.purged_at FROM uploads u "
                "LEFT JOIN retractions r ON r.upload_id = u.id "
                "WHERE u.site_key = (SELECT site_key FROM sites WHERE id = ?)", (BULK_SITE,)):
            uploads[uid] = dict(sha=sha, kind=kind, received=received, inserted=inserted, first=first, last=last,
                                retracted=bool(retracted), purged=purged is not None)
        counts = {uid: (n, live) for uid, n, live in con.execute(
            "SELECT upload_id, COUNT(*), SUM(live) FROM observations GROUP BY upload_id")}
        in_range = {uid: n for uid, n in con.execute(
            "SELECT u.id, COUNT(o.id) FROM uploads u JOIN observations o "
            "ON o.id BETWEEN u.first_row_id AND u.last_row_id AND o.upload_id = u.id GROUP BY u.id")}
        by_sha = {}
        for uid, u in uploads.items():
            by_sha[u["sha"]] = uid
            n, live = counts.get(uid, (0, 0))
            CHECK.that(u["kind"] == "observations", f"cycle {cycle}: upload {uid} has kind {u['kind']}")
            CHECK.that(u["received"] == u["inserted"],
                       f"cycle {cycle}: upload {uid}: rows_received {u['received']} != rows_inserted {u['inserted']}")
            if u["purged"]:
                CHECK.that(n == 0, f"cycle {cycle}: upload {uid} is purged but {n} of its rows are stored")
            else:
                CHECK.that(n == u["inserted"], f"cycle {cycle}: upload {uid} is partial: {n} rows stored, "
                                               f"rows_inserted {u['inserted']} (sql)")
                CHECK.that(in_range.get(uid, 0) == n,
                           f"cycle {cycle}: upload {uid}: {n - in_range.get(uid, 0)} rows outside its row range "
                           f"{u['first']}-{u['last']}")
                want_live = 0 if u["retracted"] else n
                CHECK.that(live == want_live, f"cycle {cycle}: upload {uid} (retracted={u['retracted']}): "
                                              f"{live} of {n} rows live, expected {want_live}")
        orphans = con.execute("SELECT COUNT(*) FROM observations o WHERE NOT EXISTS "
                              "(SELECT 1 FROM uploads u WHERE u.id = o.upload_id)").fetchone()[0]
        CHECK.that(orphans == 0, f"cycle {cycle}: {orphans} observation rows belong to no upload")
        # every upload the clients sent: all or nothing, acknowledged ones present
        with model.lock:
            sent = [u for u in model.uploads.values() if not u.lost]
        for up in sent:
            uid = by_sha.get(up.sha)
            if up.acked or up.confirmed:
                CHECK.that(uid is not None, f"cycle {cycle}: acknowledged {up.name} is not in the database")
                CHECK.that(uid == up.upload_id, f"cycle {cycle}: {up.name} is stored as upload {uid}")
            if uid is not None:
                CHECK.that(uploads[uid]["inserted"] == up.rows,
                           f"cycle {cycle}: {up.name} stored with rows_inserted {uploads[uid]['inserted']}")
            else:
                # its image ids are interned in the upload's transaction
                n = con.execute("SELECT COUNT(*) FROM interned_ids WHERE kind = 'image' AND substr(name, 1, 9) = ?",
                                (f"U{up.seq:07d}_",)).fetchone()[0]
                CHECK.that(n == 0, f"cycle {cycle}: unacknowledged upload U{up.seq:07d} is not listed but "
                                   f"{n} of its image ids are stored")
            if uid is not None and (up.retract == "acked" or up.retract_confirmed):
                CHECK.that(uploads[uid]["retracted"], f"cycle {cycle}: acknowledged retraction of {up.name} lost")
            if uid is not None and up.must_be_purged:
                CHECK.that(uploads[uid]["purged"], f"cycle {cycle}: acknowledged purge of {up.name} lost")

        # runs: results only with a finished run, a finished run complete
        run_rows = con.execute(
            "SELECT r.id, r.state, r.transects_total, r.transects_done, (SELECT COUNT(*) FROM results s "
            "WHERE s.run_id = r.id) FROM runs r").fetchall()
        unfinished = []
        for rid, state, total, done, nres in run_rows:
            if state == "done":
                CHECK.that(nres == total and done == total and total == RUN_TRANSECTS,
                           f"cycle {cycle}: run {rid} is done with {nres} results, {done}/{total} transects")
            else:
                CHECK.that(nres == 0, f"cycle {cycle}: run {rid} is {state} but has {nres} results")
            if state in ("queued", "running"):
                unfinished.append(rid)
        with model.lock:
            acked_runs = dict(model.runs)
        stored_runs = {rid: state for rid, state, *_ in run_rows}
        for rid, seen in acked_runs.items():
            CHECK.that(rid in stored_runs, f"cycle {cycle}: run {rid} acknowledged with 202 is not in the database")
            if seen == "done":
                CHECK.that(stored_runs[rid] == "done", f"cycle {cycle}: run {rid} was done, now {stored_runs[rid]}")
        return unfinished, by_sha, integrity_s
    finally:
        con.close()


def check_after_restart(client, model, unfinished, cycle, rerun, timeout_s):
    listed = {u["sha256"]: u for u in client.pages(f"/v1/sites/{BULK_SITE}/uploads")}
    rows_checked = 0
    with model.lock:
        sent = [u for u in model.uploads.values() if not u.lost]
    ids_seen = set()
    for up in sent:
        item = listed.get(up.sha)
        if up.acked or up.confirmed:
            CHECK.that(item is not None, f"cycle {cycle}: acknowledged {up.name} is not listed after the restart")
        if item is None:
            with model.lock:
                up.lost = True
                model.stats["unacked_absent"] += 1
            continue
        if not (up.acked or up.confirmed):
            with model.lock:
                up.upload_id = item["upload_id"]
                model.by_id[up.upload_id] = up
                model.stats["unacked_committed"] += 1
        CHECK.that(item["upload_id"] == up.upload_id,
                   f"cycle {cycle}: {up.name} listed as upload {item['upload_id']}")
        ids_seen.add(item["upload_id"])
        CHECK.that(item["received"] == up.rows and item["inserted"] == up.rows and item["duplicates"] == 0,
                   f"cycle {cycle}: {up.name} listed with received {item['received']}, inserted {item['inserted']}, "
                   f"duplicates {item['duplicates']}")
        rows_checked += up.rows
        up.confirmed = True
        retracted = item["retraction"] is not None
        if up.retract == "acked" or up.retract_confirmed:
            CHECK.that(retracted, f"cycle {cycle}: acknowledged retraction of {up.name} is not listed")
        if up.must_be_purged:
            CHECK.that(item["purged_at"] is not None, f"cycle {cycle}: acknowledged purge of {up.name} is not listed")
        with model.lock:
            if retracted:
                up.retract, up.retract_confirmed = "acked", True
            elif up.retract == "sent":
                up.retract = None   # the retraction did not commit before the kill: may be retried
            if item["purged_at"] is not None:
                up.must_be_purged = True
    extra = [u for sha, u in listed.items() if u["upload_id"] not in ids_seen]
    CHECK.that(not extra, f"cycle {cycle}: uploads listed that no client sent: {[u['upload_id'] for u in extra]}")

    runs = {r["run_id"]: r for r in client.pages(f"/v1/sites/{RUN_SITE}/runs")}
    for rid, r in runs.items():
        CHECK.that(r["state"] in ("done", "failed"), f"cycle {cycle}: run {rid} is '{r['state']}' after the restart")
    for rid in unfinished:
        doc = client.json_ok("GET", f"/v1/runs/{rid}")
        CHECK.that(doc["state"] == "failed" and "interrupted" in (doc.get("reason") or ""),
                   f"cycle {cycle}: run {rid} was unfinished at the kill; after the restart it is "
                   f"'{doc['state']}' with reason {doc.get('reason')!r}")
    with model.lock:
        for rid in list(model.runs):
            CHECK.that(rid in runs, f"cycle {cycle}: acknowledged run {rid} is not listed after the restart")
            model.runs[rid] = runs[rid]["state"]
        model.stats["interrupted_runs"] += len(unfinished)

    if rerun:
        doc = client.json_ok("POST", f"/v1/sites/{RUN_SITE}/runs?transects=all", {}, expect=(202,))
        rid = doc["run_id"]
        with model.lock:
            model.runs[rid] = doc["state"]
        deadline = time.monotonic() + timeout_s
        while True:
            doc = client.json_ok("GET", f"/v1/runs/{rid}")
            if doc["state"] in ("done", "failed"):
                break
            CHECK.that(time.monotonic() < deadline,
                       f"cycle {cycle}: re-run {rid} still '{doc['state']}' after {timeout_s} s")
            time.sleep(0.1)
        CHECK.that(doc["state"] == "done",
                   f"cycle {cycle}: re-run {rid} after interrupted runs {unfinished} ended '{doc['state']}': "
                   f"{doc.get('reason')}")
        CHECK.that(doc["progress"]["transects_done"] == RUN_TRANSECTS,
                   f"cycle {cycle}: re-run {rid} progress {doc['progress']}")
        status, _, headers = client.request("GET", f"/v1/sites/{RUN_SITE}/transects/R00/series?format=csv")
        CHECK.that(status == 200 and headers.get("x-run-id") == str(rid),
                   f"cycle {cycle}: latest series of R00: HTTP {status}, X-Run-Id {headers.get('x-run-id')} "
                   f"(re-run {rid})")
        with model.lock:
            model.runs[rid] = "done"
            model.stats["reruns_done"] += 1
    return rows_checked


# ------------------------------------------------------------------ main

def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--binary", help="server binary (default BUILD/server/strandline)")
    ap.add_argument("--kills", type=int, default=int(os.environ.get("CRASH_KILLS", 15)))
    ap.add_argument("--budget-s", type=float, default=float(os.environ.get("CRASH_BUDGET_S", 180)))
    ap.add_argument("--seed", type=int, default=int(os.environ["CRASH_SEED"]) if os.environ.get("CRASH_SEED")
                    else random.SystemRandom().randrange(1, 2**31))
    ap.add_argument("--upload-threads", type=int, default=2)
    ap.add_argument("--keep", action="store_true", help="keep the work folder")
    args = ap.parse_args()
    binary = args.binary or os.path.join(args.build_dir, "server", "strandline")
    print(f"crash_consistency: seed {args.seed}, kills {args.kills}, budget {args.budget_s:.0f} s "
          f"(replay: CRASH_SEED={args.seed} CRASH_KILLS={args.kills} CRASH_BUDGET_S={args.budget_s:.0f})", flush=True)
    if not os.access(binary, os.X_OK):
        print(f"FAIL: no server binary at {binary}", file=sys.stderr)
        print("0 passed, 1 failed")
        return 1
    rng = random.Random(args.seed)
    work = tempfile.mkdtemp(prefix="strandline-crash-")
    db = os.path.join(work, "crash.db")
    server = Server(binary, db, work)
    t_start = time.monotonic()
    failed = None
    kills = rows_checked = 0
    timings = []
    model = Model()
    try:
        key = subprocess.run([binary, "keys", "add", "--db", db, "--name", "crash-test", "--role", "write"],
                             check=True, capture_output=True, text=True).stdout.strip()
        server.start()
        client = Client(server, key)
        for site, prefix, count in ((BULK_SITE, "B", BULK_TRANSECTS), (RUN_SITE, "R", RUN_TRANSECTS)):
            client.json_ok("POST", "/v1/sites", {"id": site, "name": f"Invented {site}", "crs": "EPSG:32631",
                                                 "reference_elevation_m": 0, "default_slope": 0.1})
            client.json_ok("PUT", f"/v1/sites/{site}/transects", transects_geojson(prefix, count))
        wl, obs = run_site_data(rng)
        client.json_ok("POST", f"/v1/sites/{RUN_SITE}/water-levels", wl, "text/csv")
        client.json_ok("POST", f"/v1/sites/{RUN_SITE}/observations", obs, "text/csv")
        t0 = time.monotonic()
        template, offsets = bulk_template(5000, rng)
        log(f"setup: sites ready, upload template {len(template) / 1e6:.1f} MB generated in "
            f"{time.monotonic() - t0:.1f} s")
        # one run undisturbed: the run site works before any kill
        t0 = time.monotonic()
        check_after_restart(client, model, [], 0, True, 120)
        run_s = time.monotonic() - t0
        log(f"setup: a run of {RUN_SITE} took {run_s:.1f} s")

        for cycle in range(1, args.kills + 1):
            elapsed = time.monotonic() - t_start
            remaining = args.kills - cycle + 1
            # spread what is left of the budget over the cycles left; a cycle
            # also spends ~2-4 s on checks and the restart
            window = max(1.5, min(10.0, (args.budget_s - elapsed) / remaining - 3.0))
            delay = rng.uniform(0.05, window)
            thread_seed = rng.randrange(2**31)
            stop = threading.Event()
            errors = []
            threads = [threading.Thread(target=upload_worker, daemon=True,
                                        args=(client, model, template, offsets, random.Random(thread_seed + i),
                                              stop, cycle, errors)) for i in range(args.upload_threads)]
            threads.append(threading.Thread(target=retract_worker, daemon=True,
                                            args=(client, model, random.Random(thread_seed + 100), stop, errors)))
            threads.append(threading.Thread(target=run_worker, daemon=True,
                                            args=(client, model, random.Random(thread_seed + 200), stop, errors)))
            c0 = time.monotonic()
            for t in threads:
                t.start()
            time.sleep(delay)
            CHECK.that(not errors, f"cycle {cycle}: a client saw an error before the kill: {errors}")
            server.kill()
            kills += 1
            stop.set()
            for t in threads:
                t.join(timeout=60)
                CHECK.that(not t.is_alive(), f"cycle {cycle}: a client thread did not end after the kill")
            CHECK.that(not errors, f"cycle {cycle}: a client saw an error: {errors}")
            k0 = time.monotonic()
            unfinished, _, integrity_s = check_database_offline(db, model, cycle)
            k1 = time.monotonic()
            start_s = server.start()
            checked = check_after_restart(client, model, unfinished, cycle,
                                          rerun=bool(unfinished) or cycle == args.kills, timeout_s=120)
            rows_checked += checked
            c1 = time.monotonic()
            db_mb = sum(os.path.getsize(p) for p in (db, db + "-wal") if os.path.exists(p)) / 1e6
            timings.append(c1 - c0)
            log(f"cycle {cycle}: killed after {delay:.2f} s; offline checks {k1 - k0:.1f} s "
                f"(integrity {integrity_s:.1f} s), restart {start_s:.1f} s, checks after restart "
                f"{c1 - k1 - start_s:.1f} s; uploads sent {model.next_seq - 1}, acknowledged "
                f"{model.stats['acked_uploads']}; unfinished runs {unfinished}; db {db_mb:.0f} MB")
    except CheckFailed as e:
        failed = str(e)
    finally:
        server.stop()
    s = model.stats
    total = time.monotonic() - t_start
    print(f"summary: kills {kills}, acknowledged uploads checked {s['acked_uploads']} "
          f"(+{s['unacked_committed']} unacknowledged found committed, {s['unacked_absent']} absent), "
          f"rows checked {rows_checked}, retractions acknowledged {s['retractions_acked']}, "
          f"purges acknowledged {s['purges_acked']}, runs posted {s['runs_posted']}, "
          f"interrupted runs seen {s['interrupted_runs']}, re-runs done {s['reruns_done']}; "
          f"{total:.0f} s (cycles: mean {sum(timings) / max(1, len(timings)):.1f} s), seed {args.seed}")
    if failed:
        print(f"FAIL (seed {args.seed}): {failed}", file=sys.stderr)
        print(f"server logs and database kept in {work}", file=sys.stderr)
        print(f"{CHECK.passed} passed, 1 failed")
        return 1
    if not args.keep:
        shutil.rmtree(work, ignore_errors=True)
    else:
        print(f"work folder: {work}")
    print(f"{CHECK.passed} passed, 0 failed")
    return 0


if __name__ == "__main__":
    sys.exit(main())
