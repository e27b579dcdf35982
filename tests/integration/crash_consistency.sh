#!/usr/bin/env bash
# Crash consistency of the service: the real `strandline serve` is killed with
# SIGKILL at random moments while large uploads, retractions, purges and runs
# are in flight, then restarted on the same database; after every kill the
# database must pass its integrity check, every acknowledged upload must be
# listed complete (no upload partial), acknowledged retractions and purges must
# hold, interrupted runs must be failed as "interrupted" and the site re-runnable.
# The work is in crash_consistency.py beside this script.
#
# Parameters (environment): CRASH_KILLS (default 15), CRASH_BUDGET_S (default
# 180: the time the kill cycles aim to fit in), CRASH_SEED (default: random,
# printed first; set it to replay a failure's kill delays and upload sizes).
set -euo pipefail
build=$1 source=$2
[ -d "$source/tests/integration" ] || { echo "FAIL: no source folder $source" >&2; exit 1; }
exec /usr/bin/python3 "$(dirname "$0")/crash_consistency.py" --build-dir "$build"
