#!/usr/bin/env bash
# The nightly pipeline, with curl only: upload the day's points, start a run,
# wait on its progress, download the series that changed.
#
#   nightly_pipeline.sh BASE_URL SITE KEY DAY_CSV OUT_DIR
#
#   BASE_URL  e.g. http://127.0.0.1:8600
#   SITE      site id
#   KEY       a write API key (strandline keys add --db F --name nightly --role write)
#   DAY_CSV   the day's observations (transect_id,time,chainage_m,sensor,image_id[,...])
#   OUT_DIR   where changed series land as <transect>.csv; OUT_DIR/cursor keeps
#             the change cursor between nights
# Exit status: 0 done, 1 a request failed, 2 the run failed or timed out.
set -euo pipefail

base=$1 site=$2 key=$3 day_csv=$4 out=$5
timeout_s=${NIGHTLY_TIMEOUT_S:-3600}
mkdir -p "$out"
cursor_file="$out/cursor"
cursor=$(cat "$cursor_file" 2>/dev/null || echo 0)

# Pulls one member out of a flat JSON reply ("name":value) without a JSON tool.
member() { sed -n "s/.*\"$1\":\"\{0,1\}\([^\",}]*\)\"\{0,1\}.*/\1/p" | head -n 1; }

call() {  # call METHOD URL [curl args...]: prints the body, fails on HTTP >= 400
  local method=$1 url=$2
  shift 2
  local reply status
  reply=$(curl -sS -X "$method" -H "Authorization: Bearer $key" -w '\n%{http_code}' "$@" "$url") || return 1
  status=${reply##*$'\n'}
  reply=${reply%$'\n'*}
  if [ "$status" -ge 400 ]; then
    echo "nightly: $method $url -> HTTP $status: $reply" >&2
    return 1
  fi
  printf '%s' "$reply"
}

echo "nightly: uploading $day_csv"
upload=$(call POST "$base/v1/sites/$site/observations" -H 'Content-Type: text/csv' --data-binary "@$day_csv")
echo "nightly: upload $(echo "$upload" | member upload_id): inserted $(echo "$upload" | member inserted)," \
     "duplicates $(echo "$upload" | member duplicates)"

run=$(call POST "$base/v1/sites/$site/runs" -H 'Content-Type: application/json' --data-binary '{}')
run_id=$(echo "$run" | member run_id)
echo "nightly: run $run_id queued"

deadline=$(( $(date +%s) + timeout_s ))
while :; do
  status=$(call GET "$base/v1/runs/$run_id")
  state=$(echo "$status" | member state)
  done_n=$(echo "$status" | member transects_done)
  total_n=$(echo "$status" | member transects_total)
  echo "nightly: run $run_id $state ($done_n/$total_n transects)"
  case $state in
    done) break ;;
    failed) echo "nightly: run failed: $(echo "$status" | member reason)" >&2; exit 2 ;;
  esac
  if [ "$(date +%s)" -ge "$deadline" ]; then echo "nightly: run $run_id timed out" >&2; exit 2; fi
  sleep 1
done

changes=$(call GET "$base/v1/sites/$site/changes?since=$cursor")
count=0
for transect in $(echo "$changes" | grep -o '"transect_id":"[^"]*"' | sed 's/.*:"\(.*\)"/\1/' | sort -u); do
  call GET "$base/v1/sites/$site/transects/$transect/series?format=csv" > "$out/$transect.csv"
  count=$((count + 1))
done
echo "$changes" | sed -n 's/.*"cursor":"\([0-9]*\)".*/\1/p' > "$cursor_file"
echo "nightly: $count changed series in $out (cursor $(cat "$cursor_file"))"
