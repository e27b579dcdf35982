#!/usr/bin/env bash
# The batch CLI on bad input: exit code 2, a message naming file/line/field,
# and no output file left behind (outputs are written atomically). Also checks
# that --skip-invalid writes cleaned + rejected = input, and the option parser: -h, suggestions
# for misspelt options, options checked before inputs, help matching the accepted options, ISO
# dates for times, slope notation hints, `keys` on a missing database, `correct --check` and
# the demo generator's own options.
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

# expect NAME EXPECTED_EXIT EXPECTED_MESSAGE_PART -- ARGS...   (message on standard error)
# expect_stdout: the same with the message looked for on standard output.
expect() { expect_in stderr "$@"; }
expect_stdout() { expect_in stdout "$@"; }
expect_in() {
  local stream="$1" name="$2" code="$3" message="$4"; shift 5
  rm -f "$tmp/out.csv"
  "$exe" "$@" >"$tmp/stdout" 2>"$tmp/stderr"
  local got=$?
  if [[ $got -ne $code ]]; then
    echo "FAIL $name: exit $got, expected $code"; cat "$tmp/stderr"; failures=$((failures+1)); return
  fi
  if ! grep -qF -- "$message" "$tmp/$stream"; then
    echo "FAIL $name: $stream lacks '$message':"; cat "$tmp/$stream"; failures=$((failures+1)); return
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
# 100,000 nested arrays overflowed the stack before (exit 139); now a message with line and column.
deep=$(printf '%*s' 100000 '' | tr ' ' '[')
printf '{"slopes": %s' "$deep" > "$tmp/deep_slopes.json"
expect deep_slopes_json 2 'deep_slopes.json: line 1, column 75: arrays and objects nested deeper than 64 levels' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slopes "$tmp/deep_slopes.json" --out "$tmp/out.csv"
printf '%s' "$deep" > "$tmp/deep_tide.json"
expect deep_tide_json 2 'deep_tide.json: line 1, column 65: arrays and objects nested deeper than 64 levels' -- \
  correct --observations "$tmp/good.csv" --tide-constituents "$tmp/deep_tide.json" --slope 0.05 --out "$tmp/out.csv"
printf '{"steps": %s' "$deep" > "$tmp/deep_config.json"
expect deep_config_json 2 'nested deeper than 64 levels' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --config "$tmp/deep_config.json" --out "$tmp/out.csv"
printf 'transect_id,time,chainage_m,sensor,image_id\nT1,2019-03-01T00:30:00Z,100.0,landsat8,caf\xe9\n' > "$tmp/latin1.csv"
expect latin1_image_id 2 'latin1.csv:2: image_id "caf\xE9": invalid UTF-8 byte 0xE9' -- \
  correct --observations "$tmp/latin1.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv"
echo '{"steps": {"hampel_filter": {}}}' > "$tmp/config.json"
expect unknown_step 2 'configuration /steps/hampel_filter: unknown step' -- \
  correct --config "$tmp/config.json" --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv"
echo '{"steps": ' > "$tmp/broken.json"
expect broken_json 2 'broken.json: line 2, column 1: not valid JSON' -- \
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
expect good_run 0 'corrected 2 of 2 rows' -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv"

# --skip-invalid: cleaned + rejected = input
printf 'transect_id,time,chainage_m,sensor,image_id\nT1,2019-03-01T00:30:00Z,100,landsat8,a\nT1,2019-03-01T00:40:00Z,x,landsat8,b\nT1,2019-03-01T00:50:00,100,landsat8,c\nT1,2019-03-01T01:30:00Z,100,landsat8,d\n' > "$tmp/mixed.csv"
expect skip_invalid 0 '2 rejected input rows' -- \
  correct --observations "$tmp/mixed.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv" --skip-invalid
cleaned=$(($(wc -l < "$tmp/out.csv") - 1)); rejected=$(($(wc -l < "$tmp/out.rejected.csv") - 1))
if [[ $cleaned -eq 2 && $rejected -eq 2 ]] && grep -q 'chainage_m,x,not a number' "$tmp/out.rejected.csv"; then
  echo "ok   skip_invalid_counts"; passed=$((passed+1))
else
  echo "FAIL skip_invalid_counts: cleaned $cleaned rejected $rejected"; cat "$tmp/out.rejected.csv"; failures=$((failures+1))
fi

# --- the option parser ---
check() {  # check NAME CONDITION_STATUS DETAIL
  if [[ $2 -eq 0 ]]; then echo "ok   $1"; passed=$((passed+1)); else echo "FAIL $1: $3"; failures=$((failures+1)); fi
}
base=(--observations "$tmp/good.csv" --water-levels "$tmp/wl.csv")
expect_stdout short_help 0 'usage: strandline correct' -- correct -h
expect_stdout short_help_tide 0 'usage: strandline tide-predict' -- tide-predict -h
expect did_you_mean 2 'unknown option --observtions (did you mean --observations?)' -- \
  correct --observtions "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --out "$tmp/out.csv"
# Every option is checked before any input is opened: an unknown option wins over a missing file.
expect unknown_before_inputs 2 'unknown option --bogus' -- \
  correct --observations "$tmp/absent/huge.csv" --water-levels "$tmp/absent/wl.csv" --slope 0.05 --out "$tmp/out.csv" --bogus 1
expect slope_percent 2 'option --slope "8%": give tan(beta): 8% is 0.08' -- \
  correct "${base[@]}" --slope 8% --out "$tmp/out.csv"
expect slope_ratio 2 'option --slope "1:12": give tan(beta): 1:12 is 0.0833' -- \
  correct "${base[@]}" --slope 1:12 --out "$tmp/out.csv"
expect trend_from_date 0 'corrected 2 of 2 rows' -- \
  correct "${base[@]}" --slope 0.05 --trend-from 2019-01-01 --trend-to 2019-12-31 --out "$tmp/out.csv" --summary "$tmp/summary.json"
if grep -q '"2019-01-01T00:00:00Z"' "$tmp/summary.json" 2>/dev/null; then r=0; else r=1; fi
check trend_from_date_is_midnight $r "summary lacks the trend window from 2019-01-01T00:00:00Z"

# correct --check: validates and reports, runs nothing, writes nothing.
expect_stdout check_only 0 'inputs valid: 2 rows on 1 transects; times 2019-03-01T00:30:00Z to 2019-03-01T01:30:00Z' -- \
  correct "${base[@]}" --slope 0.05 --out "$tmp/out.csv" --summary "$tmp/check_summary.json" --check
if [[ ! -e "$tmp/out.csv" && ! -e "$tmp/check_summary.json" ]]; then r=0; else r=1; fi
check check_only_writes_nothing $r "--check wrote an output"
expect check_bad_input 2 'bad_month.csv:2: time "2019-13-01T00:00Z": month out of range' -- \
  correct --observations "$tmp/bad_month.csv" --water-levels "$tmp/wl.csv" --slope 0.05 --check

# `slope --help` lists only what `slope` accepts: each listed option (with its partner where it
# needs one) passes every option check and the run stops at the absent observations file.
"$exe" slope --help >"$tmp/slope_help" 2>&1
refused=""
while read -r option placeholder; do
  case "$option" in --observations|--water-levels|--out|--help|-h,) continue ;; esac
  case "$placeholder" in
    FILE) extra=("$tmp/absent.file") ;;
    MIN:MAX) extra=(0.01:0.2) ;;
    MODE) extra=(setup --waves "$tmp/absent.file") ;;
    TIME) extra=(2019-01-01) ;;
    auto) extra=(auto) ;;
    [A-Z]*) extra=(0.05) ;;
    *) extra=() ;;
  esac
  [[ "$option" == --default-slope-sigma ]] && extra+=(--default-slope 0.1)
  "$exe" slope --observations "$tmp/absent.csv" --water-levels "$tmp/wl.csv" --out "$tmp/x.json" \
    "$option" "${extra[@]}" >/dev/null 2>"$tmp/stderr"
  grep -q 'cannot open' "$tmp/stderr" || refused+=" $option($(head -1 "$tmp/stderr"))"
done < <(grep -oE '^  --[a-z-]+( [A-Za-z:|]+)?' "$tmp/slope_help")
[[ -z "$refused" && -s "$tmp/slope_help" ]]; check slope_help_matches_options $? "listed but refused:$refused"

# keys: a database that does not exist is refused, not created.
expect keys_missing_db 2 'does not exist' -- keys list --db "$tmp/typo.db"
[[ ! -e "$tmp/typo.db" ]]; check keys_missing_db_not_created $? "keys created $tmp/typo.db"
# A --static folder that does not exist is a usage error naming it, before the server starts
# (it was an "internal error", exit 1, with the folder the README named).
expect serve_static_missing 2 "--static $tmp/no-such-dist: not a folder" -- \
  serve --db "$tmp/serve.db" --port 0 --static "$tmp/no-such-dist"

# The end-of-run line counts what was corrected, not what was read; a run that corrects
# nothing ends with exit 3 and the reason (it said "corrected 2 rows", exit 0).
printf 'time,level_m\n2010-01-01T00:00:00Z,0.1\n2010-01-01T01:00:00Z,0.2\n' > "$tmp/wl_2010.csv"
"$exe" correct --observations "$tmp/good.csv" --water-levels "$tmp/wl_2010.csv" --slope 0.1 \
  --out "$tmp/none.csv" > /dev/null 2> "$tmp/none.err"; got=$?
[[ $got -eq 3 ]] && grep -qF "corrected 0 of 2 rows on 1 transects (0 accepted; uncorrected: 2 no water level)" "$tmp/none.err" &&
  grep -qF "no row was corrected (2 no water level)" "$tmp/none.err"
check nothing_corrected_is_exit_3 $? "exit $got: $(cat "$tmp/none.err")"
printf 'time,level_m\n2019-03-01T00:00:00Z,0.1\n2019-03-01T01:00:00Z,0.4\n' > "$tmp/wl_part.csv"
"$exe" correct --observations "$tmp/good.csv" --water-levels "$tmp/wl_part.csv" --slope 0.1 \
  --out "$tmp/part.csv" > /dev/null 2> "$tmp/part.err"; got=$?
[[ $got -eq 0 ]] && grep -qF "corrected 1 of 2 rows on 1 transects (" "$tmp/part.err" &&
  grep -qF "uncorrected: 1 no water level)" "$tmp/part.err"
check partly_corrected_counts_by_reason $? "exit $got: $(cat "$tmp/part.err")"
# A gauge sampled every 2 h: the rows between its samples are counted and the run says so
# (the level's sigma was a fixed 0.10 m whatever the sampling interval, and nothing was said).
printf 'time,level_m\n2019-03-01T00:00:00Z,0.1\n2019-03-01T02:00:00Z,0.5\n2019-03-01T04:00:00Z,0.7\n' > "$tmp/wl_2h.csv"
"$exe" correct --observations "$tmp/good.csv" --water-levels "$tmp/wl_2h.csv" --slope 0.1 \
  --out "$tmp/coarse.csv" > /dev/null 2> "$tmp/coarse.err"; got=$?
[[ $got -eq 0 ]] && grep -qF "warning: 2 rows lie between gauge samples more than 1 h apart" "$tmp/coarse.err" &&
  grep -q "coarse_gauge" "$tmp/coarse.csv"
check coarse_gauge_is_reported $? "exit $got: $(cat "$tmp/coarse.err")"

# A transect file sharing no id with the observations is an error naming both sides (it was exit
# 0 with every point left without geometry).
cat > "$tmp/other_transects.geojson" <<'JSON'
{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"transect_id":"X9","azimuth_deg":90,"length_m":400},
 "geometry":{"type":"Point","coordinates":[3.0,53.0]}}]}
JSON
expect transects_share_no_id 2 "none of the observations' transect ids (T1) is in this file (its ids: X9)" -- \
  correct --observations "$tmp/good.csv" --water-levels "$tmp/wl.csv" --slope 0.1 \
  --transects "$tmp/other_transects.geojson" --out "$tmp/out.csv"
check transects_share_no_id_writes_nothing "$([[ ! -e $tmp/out.csv ]]; echo $?)" "an output was written"

# runup's depth-limited record is said on standard error, not only inside the JSON.
expect runup_depth_limited_warns 0 'warning: Hs 5 m exceeds 0.78 x depth 5 m' -- \
  runup --hs 5 --tp 10 --slope 0.05 --depth 5

# The geometry options carry names of our own; the old ones are refused, naming what is expected.
expect crossing_rule_renamed 2 'expected outermost, innermost or omit' -- \
  intersect --shorelines "$tmp/none.geojson" --transects "$tmp/none.geojson" --crossing most-seaward --out "$tmp/x.csv"
expect sea_side_renamed 2 '--seaward' -- \
  transects --baseline "$tmp/none.geojson" --spacing 50 --length 400 --seaward left --out "$tmp/x.gpkg"

# The demo generator has a real parser: --help prints help and writes nothing.
gen="$build/demo_data/strandline-demo-gen"
(cd "$tmp" && "$gen" --help >"$tmp/gen_help" 2>&1); code=$?
[[ $code -eq 0 && ! -e "$tmp/--help" ]] && grep -q 'OUTDIR' "$tmp/gen_help"; check demo_gen_help $? "exit $code; $(head -2 "$tmp/gen_help")"
(cd "$tmp" && "$gen" "$tmp/site" --transects 2 --bogus >/dev/null 2>&1); code=$?
[[ $code -eq 2 && ! -e "$tmp/site" ]]; check demo_gen_unknown_option $? "exit $code"

# tide-predict takes a date alone as midnight UTC (the demo site ships a constituent file).
"$gen" "$tmp/site" --transects 2 >/dev/null 2>&1
expect_stdout tide_predict_date 0 '2020-01-01T01:00:00Z,' -- \
  tide-predict --constituents "$tmp/site/tide_constituents.json" --from 2020-01-01 --to 2020-01-01T01:00Z --step-s 3600

echo "$passed passed, $failures failed"
[[ $failures -eq 0 ]]
