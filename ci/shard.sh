#!/usr/bin/env bash
# shard.sh K N — one machine's share (shard K of N, deterministic) of a suite, for a CI matrix job
# or a cluster job array; ci/merge-shards.sh combines the shards afterwards. Results land in
# out/shards/shard-K/ (collect them as artefacts into one out/shards/ for the merge step).
# shard.sh auto — K and N from the scheduler's environment (GitLab CI_NODE_INDEX/CI_NODE_TOTAL,
# Slurm SLURM_ARRAY_TASK_ID/SLURM_ARRAY_TASK_COUNT, Kubernetes JOB_COMPLETION_INDEX with
# FOOTING_SHARD_COUNT); see docs/scale-out.md. Results land in out/shards/shard-<job index>/.
# Exit: 0 the shard ran (failed runs are reported by the merge step), 2 bad input, 3 internal error.
set -euo pipefail
k="${1:?usage: shard.sh K N [footing run flags] | shard.sh auto [footing run flags]}"
if [ "$k" = "auto" ]; then
  shift 1
  shard="auto"
  label="${CI_NODE_INDEX:-${SLURM_ARRAY_TASK_ID:-${JOB_COMPLETION_INDEX:-none}}}"
else
  n="${2:?usage: shard.sh K N [footing run flags] | shard.sh auto [footing run flags]}"
  shift 2
  shard="$k/$n"
  label="$k"
fi
read -r -a footing <<< "${FOOTING:-npx --no-install footing}"
root="${FOOTING_SHARDS:-out/shards}"
status=0
"${footing[@]}" run --suite "${FOOTING_SUITE:-nightly}" --shard "$shard" --out "$root/shard-$label" "$@" || status=$?
echo "footing shard $shard: exit $status — $root/shard-$label/"
if [ "$status" -eq 1 ]; then exit 0; fi
exit "$status"
