// `--shard auto`: the shard a CI matrix or cluster job array hands a job, read from its
// environment (docs/scale-out.md). Variable names and bases: GitLab CI/CD predefined variables
// (CI_NODE_INDEX 1-based, CI_NODE_TOTAL), Kubernetes Indexed Jobs (JOB_COMPLETION_INDEX 0-based),
// Slurm job arrays (SLURM_ARRAY_TASK_ID/MIN/STEP/COUNT), as their documentation gives them.

import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runSuite } from '../../../harness/commands/run.js';
import { EXIT } from '../../../harness/commands/exit.js';
import type { ResultsFile } from '../../../harness/results/types.js';
import { resolveShard, ShardSpecError, shardFromEnvironment } from '../../../harness/run/shard.js';

type Env = Record<string, string>;

/** Each scheduler's variables for job k (1-based) of n. */
const SCHEDULERS: { name: string; env: (k: number, n: number) => Env; count?: number }[] = [
  { name: 'GitLab parallel', env: (k, n) => ({ CI_NODE_INDEX: String(k), CI_NODE_TOTAL: String(n) }) },
  { name: 'Kubernetes Indexed Job, count by variable', env: (k, n) => ({ JOB_COMPLETION_INDEX: String(k - 1), FOOTING_SHARD_COUNT: String(n) }) },
  { name: 'Kubernetes Indexed Job, count by flag', env: (k) => ({ JOB_COMPLETION_INDEX: String(k - 1) }), count: 2 },
  // An array --array=1-2: ids start at SLURM_ARRAY_TASK_MIN = 1, not 0.
  { name: 'Slurm array 1-N', env: (k, n) => ({ SLURM_ARRAY_TASK_ID: String(k), SLURM_ARRAY_TASK_MIN: '1', SLURM_ARRAY_TASK_COUNT: String(n) }) },
];

describe('--shard auto reads the job index and count', () => {
  it.each(SCHEDULERS)('$name', ({ env, count }) => {
    expect(resolveShard('auto', { env: env(1, 2), count })).toEqual({ index: 1, count: 2 });
    expect(resolveShard('auto', { env: env(2, 2), count })).toEqual({ index: 2, count: 2 });
  });

  it('counts a Slurm array from its first id in its steps (--array=4-10:3 → ids 4, 7, 10)', () => {
    const env = (id: number) => ({ SLURM_ARRAY_TASK_ID: String(id), SLURM_ARRAY_TASK_MIN: '4', SLURM_ARRAY_TASK_STEP: '3', SLURM_ARRAY_TASK_COUNT: '3' });
    expect([4, 7, 10].map((id) => shardFromEnvironment({ env: env(id) }).index)).toEqual([1, 2, 3]);
    expect(() => shardFromEnvironment({ env: env(5) })).toThrow(/SLURM_ARRAY_TASK_ID=5 is not in the array from 4 in steps of 3/);
  });

  it('--shard-count wins over FOOTING_SHARD_COUNT for a Kubernetes index', () => {
    expect(shardFromEnvironment({ env: { JOB_COMPLETION_INDEX: '3', FOOTING_SHARD_COUNT: '2' }, count: 4 })).toEqual({ index: 4, count: 4 });
  });

  it('refuses with a message naming every variable set it reads when none is set', () => {
    expect(() => resolveShard('auto', { env: {} })).toThrow(ShardSpecError);
    expect(() => resolveShard('auto', { env: {} })).toThrow(/CI_NODE_INDEX.*SLURM_ARRAY_TASK_ID.*JOB_COMPLETION_INDEX.*--shard K\/N/);
  });

  it('refuses a Kubernetes index without a count, a non-number and an index past the count', () => {
    expect(() => resolveShard('auto', { env: { JOB_COMPLETION_INDEX: '0' } })).toThrow(/--shard-count N or FOOTING_SHARD_COUNT/);
    expect(() => resolveShard('auto', { env: { CI_NODE_INDEX: 'two', CI_NODE_TOTAL: '4' } })).toThrow(/CI_NODE_INDEX="two": expected a whole number/);
    expect(() => resolveShard('auto', { env: { CI_NODE_INDEX: '5', CI_NODE_TOTAL: '4' } })).toThrow(/shard 5 of 4/);
    expect(() => resolveShard('auto', { env: { JOB_COMPLETION_INDEX: '2', FOOTING_SHARD_COUNT: '2' } })).toThrow(/shard 3 of 2/);
  });
});

const MINI = 'test/run/fixtures/mini';
const BUILDS = ['ref:nominal'];
const fresh = (name: string) => mkdtempSync(path.join(tmpdir(), `footing-${name}-`));
const pairs = (dir: string) =>
  (JSON.parse(readFileSync(path.join(dir, 'results.json'), 'utf8')) as ResultsFile).runs.map((r) => `${r.scenario.id}×${r.build}`);

describe('footing run --shard auto', () => {
  it('bad input (exit 2, nothing run) when no scheduler variable is set', async () => {
    const outcome = await runSuite({ paths: [MINI], builds: BUILDS, outDir: fresh('auto-none'), shard: 'auto', env: {}, quiet: true });
    expect(outcome.exitCode).toBe(EXIT.badInput);
    expect(outcome.lines.join('\n')).toMatch(/--shard auto: no job index in the environment/);
  });

  it('for every scheduler, the two shards together are the unsharded run, each pair once', async () => {
    const whole = fresh('auto-whole');
    await runSuite({ paths: [MINI], builds: BUILDS, outDir: whole, jobs: 1, quiet: true });
    const all = pairs(whole).sort();
    for (const scheduler of SCHEDULERS) {
      const shards: string[] = [];
      for (const k of [1, 2]) {
        const dir = fresh(`auto-${k}`);
        const outcome = await runSuite({ paths: [MINI], builds: BUILDS, outDir: dir, jobs: 1, shard: 'auto', shardCount: scheduler.count, env: scheduler.env(k, 2), quiet: true });
        expect(outcome.exitCode, scheduler.name).not.toBe(EXIT.badInput);
        shards.push(...pairs(dir));
      }
      expect(shards.sort(), scheduler.name).toEqual(all);
    }
  });
});
