#!/usr/bin/env bash
# merge-gate.sh — the pre-merge gate: the `merge` suite of footing.config.yaml over the baseline
# build (e.g. main: git:main) and the candidate (e.g. candidate: git:HEAD), then the gate policy.
# Run it from the controller repository after your CI's install step; the baseline's ref must
# exist locally (shallow clones: git fetch origin main:main, or use git:origin/main).
# Exit: 0 the gate holds (nothing the candidate changed breaks a rule; failures inherited from
# the baseline are listed, not blocking), 1 the gate blocks, 2 bad input (nothing was run),
# 3 internal error. Extra arguments go to `footing run`.
set -euo pipefail
read -r -a footing <<< "${FOOTING:-npx --no-install footing}"
out="${FOOTING_OUT:-out/merge}"
status=0
"${footing[@]}" run --suite "${FOOTING_SUITE:-merge}" --baseline "${FOOTING_BASELINE:-main}" --out "$out" "$@" || status=$?
case "$status" in
  0) verdict="holds" ;;
  1) verdict="BLOCKS the merge" ;;
  2) verdict="bad input, nothing was run" ;;
  *) verdict="internal error" ;;
esac
# The gate's own verdict line names the first blocking rule, its scenario and builds.
line="$(head -n 1 "$out/gate.md" 2>/dev/null | sed 's/^### Footing gate: [^ ]* //' || true)"
echo "footing merge gate: $verdict${line:+ — $line}"
echo "footing merge gate: comment $out/gate.md, JUnit $out/junit.xml, report $out/report.html"
exit "$status"
