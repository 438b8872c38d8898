#!/usr/bin/env bash
# nightly.sh — the `nightly` suite of footing.config.yaml over its builds. Git-ref builds are
# built in .footing-cache/ and reused while their commit is unchanged. Run it from the controller
# repository (where footing.config.yaml lives) after your CI's install step (npm ci).
# Exit: 0 every run passed, 1 a run failed acceptance or errored, 2 bad input (nothing was run),
# 3 internal error. Extra arguments go to `footing run` (e.g. --jobs 4).
set -euo pipefail
read -r -a footing <<< "${FOOTING:-npx --no-install footing}"
out="${FOOTING_OUT:-out/nightly}"
status=0
"${footing[@]}" run --suite "${FOOTING_SUITE:-nightly}" --out "$out" "$@" || status=$?
echo "footing nightly: exit $status — JUnit $out/junit.xml, report $out/report.html, summary $out/summary.md"
exit "$status"
