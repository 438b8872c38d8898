#!/usr/bin/env bash
# shard.sh K N — one machine's share (shard K of N, deterministic) of a suite, for a CI matrix job
# or a cluster job array; ci/merge-shards.sh combines the shards afterwards. Results land in
# out/shards/shard-K/ (collect them as artefacts into one out/shards/ for the merge step).
# Exit: 0 the shard ran (failed runs are reported by the merge step), 2 bad input, 3 internal error.
set -euo pipefail
k="${1:?usage: shard.sh K N [footing run flags]}"
n="${2:?usage: shard.sh K N [footing run flags]}"
shift 2
read -r -a footing <<< "${FOOTING:-npx --no-install footing}"
root="${FOOTING_SHARDS:-out/shards}"
status=0
"${footing[@]}" run --suite "${FOOTING_SUITE:-nightly}" --shard "$k/$n" --out "$root/shard-$k" "$@" || status=$?
echo "footing shard $k/$n: exit $status — $root/shard-$k/"
if [ "$status" -eq 1 ]; then exit 0; fi
exit "$status"
