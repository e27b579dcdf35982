#!/usr/bin/env bash
# Spectral slope search against the published method's reference loop written
# with numpy + scipy (tests/bench/slope_reference.py), on the same demo-generator
# transects (~800 images each). Writes the per-transect table (CPU time of each,
# ratio, slopes from both) between the slope-benchmark markers of
# tests/bench/RESULTS.md and prints it.
#   bash tests/bench/run_slope_benchmark.sh [BUILD_DIR] [N_TRANSECTS]
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
build="${1:-$root/build}"
n="${2:-6}"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
"$build/bench/slope_search_bench" "$tmp" --transects "$n"
/usr/bin/python3 "$root/tests/bench/slope_reference.py" "$tmp/transects.csv" > "$tmp/reference.json"
/usr/bin/python3 - "$tmp/ours.json" "$tmp/reference.json" "$root/tests/bench/RESULTS.md" "$(uptime)" <<'PY'
import json, re, sys
ours = {r["transect_id"]: r for r in json.load(open(sys.argv[1]))["transects"]}
ref_doc = json.load(open(sys.argv[2]))
ref = {r["transect_id"]: r for r in ref_doc["transects"]}
step = 0.0025
lines = [
    f"scipy {ref_doc['scipy']}, numpy {ref_doc['numpy']}; CPU seconds per transect (ours: median of 15 runs), "
    f"excluding loading; machine: `{sys.argv[4].strip()}`.",
    "",
    "| transect | images | true slope | reference slope | ours (published settings) | ours (default) | "
    "ours 95% CI | reference s | ours s | ratio | ours + CI s | ratio with CI |",
    "| --- | ---: | ---: | ---: | ---: | ---: | --- | ---: | ---: | ---: | ---: | ---: |",
]
ratios, ratios_ci, within = [], [], 0
for tid, o in ours.items():
    r = ref[tid]
    ratio = r["seconds"] / o["published"]["seconds"]
    ratio_ci = r["seconds"] / o["default_ci"]["seconds"]
    ratios.append(ratio)
    ratios_ci.append(ratio_ci)
    ok = abs(o["published"]["slope"] - r["slope"]) <= step
    within += ok
    lo, hi = o["default_ci"]["ci95"]
    lines.append(f"| {tid} | {o['images']} | {o['true_slope']:.4f} | {r['slope']:.4f} | "
                 f"{o['published']['slope']:.4f}{'' if ok else ' (!)'} | {o['default']['slope']:.4f} | "
                 f"[{lo:.4f}, {hi:.4f}] | {r['seconds']:.2f} | {o['published']['seconds'] * 1e3:.2f} ms | "
                 f"{ratio:,.0f}x | {o['default_ci']['seconds'] * 1e3:.1f} ms | {ratio_ci:,.0f}x |")
lines += ["", f"Median ratio {sorted(ratios)[len(ratios) // 2]:,.0f}x (closed form, published settings); "
          f"{sorted(ratios_ci)[len(ratios_ci) // 2]:,.0f}x with our defaults and the 200-resample bootstrap. "
          f"Slopes within the reference's grid step ({step}): {within}/{len(ours)}."]
table = "\n".join(lines)
print(table)
path = sys.argv[3]
text = open(path).read()
begin, end = "<!-- slope-benchmark:begin -->", "<!-- slope-benchmark:end -->"
if begin in text and end in text:
    text = re.sub(re.escape(begin) + ".*?" + re.escape(end), lambda m: begin + "\n" + table + "\n" + end, text, flags=re.S)
else:
    text = text.rstrip("\n") + "\n\n## Spectral slope search (`run_slope_benchmark.sh`)\n" + begin + "\n" + table + "\n" + end + "\n"
open(path, "w").write(text)
PY
