#!/usr/bin/env bash
# nightly.sh — the `nightly` suite of footing.config.yaml over its builds. Git-ref builds are
# built in .footing-cache/ and reused while their commit is unchanged. Run it from the controller
# repository (where footing.config.yaml lives) after your CI's install step (npm ci).
# The night is added to the history store (the config's `history`, default .footing/history.sqlite;
# FOOTING_HISTORY=0 skips it), filed under HEAD. On a failing night with FOOTING_BISECT=1, the
# commits from the last good night's to HEAD are bisected into $out/bisect/ (bisect.json, bisect.md).
# Exit: 0 every run passed, 1 a run failed acceptance or errored, 2 bad input (nothing was run),
# 3 internal error. Extra arguments go to `footing run` (e.g. --jobs 4).
set -euo pipefail
read -r -a footing <<< "${FOOTING:-npx --no-install footing}"
out="${FOOTING_OUT:-out/nightly}"
status=0
"${footing[@]}" run --suite "${FOOTING_SUITE:-nightly}" --out "$out" "$@" || status=$?
if [ "$status" -lt 2 ] && [ "${FOOTING_HISTORY:-1}" != 0 ]; then
  "${footing[@]}" history add "$out" --commit "$(git rev-parse HEAD)" || status=3
fi
if [ "$status" -eq 1 ] && [ "${FOOTING_BISECT:-0}" = 1 ]; then
  good="$("${footing[@]}" history list --last-good || true)"
  if [ -n "$good" ] && [ "$good" != "$(git rev-parse HEAD)" ]; then
    bisected=0
    "${footing[@]}" bisect --good "$good" --bad HEAD --suite "${FOOTING_SUITE:-nightly}" --out "$out/bisect" || bisected=$?
    echo "footing nightly: bisect from the last good night ($good) exit $bisected — $out/bisect/bisect.md"
  else
    echo "footing nightly: no earlier good night in the history to bisect from"
  fi
fi
echo "footing nightly: exit $status — JUnit $out/junit.xml, report $out/report.html, summary $out/summary.md"
exit "$status"
