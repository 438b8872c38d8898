// `--jobs 1` with reference builds runs in the command's own thread (harness/run/inProcess.ts):
// the same results as on a worker thread, the wall-clock allowance still kept (by the watchdog
// between ticks), and the steady-state real-time factor recorded beside the cold one.
import { mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runSuite } from '../../harness/commands/run.js';
import type { RunResult } from '../../harness/results/types.js';

const MINI = 'test/run/fixtures/mini';
const fresh = (name: string) => mkdtempSync(path.join(tmpdir(), `footing-inprocess-${name}-`));

/** What does not depend on the machine's speed. */
function deterministic(run: RunResult): unknown {
  const { loopTime_us: _loop, ...metrics } = (run.metrics ?? {}) as Record<string, unknown>;
  const { wall_s: _w, realTimeFactor: _r, steadyRealTimeFactor: _s, ...sim } = (run.sim ?? {}) as Record<string, unknown>;
  return { ...run, metrics, sim };
}

describe('reference runs in-process with one job', () => {
  it('give the same results as on worker threads, each with a cold and a steady real-time factor', async () => {
    const builds = ['ref:nominal', 'ref:governed'];
    const inProcess = await runSuite({ paths: [MINI], builds, outDir: fresh('one'), jobs: 1, quiet: true });
    const threads = await runSuite({ paths: [MINI], builds, outDir: fresh('two'), jobs: 2, quiet: true });
    const one = inProcess.results!.runs;
    expect(one.length).toBeGreaterThan(1);
    expect(one.map(deterministic)).toEqual(threads.results!.runs.map(deterministic));
    for (const run of [...one, ...threads.results!.runs]) {
      expect(run.sim!.realTimeFactor).toBeGreaterThan(0);
      expect(run.sim!.steadyRealTimeFactor).toBeGreaterThan(0);
    }
  });

  it('still stop a run at its wall-clock allowance (the watchdog), as an error run of that pair only', async () => {
    // An allowance of 0 s: the watchdog's first look at the clock (tick 256) is past it.
    const out = fresh('allowance');
    const outcome = await runSuite({ paths: [MINI], builds: ['ref:nominal'], outDir: out, jobs: 1, quiet: true, runTimeout: { base_s: 0, perSimulatedSecond: 0 } });
    const runs = outcome.results!.runs;
    expect(runs.length).toBeGreaterThan(0);
    for (const run of runs) {
      expect(run.status).toBe('error');
      expect(run.error!.reason).toBe('run-timeout');
      expect(run.error!.message).toMatch(/wall-clock allowance of 0 s/);
    }
    expect(readdirSync(path.join(out, 'runs')).filter((n) => n.endsWith('.json'))).toHaveLength(runs.length);
  });
});
