// The run pool's promises (harness/run/pool.ts): allowances start with the run, a stopped run
// leaves no process behind, --resume retries runs its allowance stopped, and a run's thread is
// its own (a build's leftovers reach no other pair), and a crashed thread's build processes die
// with it.
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { ResultsFile, RunResult } from '../../harness/results/types.js';
import { runSuite } from '../../harness/commands/run.js';
import { createRunPool, RunThreadError } from '../../harness/run/pool.js';
import type { RunTask } from '../../harness/run/runOne.js';
import { survivorsAfter, uniqueMarker } from '../support/processes.js';

const BRIEF = 'test/run/fixtures/brief';
const MINI = 'test/run/fixtures/mini';
const SLOW = 'test/run/fixtures/slow_build.py';
const fresh = (name: string) => mkdtempSync(path.join(tmpdir(), `footing-pool-${name}-`));
const readRuns = (dir: string) => (JSON.parse(readFileSync(path.join(dir, 'results.json'), 'utf8')) as ResultsFile).runs;

describe('a run\'s wall-clock allowance', () => {
  it('starts when the run starts: four ~1.2 s runs queued behind each other on one job all finish within a 4 s allowance', async () => {
    // Counted from queue time, the third (2.4 s of waiting + 1.2 s) and fourth would be stopped.
    const marker = uniqueMarker('queue');
    const builds = ['a', 'b', 'c', 'd'].map((name) => `${name}=exec:python3 ${SLOW} 0.004 ${marker}`);
    const outcome = await runSuite({ paths: [BRIEF], builds, outDir: fresh('queue'), jobs: 1, quiet: true, runTimeout: { base_s: 4, perSimulatedSecond: 0 } });
    const runs = outcome.results!.runs;
    expect(runs).toHaveLength(4);
    for (const run of runs) expect(run.error?.reason, run.build).not.toBe('run-timeout');
    expect(await survivorsAfter(marker)).toEqual([]);
  });

  it('stops a run that outlasts it, kills its build\'s whole process group, and --resume runs it again', async () => {
    const marker = uniqueMarker('stopped');
    const out = fresh('stopped');
    // 300 ticks of 50 ms each: 15 s, far over the 2 s allowance.
    const options = { paths: [BRIEF], builds: ['ref:nominal', `slow=exec:python3 ${SLOW} 0.05 ${marker}`], outDir: out, jobs: 2, quiet: true, runTimeout: { base_s: 2, perSimulatedSecond: 0 } };
    const first = await runSuite(options);
    const slow = first.results!.runs.find((r) => r.build === 'slow') as RunResult;
    expect(slow.status).toBe('error');
    expect(slow.error!.reason).toBe('run-timeout');
    expect(slow.error!.message).toMatch(/wall-clock allowance of 2 s/);
    // The helper and its grandchild, which the build's thread never got to close.
    expect(await survivorsAfter(marker)).toEqual([]);

    const again = await runSuite({ ...options, resume: true });
    expect(again.lines.join('\n')).toMatch(/resuming: 1 of 2 runs already complete/);
    expect(readRuns(out).find((r) => r.build === 'slow')!.error!.reason).toBe('run-timeout');
    expect(await survivorsAfter(marker)).toEqual([]);
  });
});

describe('a run\'s thread is its own', () => {
  it('an unhandled rejection fails the build\'s own run only; the pair after it on the same job passes', async () => {
    const outcome = await runSuite({
      paths: [`${MINI}/short-stand.yaml`],
      builds: ['leaky=test/run/fixtures/leaky_module.mjs?leak=rejection', 'ref:nominal'],
      outDir: fresh('rejection'),
      jobs: 1,
      quiet: true,
    });
    const [leaky, nominal] = outcome.results!.runs;
    expect(leaky.build).toBe('leaky');
    expect(leaky.status).toBe('error');
    expect(leaky.error!.reason).toBe('threw');
    expect(leaky.error!.message).toMatch(/uncaught in the build's thread: deliberately unhandled/);
    expect(nominal.status).toBe('pass');
  });

  it('a build patching Array.prototype.push and Math.sqrt changes no pair\'s result, its own included', async () => {
    const clean = await runSuite({ paths: [BRIEF], builds: ['patcher=test/run/fixtures/leaky_module.mjs', 'ref:nominal', 'ref:governed'], outDir: fresh('clean'), jobs: 1, quiet: true });
    const patched = await runSuite({
      paths: [BRIEF],
      builds: ['patcher=test/run/fixtures/leaky_module.mjs?leak=prototype', 'ref:nominal', 'ref:governed'],
      outDir: fresh('patched'),
      jobs: 1,
      quiet: true,
    });
    // Not even the patcher's own run changes: the patch stays in its build's thread. (Before
    // module builds had threads of their own, the same patch broke its own run with an error.)
    const strip = (r: RunResult) => ({ status: r.status, reasons: r.reasons, slip_m: r.metrics?.slipDistance_m, fall: r.metrics?.fallReason, margin: r.metrics?.frictionMargin });
    expect(patched.results!.runs.map(strip)).toEqual(clean.results!.runs.map(strip));
  });

  it('a module build patching the harness\'s slip and fall trackers cannot change the score of its own run', async () => {
    // Its own thread (harness/builds/isolated/): the patched classes are that thread's copies.
    const outcome = await runSuite({
      paths: [`${MINI}/short-stand.yaml`],
      builds: ['plain=test/run/fixtures/leaky_module.mjs', 'cheat=test/run/fixtures/leaky_module.mjs?leak=scorer'],
      outDir: fresh('scorer'),
      jobs: 2,
      quiet: true,
    });
    const [plain, cheat] = outcome.results!.runs;
    // Zero forces: the robot falls, and the cheat's run says so too.
    expect(plain.metrics!.fell).toBe(true);
    const scored = (r: RunResult) => ({ status: r.status, reasons: r.reasons, fell: r.metrics?.fell, slip_m: r.metrics?.slipDistance_m, margin: r.metrics?.frictionMargin });
    expect(scored(cheat)).toEqual(scored(plain));
  });
});

describe('a crashed run thread', () => {
  it.each(['throw', 'exit', 'rejection'] as const)('(%s) fails its own run and leaves no process of its build behind', async (crash) => {
    const marker = uniqueMarker(`crash-${crash}`);
    const pool = createRunPool(1, { threadUrl: new URL('./fixtures/crashing_thread.mjs', import.meta.url) });
    try {
      // The fixture thread reads only `crash` and `marker`; the pool passes the task through untouched.
      const task = { crash, marker, build: { kind: 'process' } } as unknown as RunTask;
      await expect(pool.run(task, 60)).rejects.toThrow(RunThreadError);
      // The child and its grandchild: the thread announced the group and never closed it.
      expect(await survivorsAfter(marker)).toEqual([]);
    } finally {
      await pool.close();
    }
  });
});
