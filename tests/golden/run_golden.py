#!/usr/bin/python3
"""Golden cases through both faces of Strandline (see tests/golden/README.md).

For every tests/golden/<case>/ (a folder with case.json):
  batch    `strandline correct` with the case's inputs and config.json; the cleaned
           rows must equal expected/cleaned.csv (numbers within the case's
           tolerances, text exactly, same rows in the same order, same flags);
  service  a fresh `strandline serve` (temporary database, free loopback port):
           site, transects, uploads, one run with config.json as the body, polled
           until done (bounded), then every transect's series as CSV and as JSON,
           compared with the SAME expected rows (the engine's columns).
For every tests/golden/malformed/<case>/: the batch must exit 2 naming the
reason, and the service upload must answer 4xx application/problem+json naming
the same reason.

Prints one line per case and path with the number of differing rows, then
`N passed, N failed`; exits 1 on any failure. Standard library only.

  run_golden.py --build-dir BUILD [--case NAME ...] [--update] [--legacy-options]
"""
import argparse
import csv
import fnmatch
import io
import json
import math
import os
import re
import shutil
import signal
import subprocess
import sys
import tempfile
import time
import urllib.error
import urllib.parse
import urllib.request

HERE = os.path.dirname(os.path.abspath(__file__))

# The engine's columns of a cleaned row, in output order (server/FORMATS.md,
# "Cleaned rows"); the service series carry exactly these.
ENGINE_COLUMNS = [
    "transect_id", "time", "sensor", "image_id", "chainage_raw_m", "water_level_m", "setup_m", "runup_m",
    "wave_level_m", "z_ref_m", "slope", "correction_m", "chainage_m", "sigma_m", "sigma_sensor_m",
    "sigma_water_level_m", "sigma_slope_m", "sigma_wave_m", "cloud_fraction", "georef_rmse_m", "flags", "accepted",
    "sensor_offset_m", "sigma_sensor_offset_m",
]
NUMERIC_COLUMNS = set(ENGINE_COLUMNS) - {"transect_id", "time", "sensor", "image_id", "flags"}
# Selected per-transect summary values kept in expected/summary.json.
SUMMARY_KEYS = ["slope", "slope_source", "slope_identifiable", "z_ref_m", "n_observations", "n_corrected",
                "n_accepted", "counts_by_flag"]
# New top-level keys of the run configuration (processing choices).
SETTING_KEYS = ("reference_elevation_m", "wave_correction", "slope")
UPLOAD_ROUTES = {"observations": "observations", "water_levels": "water-levels", "waves": "waves",
                 "slopes": "slopes", "tide_constituents": "tide-constituents"}
RUN_TIMEOUT_S = 300.0
START_TIMEOUT_S = 30.0


class CaseError(Exception):
    """A failure that stops one path of one case (reported, not raised further)."""


# ---------------------------------------------------------------- comparison

class Tolerances:
    def __init__(self, spec):
        spec = spec or {}
        self.default = float(spec.get("default_abs", 1e-6))
        self.columns = spec.get("columns", {})

    def of(self, column):
        if column in self.columns:
            return float(self.columns[column])
        for pattern, value in self.columns.items():
            if fnmatch.fnmatchcase(column, pattern):
                return float(value)
        return self.default


def cell_text(value):
    """A JSON series value in the CSV's terms."""
    if value is None:
        return ""
    if value is True:
        return "1"
    if value is False:
        return "0"
    if isinstance(value, list):
        return ";".join(str(v) for v in value)
    if isinstance(value, float):
        return repr(value)
    return str(value)


def cells_differ(column, want, got, tol):
    """None when equal, else a short description."""
    if column in NUMERIC_COLUMNS:
        if want == "" or got == "":
            return None if want == got else f"{want!r} != {got!r}"
        try:
            a, b = float(want), float(got)
        except ValueError:
            return f"{want!r} != {got!r} (not a number)"
        if not (math.isfinite(a) and math.isfinite(b)):
            return f"{want!r} != {got!r} (not finite)"
        limit = tol.of(column)
        return None if abs(a - b) <= limit else f"{want} != {got} (|diff| {abs(a - b):.3g} > {limit:g})"
    return None if want == got else f"{want!r} != {got!r}"


def compare_rows(expected, got, columns, tol, label, log, show=5):
    """Compares two lists of row dicts position by position; returns the number of differing rows."""
    differing = 0
    for i in range(max(len(expected), len(got))):
        if i >= len(expected) or i >= len(got):
            differing += 1
            if differing <= show:
                row = got[i] if i >= len(expected) else expected[i]
                what = "extra" if i >= len(expected) else "missing"
                log(f"    {label} row {i + 1}: {what} row {row.get('transect_id')!r} {row.get('image_id')!r}")
            continue
        problems = []
        for c in columns:
            if c not in got[i]:
                problems.append(f"{c}: column missing")
                continue
            d = cells_differ(c, expected[i].get(c, ""), got[i][c], tol)
            if d:
                problems.append(f"{c}: {d}")
        if problems:
            differing += 1
            if differing <= show:
                key = (expected[i].get("transect_id"), expected[i].get("image_id"))
                log(f"    {label} row {i + 1} {key}: " + "; ".join(problems[:4]) +
                    (f" (+{len(problems) - 4} more)" if len(problems) > 4 else ""))
    if differing > show:
        log(f"    {label}: ... {differing - show} more differing rows")
    return differing


def read_csv_rows(text):
    reader = csv.DictReader(io.StringIO(text, newline=""))
    return reader.fieldnames or [], list(reader)


def compare_summary(expected, transects, tol, label, log):
    """expected: {transect_id: {key: value}}; transects: {transect_id: per-transect summary}. Returns mismatches."""
    bad = 0
    for tid, want in expected.items():
        got = transects.get(tid)
        if got is None:
            bad += 1
            log(f"    {label} summary: transect {tid!r} missing")
            continue
        for key, value in want.items():
            have = got.get(key)
            if isinstance(value, (int, float)) and not isinstance(value, bool) and isinstance(have, (int, float)) \
                    and not isinstance(have, bool):
                ok = abs(value - have) <= (tol.of(key) if isinstance(value, float) else 0)
            else:
                ok = value == have
            if not ok:
                bad += 1
                log(f"    {label} summary {tid!r} {key}: expected {json.dumps(value)}, got {json.dumps(have)}")
    return bad


def selected_summary(summary):
    return {t["transect_id"]: {k: t.get(k) for k in SUMMARY_KEYS} for t in summary.get("transects", [])}


# ---------------------------------------------------------------- configuration

def legacy_batch_args(config, batch_args):
    """The command-line options that say what config.json's processing keys say (before they were config keys)."""
    out = []
    if "reference_elevation_m" in config:
        out += ["--reference-elevation", repr(float(config["reference_elevation_m"]))]
    if "wave_correction" in config and "--waves" in batch_args:
        out += ["--wave-correction", config["wave_correction"]]
    slope = config.get("slope", {})
    if slope.get("estimate"):
        out += ["--slope", "auto"]
        if "search_range" in slope:
            out += ["--slope-range", "%r:%r" % tuple(float(v) for v in slope["search_range"])]
    if slope.get("default") is not None:
        out += ["--default-slope", repr(float(slope["default"]))]
        if slope.get("default_sigma") is not None:
            out += ["--default-slope-sigma", repr(float(slope["default_sigma"]))]
    return out


def without_settings(config):
    return {k: v for k, v in config.items() if k not in SETTING_KEYS}


# ---------------------------------------------------------------- the service

class Server:
    def __init__(self, binary, work):
        self.binary, self.work = binary, work
        self.db = os.path.join(work, "service.db")
        self.proc = None
        self.base = None
        self.key = None

    def start(self):
        keys = subprocess.run([self.binary, "keys", "add", "--db", self.db, "--name", "golden", "--role", "write"],
                              capture_output=True, text=True, timeout=60)
        if keys.returncode != 0:
            raise CaseError(f"keys add failed: {keys.stderr.strip()}")
        self.key = keys.stdout.strip().splitlines()[-1]
        self.log_path = os.path.join(self.work, "serve.log")
        log = open(self.log_path, "w")
        self.proc = subprocess.Popen([self.binary, "serve", "--db", self.db, "--host", "127.0.0.1", "--port", "0"],
                                     stdout=log, stderr=subprocess.STDOUT, start_new_session=True)
        deadline = time.monotonic() + START_TIMEOUT_S
        while time.monotonic() < deadline:
            text = open(self.log_path).read()
            m = re.search(r"serving (http://127\.0\.0\.1:\d+)", text)
            if m:
                self.base = m.group(1)
                return
            if self.proc.poll() is not None:
                raise CaseError(f"server exited: {text.strip()}")
            time.sleep(0.05)
        raise CaseError("server did not report its address within %gs" % START_TIMEOUT_S)

    def stop(self):
        if self.proc and self.proc.poll() is None:
            self.proc.terminate()
            try:
                self.proc.wait(timeout=20)
            except subprocess.TimeoutExpired:
                self.proc.kill()
                self.proc.wait(timeout=20)

    def request(self, method, path, body=None, content_type=None, auth=True, accept=None):
        """(status, headers, body bytes); never raises for HTTP error statuses."""
        url = self.base + path
        data = body.encode() if isinstance(body, str) else body
        req = urllib.request.Request(url, data=data, method=method)
        if content_type:
            req.add_header("Content-Type", content_type)
        if auth:
            req.add_header("Authorization", "Bearer " + self.key)
        if accept:
            req.add_header("Accept", accept)
        try:
            with urllib.request.urlopen(req, timeout=120) as r:
                return r.status, r.headers, r.read()
        except urllib.error.HTTPError as e:
            return e.code, e.headers, e.read()

    def must(self, method, path, body=None, content_type=None, expect=(200, 201, 202)):
        status, headers, data = self.request(method, path, body, content_type)
        if status not in expect:
            raise CaseError(f"{method} {path}: HTTP {status}: {data.decode(errors='replace')[:600]}")
        return headers, data


def content_type_of(path):
    return "application/json" if path.endswith(".json") or path.endswith(".geojson") else "text/csv"


SERVICE_OBSERVATION_COLUMNS = ["transect_id", "time", "chainage_m", "sensor", "image_id", "cloud_fraction",
                               "georef_rmse_m"]


def service_observations(body):
    """The observation CSV with only the columns the service takes (the batch carries others through);
    everything else (a BOM, quoting of the kept fields) as in the file."""
    bom = body.startswith(b"\xef\xbb\xbf")
    text = body.decode("utf-8-sig")
    rows = list(csv.reader(io.StringIO(text, newline="")))
    keep = [i for i, name in enumerate(rows[0]) if name in SERVICE_OBSERVATION_COLUMNS]
    if len(keep) == len(rows[0]):
        return body
    out = io.StringIO()
    w = csv.writer(out, lineterminator="\n")
    for r in rows:
        w.writerow([r[i] for i in keep])
    return (b"\xef\xbb\xbf" if bom else b"") + out.getvalue().encode("utf-8")


def quote(segment):
    return urllib.parse.quote(segment, safe="")


def wait_for_run(server, run_id):
    """Polls the run until done or failed (bounded); returns the run object."""
    deadline = time.monotonic() + RUN_TIMEOUT_S
    delay = 0.05
    while True:
        _, data = server.must("GET", f"/v1/runs/{run_id}")
        run = json.loads(data)
        if run.get("state") in ("done", "failed"):
            return run
        if time.monotonic() > deadline:
            raise CaseError(f"run {run_id} still {run.get('state')} after {RUN_TIMEOUT_S:g}s: {run.get('progress')}")
        time.sleep(delay)
        delay = min(delay * 1.5, 0.5)


# ---------------------------------------------------------------- one golden case

class Report:
    def __init__(self):
        self.passed = 0
        self.failed = 0
        self.lines = []

    def result(self, name, ok, text):
        line = f"{'PASS' if ok else 'FAIL'} {name}: {text}"
        print(line, flush=True)
        self.lines.append(line)
        if ok:
            self.passed += 1
        else:
            self.failed += 1


def log(text):
    print(text, flush=True)


def load_case(folder):
    with open(os.path.join(folder, "case.json"), encoding="utf-8") as f:
        case = json.load(f)
    config_path = os.path.join(folder, case.get("config", "config.json"))
    with open(config_path, encoding="utf-8") as f:
        config = json.load(f)
    return case, config, config_path


def run_batch(binary, folder, case, config, config_path, work, legacy):
    args = list(case["batch"]["args"])
    if legacy:
        stripped = os.path.join(work, "config.batch.json")
        with open(stripped, "w") as f:
            json.dump(without_settings(config), f)
        args += ["--config", stripped] + legacy_batch_args(config, args)
    else:
        args += ["--config", config_path]
    out = os.path.join(work, "cleaned.csv")
    summary = os.path.join(work, "summary.json")
    cmd = [binary, "correct"] + args + ["--out", out, "--summary", summary, "--quiet"]
    proc = subprocess.run(cmd, cwd=folder, capture_output=True, text=True, timeout=600)
    if proc.returncode != 0:
        raise CaseError(f"strandline correct exit {proc.returncode}: {proc.stderr.strip()[:800]}")
    with open(out, encoding="utf-8", newline="") as f:
        text = f.read()
    with open(summary, encoding="utf-8") as f:
        return text, json.load(f)


def golden_batch(name, folder, case, config, config_path, binary, work, args, report):
    tol = Tolerances(case.get("tolerances"))
    expected_path = os.path.join(folder, "expected", "cleaned.csv")
    summary_path = os.path.join(folder, "expected", "summary.json")
    try:
        text, summary = run_batch(binary, folder, case, config, config_path, work, args.legacy_options)
    except CaseError as e:
        report.result(f"{name} [batch]", False, f"did not run: {e}")
        return
    if args.update:
        os.makedirs(os.path.dirname(expected_path), exist_ok=True)
        with open(expected_path, "w", encoding="utf-8", newline="") as f:
            f.write(text)
        with open(summary_path, "w", encoding="utf-8") as f:
            json.dump({"transects": selected_summary(summary)}, f, indent=1, ensure_ascii=False, sort_keys=True)
            f.write("\n")
        log(f"  updated {os.path.relpath(expected_path, HERE)} and summary.json")
    if not os.path.exists(expected_path):
        report.result(f"{name} [batch]", False, "no expected/cleaned.csv (make it with --update after checking the rows)")
        return
    with open(expected_path, encoding="utf-8", newline="") as f:
        exp_header, exp_rows = read_csv_rows(f.read())
    header, rows = read_csv_rows(text)
    problems = []
    if header != exp_header:
        problems.append(f"header differs: expected {exp_header}, got {header}")
    differing = compare_rows(exp_rows, rows, exp_header, tol, "batch", log)
    bad_summary = 0
    if os.path.exists(summary_path):
        with open(summary_path, encoding="utf-8") as f:
            want = json.load(f)["transects"]
        bad_summary = compare_summary(want, {t["transect_id"]: t for t in summary["transects"]}, tol, "batch", log)
    for p in problems:
        log("    batch " + p)
    ok = not problems and differing == 0 and bad_summary == 0 and len(exp_rows) > 0
    report.result(f"{name} [batch]", ok, f"{differing} differing rows of {len(exp_rows)}"
                  + (f", {bad_summary} summary mismatches" if bad_summary else "") + (", header" if problems else ""))


def golden_service(name, folder, case, config, binary, work, args, report):
    tol = Tolerances(case.get("tolerances"))
    svc = case["service"]
    with open(os.path.join(folder, "expected", "cleaned.csv"), encoding="utf-8", newline="") as f:
        _, exp_rows = read_csv_rows(f.read())
    columns = [c for c in ENGINE_COLUMNS]
    server = Server(binary, os.path.join(work, "service"))
    os.makedirs(server.work, exist_ok=True)
    try:
        server.start()
        site = dict(svc["site"])
        site_id = site["id"]
        server.must("POST", "/v1/sites", json.dumps(site), "application/json")
        if svc.get("transects"):
            with open(os.path.join(folder, svc["transects"]), "rb") as f:
                server.must("PUT", f"/v1/sites/{quote(site_id)}/transects", f.read(), "application/json")
        for kind in svc["uploads"]:
            path = case["inputs"][kind]
            with open(os.path.join(folder, path), "rb") as f:
                body = f.read()
            if kind == "observations" and path.endswith(".csv"):
                body = service_observations(body)
            server.must("POST", f"/v1/sites/{quote(site_id)}/{UPLOAD_ROUTES[kind]}", body, content_type_of(path))
        body = without_settings(config) if args.legacy_options else config
        _, data = server.must("POST", f"/v1/sites/{quote(site_id)}/runs?transects=all", json.dumps(body),
                              "application/json", expect=(202,))
        run = json.loads(data)
        run = wait_for_run(server, run["run_id"])
        if run["state"] != "done":
            raise CaseError(f"run {run['run_id']} failed: {run.get('reason')}")
        # Every transect: those stored for the site and those of the expected rows.
        _, data = server.must("GET", f"/v1/sites/{quote(site_id)}/transects")
        transects = [f_["properties"]["transect_id"] for f_ in json.loads(data)["features"]]
        for r in exp_rows:
            if r["transect_id"] not in transects:
                transects.append(r["transect_id"])
        total_csv = total_json = 0
        got_csv, got_json = [], []
        want_rows = []
        for tid in transects:
            want = [r for r in exp_rows if r["transect_id"] == tid]
            want_rows += want
            base = f"/v1/sites/{quote(site_id)}/transects/{quote(tid)}/series"
            status, _, data = server.request("GET", base + "?format=csv", auth=False)
            if status == 404 and not want:
                continue
            if status != 200:
                raise CaseError(f"series {tid!r} CSV: HTTP {status}: {data.decode(errors='replace')[:300]}")
            header, rows = read_csv_rows(data.decode("utf-8"))
            if header != columns:
                log(f"    service CSV {tid!r}: header {header}")
            got_csv += rows
            status, _, data = server.request("GET", base + "?format=json", auth=False)
            if status != 200:
                raise CaseError(f"series {tid!r} JSON: HTTP {status}: {data.decode(errors='replace')[:300]}")
            doc = json.loads(data)
            if doc.get("transect_id") != tid or doc.get("site") != site_id:
                log(f"    service JSON {tid!r}: document names {doc.get('site')!r}/{doc.get('transect_id')!r}")
                total_json += 1
            got_json += [{k: cell_text(v) for k, v in r.items()} for r in doc["rows"]]
        # The expected rows, transect by transect (the file is in transect then time order).
        if want_rows != exp_rows:
            log("    note: expected/cleaned.csv is not grouped by transect in series order")
        total_csv += compare_rows(want_rows, got_csv, columns, tol, "service CSV", log)
        total_json += compare_rows(want_rows, got_json, columns, tol, "service JSON", log)
        bad_summary = 0
        summary_path = os.path.join(folder, "expected", "summary.json")
        if os.path.exists(summary_path):
            with open(summary_path, encoding="utf-8") as f:
                want_summary = json.load(f)["transects"]
            _, data = server.must("GET", f"/v1/sites/{quote(site_id)}/summary")
            got = {t["transect_id"]: t["summary"] for t in json.loads(data)["transects"]}
            bad_summary = compare_summary(want_summary, got, tol, "service", log)
        ok = total_csv == 0 and total_json == 0 and bad_summary == 0 and len(exp_rows) > 0
        report.result(f"{name} [service]", ok,
                      f"{total_csv} differing rows (CSV), {total_json} differing rows (JSON) of {len(exp_rows)}"
                      + (f", {bad_summary} summary mismatches" if bad_summary else ""))
    except CaseError as e:
        report.result(f"{name} [service]", False, f"did not complete: {e}")
    finally:
        server.stop()


# ---------------------------------------------------------------- malformed cases

def problem_strings(value):
    if isinstance(value, str):
        yield value
    elif isinstance(value, dict):
        for v in value.values():
            yield from problem_strings(v)
    elif isinstance(value, list):
        for v in value:
            yield from problem_strings(v)


def malformed_case(name, folder, base, binary, work, report):
    with open(os.path.join(folder, "case.json"), encoding="utf-8") as f:
        case = json.load(f)
    kind, bad = case["kind"], os.path.join(folder, case["file"])
    reasons = case["reason"] if isinstance(case["reason"], list) else [case["reason"]]
    files = {k: os.path.join(base, v) for k, v in {
        "observations": "observations.csv", "water_levels": "water_levels.csv", "waves": "waves.csv",
        "slopes": "slopes.csv", "transects": "transects.geojson"}.items()}
    files[kind] = bad
    # Batch: exit 2 and the reason on standard error.
    cmd = [binary, "correct", "--observations", files["observations"], "--water-levels", files["water_levels"],
           "--slopes", files["slopes"], "--out", os.path.join(work, "x.csv"), "--quiet"]
    if kind == "waves":
        cmd += ["--waves", files["waves"]]
    proc = subprocess.run(cmd, capture_output=True, text=True, timeout=120)
    missing = [r for r in reasons if r not in proc.stderr]
    ok = proc.returncode == 2 and not missing
    report.result(f"malformed/{name} [batch]", ok,
                  f"exit {proc.returncode}" + (f", message lacks {missing}: {proc.stderr.strip()[:300]}" if missing else ""))
    # Service: 4xx problem+json naming the reason; nothing stored.
    server = Server(binary, os.path.join(work, "service"))
    os.makedirs(server.work, exist_ok=True)
    try:
        server.start()
        server.must("POST", "/v1/sites", json.dumps({"id": "bad", "name": "Invented malformed-input site",
                                                     "crs": "EPSG:32631", "reference_elevation_m": 0}),
                    "application/json")
        with open(files["transects"], "rb") as f:
            server.must("PUT", "/v1/sites/bad/transects", f.read(), "application/json")
        with open(bad, "rb") as f:
            status, headers, data = server.request("POST", f"/v1/sites/bad/{UPLOAD_ROUTES[kind]}", f.read(),
                                                   content_type_of(bad))
        ctype = (headers.get("Content-Type") or "").split(";")[0].strip()
        text = data.decode("utf-8", errors="replace")
        problems = []
        if not 400 <= status < 500:
            problems.append(f"HTTP {status}")
        if ctype != "application/problem+json":
            problems.append(f"Content-Type {ctype!r}")
        try:
            strings = list(problem_strings(json.loads(text)))
        except ValueError:
            strings = []
            problems.append("body is not JSON")
        lacking = [r for r in reasons if not any(r in s for s in strings)]
        if lacking:
            problems.append(f"problem lacks {lacking}: {text[:300]}")
        report.result(f"malformed/{name} [service]", not problems, f"HTTP {status}" + ("; " + "; ".join(problems)
                                                                                        if problems else ""))
    except CaseError as e:
        report.result(f"malformed/{name} [service]", False, f"did not complete: {e}")
    finally:
        server.stop()


# ---------------------------------------------------------------- main

def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--build-dir", required=True)
    ap.add_argument("--case", action="append", default=[], help="run only these cases (folder names; repeatable)")
    ap.add_argument("--update", action="store_true", help="rewrite expected/ from the batch output")
    ap.add_argument("--path", choices=["both", "batch", "service"], default="both")
    ap.add_argument("--no-malformed", action="store_true")
    ap.add_argument("--legacy-options", action="store_true",
                    help="give the batch the processing choices as command-line options and leave them out of "
                         "the run body (for builds before config.json carried them)")
    ap.add_argument("--keep", action="store_true", help="keep the temporary folder")
    args = ap.parse_args()
    binary = os.path.join(os.path.abspath(args.build_dir), "server", "strandline")
    if not os.access(binary, os.X_OK):
        print(f"no strandline binary at {binary}", file=sys.stderr)
        return 2
    tmp = tempfile.mkdtemp(prefix="strandline-golden-")
    report = Report()
    # Terminate cleanly on SIGTERM (CTest timeout) so servers are stopped by the finally blocks.
    signal.signal(signal.SIGTERM, lambda *_: sys.exit(1))
    try:
        cases = sorted(d for d in os.listdir(HERE) if os.path.isfile(os.path.join(HERE, d, "case.json")))
        if args.case:
            cases = [c for c in cases if c in args.case]
        for name in cases:
            folder = os.path.join(HERE, name)
            case, config, config_path = load_case(folder)
            log(f"== {name}: {case.get('description', '')}")
            work = os.path.join(tmp, name)
            os.makedirs(work)
            if args.path in ("both", "batch") or args.update:
                golden_batch(name, folder, case, config, config_path, binary, work, args, report)
            if args.path in ("both", "service"):
                golden_service(name, folder, case, config, binary, work, args, report)
        mal_root = os.path.join(HERE, "malformed")
        if not args.no_malformed and not args.update and os.path.isdir(mal_root):
            base = os.path.join(mal_root, "_base")
            names = sorted(d for d in os.listdir(mal_root) if os.path.isfile(os.path.join(mal_root, d, "case.json")))
            if args.case:
                names = [n for n in names if "malformed/" + n in args.case or "malformed" in args.case]
            for name in names:
                work = os.path.join(tmp, "malformed-" + name)
                os.makedirs(work)
                malformed_case(name, os.path.join(mal_root, name), base, binary, work, report)
    finally:
        if args.keep:
            print(f"kept {tmp}")
        else:
            shutil.rmtree(tmp, ignore_errors=True)
    print(f"{report.passed} passed, {report.failed} failed")
    return 0 if report.failed == 0 and report.passed > 0 else 1


if __name__ == "__main__":
    sys.exit(main())
