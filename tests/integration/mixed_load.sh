#!/usr/bin/env bash
# A short mixed load on the real service (uploads, queued runs and reads from
# 32 connections for 5 s, tests/bench/mixed_load.py): zero 5xx, no transport
# errors. Functional, not timed; the 60 s benchmark is in tests/bench/.
set -euo pipefail
build=$1 source=$2
exec /usr/bin/python3 "$source/tests/bench/mixed_load.py" --build-dir "$build" --seconds 5 --connections 32 --check
