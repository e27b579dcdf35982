#!/usr/bin/env bash
# Batch throughput and peak memory of `strandline correct` on generated sites of
# growing size (points per second, peak resident memory, bytes per point).
#   bash tests/bench/run_batch_benchmark.sh [BUILD_DIR]   -> prints a Markdown table
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
build="${1:-$root/build}"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
command -v /usr/bin/time >/dev/null || { echo "needs /usr/bin/time (apt-get install time)"; exit 2; }
echo "| transects | points | wall s | points/s | peak RSS MiB | bytes/point | options |"
echo "| ---: | ---: | ---: | ---: | ---: | ---: | --- |"
for n in 20 200 1000; do
  "$build/demo_data/strandline-demo-gen" "$tmp/site$n" --transects "$n" >/dev/null
  for mode in "fixed" "auto"; do
    if [[ $mode == fixed ]]; then
      slope_args=(--transect-params "$tmp/site$n/transect_params.csv")
    else
      "$build/server/strandline" correct --help | grep -q -- '--slope-range' || continue
      slope_args=(--slope auto --default-slope 0.08)
    fi
    args=(correct --observations "$tmp/site$n/observations.csv" --water-levels "$tmp/site$n/water_levels.csv"
          "${slope_args[@]}" --out "$tmp/out.csv" --quiet)
    [[ -f "$tmp/site$n/waves.csv" ]] && "$build/server/strandline" correct --help | grep -q -- '--waves' \
      && args+=(--waves "$tmp/site$n/waves.csv")
    /usr/bin/time -f "%e %M" -o "$tmp/time" "$build/server/strandline" "${args[@]}"
    read -r wall rss_kb < "$tmp/time"
    points=$(($(wc -l < "$tmp/site$n/observations.csv") - 1))
    awk -v n="$n" -v p="$points" -v w="$wall" -v r="$rss_kb" -v m="$mode" 'BEGIN {
      printf "| %d | %d | %.2f | %.0f | %.1f | %.0f | slope %s, all default steps |\n", n, p, w, (w > 0 ? p / w : 0), r / 1024, r * 1024 / p, m }'
  done
done
