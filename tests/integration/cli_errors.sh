#!/usr/bin/env bash
# The batch CLI on bad input: exit code 2, a message naming file/line/field,
# and no output file left behind (outputs are written atomically). Also checks
# that --skip-invalid writes cleaned + rejected = input.
set -uo pipefail
build="$1"
exe="$build/server/strandline"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
failures=0; passed=0

cat > "$tmp/wl.csv" <<'CSV'
time,level_m
2019-03-01T00:00:00Z,0.10
2019-03-01T01:00:00Z,0.40
2019-03-01T02:00:00Z,0.80
CSV
cat > "$tmp/good.csv" <<'CSV'
transect_id,time,chainage_m,sensor,image_id
T1,2019-03-01T00:30:00Z,100.0,landsat8,a
T1,2019-03-01T01:30:00Z,101.0,landsat8,b
CSV

# expect NAME EXPECTED_EXIT EXPECTED_MESSAGE_PART -- ARGS...
expect() {
  local name="$1" code="$2" message="$3"; shift 4
  rm -f "$tmp/out.csv"
  "$exe" "$@" >"$tmp/stdout" 2>"$tmp/stderr"
  local got=$?
  if [[ $got -ne $code ]]; then
    echo "FAIL $name: exit $got, expected $code"; cat "$tmp/stderr"; failures=$((failures+1)); return
  fi
  if ! grep -qF -- "$message" "$tmp/stderr"; then
    echo "FAIL $name: message lacks '$message':"; cat "$tmp/stderr"; failures=$((failures+1)); return
  fi
  if [[ $code -ne 0 && -e "$tmp/out.csv" ]]; then
    echo "FAIL $name: output file left behind"; failures=$((failures+1)); return
  fi
  if ls "$tmp"/*.tmp.* >/dev/null 2>&1; then
    echo "FAIL $name: temporary file left behind"; failures=$((failures+1)); return
  fi
  echo "ok   $name"; passed=$((passed+1))
}

printf 'transect_id,time,chainage_m,sensor,image_id\nT1,2019-13-01T00:00Z,1,landsat8,a\n' > "$tmp/bad_month.csv"
expect bad_month 2 'bad_month.csv:2: time "2019-13-01T00:00Z": month out of range' -- \
  correct --observations "$tmp/bad_month.csv" --water-levels "$tmp/wl.csv" --slope 0.08 --out "$tmp/out.csv"
expect missing_file 2 'nope.csv: cannot open file' -- \
  correct --observations "$tmp/nope.csv" --water-levels "$tmp/wl.csv" --slope 0.08 --out "$tmp/out.csv"
expect unknown_option 2 'unknown option --slop' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slop 0.08 --out "$tmp/out.csv"
expect missing_out 2 'missing required option --out' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.08
expect slope_degrees 2 'option --slope "8": slope above 1' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 8 --out "$tmp/out.csv"
expect slope_not_number 2 'option --slope "steep": not a number' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope steep --out "$tmp/out.csv"
printf 'transect_id,slope\nT9,0.05\n' > "$tmp/slopes.csv"
expect unlisted_transect 2 'no slope for transect(s) T1' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slopes "$tmp/slopes.csv" --out "$tmp/out.csv"
expect slope_and_slopes 2 'give either --slope VALUE' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --slopes "$tmp/slopes.csv" --out "$tmp/out.csv"
echo '{"steps": {"hampel_filter": {}}}' > "$tmp/config.json"
expect unknown_step 2 'configuration /steps/hampel_filter: unknown step' -- \
  correct --config "$tmp/config.json" --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv"
echo '{"steps": ' > "$tmp/broken.json"
expect broken_json 2 'broken.json: not valid JSON' -- \
  correct --config "$tmp/broken.json" --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv"
expect no_water_levels 2 'no water levels' -- \
  correct --observations "$tmp/good.csv" --slope 0.05 --out "$tmp/out.csv"
expect unknown_subcommand 2 'unknown subcommand "corect"' -- corect
expect rejected_without_skip 2 'option --rejected goes with --skip-invalid' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv" --rejected "$tmp/r.csv"
# The shared input rules: a misspelt optional column is refused (not carried through as an extra
# column), and water levels not in metres are refused with a units hint.
printf 'transect_id,time,chainage_m,sensor,image_id,cloud_fration\nT1,2019-03-01T00:30:00Z,100.0,landsat8,a,0.9\n' > "$tmp/misspelt.csv"
expect misspelt_column 2 'column "cloud_fration" looks like "cloud_fraction" misspelt' -- \
  correct --observations "$tmp/misspelt.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv"
printf 'time,level_m\n2019-03-01T00:00:00Z,10\n2019-03-01T01:00:00Z,40\n2019-03-01T02:00:00Z,80\n' > "$tmp/wl_cm.csv"
expect water_levels_in_centimetres 2 'wl_cm.csv:2: level_m "10": 30 m from the record'"'"'s median' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl_cm.csv" --slope 0.05 --out "$tmp/out.csv"
expect good_run 0 'corrected 2 rows' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv"

# --skip-invalid: cleaned + rejected = input
printf 'transect_id,time,chainage_m,sensor,image_id\nT1,2019-03-01T00:30:00Z,100,landsat8,a\nT1,2019-03-01T00:40:00Z,x,landsat8,b\nT1,2019-03-01T00:50:00,100,landsat8,c\nT1,2019-03-01T01:30:00Z,100,landsat8,d\n' > "$tmp/mixed.csv"
expect skip_invalid 0 '2 rejected rows' -- \
  correct --observations "$tmp/mixed.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv" --skip-invalid
cleaned=$(($(wc -l < "$tmp/out.csv") - 1)); rejected=$(($(wc -l < "$tmp/out.rejected.csv") - 1))
if [[ $cleaned -eq 2 && $rejected -eq 2 ]] && grep -q 'chainage_m,x,not a number' "$tmp/out.rejected.csv"; then
  echo "ok   skip_invalid_counts"; passed=$((passed+1))
else
  echo "FAIL skip_invalid_counts: cleaned $cleaned rejected $rejected"; cat "$tmp/out.rejected.csv"; failures=$((failures+1))
fi

echo "$passed passed, $failures failed"
[[ $failures -eq 0 ]]
