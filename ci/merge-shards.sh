#!/usr/bin/env bash
# merge-shards.sh — after every shard.sh job: one results set in out/merged/ (report, JUnit,
# summary), then, when FOOTING_BASELINE names a build, the gate of FOOTING_CANDIDATE (default
# `candidate`) against it, writing out/merged/gate.md.
# Exit: 0 every run passed (and the gate holds), 1 a run failed or errored or the gate blocks,
# 2 bad input (missing or mixed shards), 3 internal error.
set -euo pipefail
read -r -a footing <<< "${FOOTING:-npx --no-install footing}"
root="${FOOTING_SHARDS:-out/shards}"
out="${FOOTING_OUT:-out/merged}"
baseline="${FOOTING_BASELINE:-}"
candidate="${FOOTING_CANDIDATE:-candidate}"
shopt -s nullglob
shards=("$root"/shard-*)
if [ "${#shards[@]}" -eq 0 ]; then
  echo "footing merge-shards: no shard folders in $root/" >&2
  exit 2
fi
status=0
"${footing[@]}" merge "${shards[@]}" --out "$out" || status=$?
if [ "$status" -lt 2 ] && [ -n "$baseline" ]; then
  gate=0
  "${footing[@]}" gate --baseline "$out" --candidate "$out" --pair "$baseline=$candidate" --out "$out" || gate=$?
  if [ "$gate" -gt "$status" ]; then status=$gate; fi
fi
echo "footing merge-shards: exit $status — JUnit $out/junit.xml, report $out/report.html${baseline:+, gate $out/gate.md}"
exit "$status"
