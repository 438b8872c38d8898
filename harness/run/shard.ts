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
