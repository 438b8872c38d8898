// Deterministic sharding of (scenario × build) pairs: the same pair list gives the same shards on
// every machine. Balanced by simulated duration with the longest-processing-time-first rule
// (Graham 1969: within 4/3 of the optimal makespan), ties broken by pair order.

export interface ShardSpec {
  index: number; // 1-based K
  count: number; // N
}

export class ShardSpecError extends Error {}

export function parseShard(text: string): ShardSpec {
  const match = /^(\d+)\/(\d+)$/.exec(text.trim());
  if (!match) throw new ShardSpecError(`--shard ${text}: expected K/N with whole numbers, e.g. 2/4`);
  const index = Number(match[1]);
  const count = Number(match[2]);
  if (count < 1 || index < 1 || index > count) {
    throw new ShardSpecError(`--shard ${text}: expected 1 ≤ K ≤ N (shard K of N)`);
  }
  return { index, count };
}

/** Indices (into `costs`) assigned to shard K of N, in their original order. */
export function shardIndices(costs: readonly number[], shard: ShardSpec): number[] {
  const order = costs.map((cost, i) => ({ cost, i })).sort((a, b) => b.cost - a.cost || a.i - b.i);
  const load = new Array<number>(shard.count).fill(0);
  const owner = new Array<number>(costs.length);
  for (const { cost, i } of order) {
    let best = 0;
    for (let s = 1; s < shard.count; s++) if (load[s] < load[best]) best = s;
    load[best] += cost;
    owner[i] = best;
  }
  const mine: number[] = [];
  for (let i = 0; i < costs.length; i++) if (owner[i] === shard.index - 1) mine.push(i);
  return mine;
}

/** What `--shard auto` reads: the environment and a count given by flag (Kubernetes). */
export interface ShardSource {
  env: Readonly<Record<string, string | undefined>>;
  /** --shard-count: the job count where the scheduler gives only the index. */
  count?: number;
}

/** `--shard K/N`, or `--shard auto`: the index and count the CI matrix or job array gives. */
export function resolveShard(text: string, source: ShardSource): ShardSpec {
  return text.trim() === 'auto' ? shardFromEnvironment(source) : parseShard(text);
}

/**
 * The shard a scheduler hands this job, tried in this order:
 *  GitLab parallel jobs: CI_NODE_INDEX (1-based) of CI_NODE_TOTAL;
 *  Slurm job arrays: SLURM_ARRAY_TASK_ID of SLURM_ARRAY_TASK_COUNT, counted from
 *    SLURM_ARRAY_TASK_MIN in steps of SLURM_ARRAY_TASK_STEP (an array 0-7, 1-8 or 0-14:2);
 *  Kubernetes Indexed Jobs: JOB_COMPLETION_INDEX (0-based) of --shard-count or FOOTING_SHARD_COUNT
 *    (the Job's `completions`, which Kubernetes does not put in the pod's environment).
 */
export function shardFromEnvironment(source: ShardSource): ShardSpec {
  const env = source.env;
  const whole = (name: string, value: string | number | undefined): number => {
    const text = String(value ?? '').trim();
    if (!/^\d+$/.test(text)) throw new ShardSpecError(`--shard auto: ${name}=${JSON.stringify(value ?? '')}: expected a whole number`);
    return Number(text);
  };
  const checked = (index: number, count: number, from: string): ShardSpec => {
    if (count < 1 || index < 1 || index > count) {
      throw new ShardSpecError(`--shard auto: ${from} gives shard ${index} of ${count}; expected 1 ≤ K ≤ N`);
    }
    return { index, count };
  };
  if (env.CI_NODE_INDEX !== undefined || env.CI_NODE_TOTAL !== undefined) {
    return checked(whole('CI_NODE_INDEX', env.CI_NODE_INDEX), whole('CI_NODE_TOTAL', env.CI_NODE_TOTAL), 'CI_NODE_INDEX/CI_NODE_TOTAL');
  }
  if (env.SLURM_ARRAY_TASK_ID !== undefined) {
    const id = whole('SLURM_ARRAY_TASK_ID', env.SLURM_ARRAY_TASK_ID);
    const min = env.SLURM_ARRAY_TASK_MIN === undefined ? 0 : whole('SLURM_ARRAY_TASK_MIN', env.SLURM_ARRAY_TASK_MIN);
    const step = env.SLURM_ARRAY_TASK_STEP === undefined ? 1 : whole('SLURM_ARRAY_TASK_STEP', env.SLURM_ARRAY_TASK_STEP);
    const count = whole('SLURM_ARRAY_TASK_COUNT', env.SLURM_ARRAY_TASK_COUNT);
    if (step < 1 || id < min || (id - min) % step !== 0) {
      throw new ShardSpecError(`--shard auto: SLURM_ARRAY_TASK_ID=${id} is not in the array from ${min} in steps of ${step}`);
    }
    return checked((id - min) / step + 1, count, 'SLURM_ARRAY_TASK_ID/SLURM_ARRAY_TASK_COUNT');
  }
  if (env.JOB_COMPLETION_INDEX !== undefined) {
    const count =
      source.count !== undefined ? whole('--shard-count', source.count) : env.FOOTING_SHARD_COUNT !== undefined ? whole('FOOTING_SHARD_COUNT', env.FOOTING_SHARD_COUNT) : undefined;
    if (count === undefined) {
      throw new ShardSpecError('--shard auto: JOB_COMPLETION_INDEX is set but not the job count; give --shard-count N or FOOTING_SHARD_COUNT=N (the Job\'s completions)');
    }
    return checked(whole('JOB_COMPLETION_INDEX', env.JOB_COMPLETION_INDEX) + 1, count, 'JOB_COMPLETION_INDEX');
  }
  throw new ShardSpecError(
    '--shard auto: no job index in the environment; expected CI_NODE_INDEX and CI_NODE_TOTAL (GitLab parallel jobs), ' +
      'SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT (Slurm job arrays) or JOB_COMPLETION_INDEX with --shard-count N or FOOTING_SHARD_COUNT (Kubernetes Indexed Jobs); ' +
      'or give --shard K/N',
  );
}
