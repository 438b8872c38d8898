import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runSuite } from '../../harness/commands/run.js';
import { expectStrictJunit } from '../support/junit.js';

const SCENARIO = 'test/run/fixtures/mini/short-stand.yaml';
const MISBEHAVING = 'test/builds/bridge/fixtures/misbehaving_build.py';
const MODULE = 'test/builds/bridge/fixtures/misbehaving_module.mjs';

describe('a failing build fails its own runs, never the suite', () => {
  it('throws, hangs, exits, NaN and a busy loop each become an error run with its reason while the other runs complete', async () => {
    const out = mkdtempSync(path.join(tmpdir(), 'footing-isolation-'));
    const outcome = await runSuite({
      paths: [SCENARIO],
      builds: [
        'ref:nominal',
        `throws=${MODULE}?failure=tick`,
        `nan=${MODULE}?failure=nan`,
        `hangs=exec:python3 ${MISBEHAVING} hang-tick`,
        `exits=exec:python3 ${MISBEHAVING} exit-tick`,
        `spins=test/run/fixtures/spin_module.mjs`,
      ],
      outDir: out,
      jobs: 2,
      quiet: true,
      // The busy loop can only be stopped by the run's wall-clock allowance.
      runTimeout: { base_s: 8, perSimulatedSecond: 0 },
    });
    expect(outcome.exitCode).toBe(1);
    const runs = new Map(outcome.results!.runs.map((r) => [r.build, r]));
    expect(runs.get('nominal')!.status).not.toBe('error');
    expect(runs.get('nominal')!.metrics).not.toBeNull();
    const expected: Record<string, RegExp> = {
      throws: /threw.*deliberate tick failure/,
      nan: /non-finite.*groundForce_N\[4\] = NaN/,
      hangs: /tick-timeout/,
      exits: /exit/,
      spins: /wall-clock allowance/,
    };
    for (const [build, reason] of Object.entries(expected)) {
      const run = runs.get(build)!;
      expect(run.status, build).toBe('error');
      expect(run.error!.message, build).toMatch(reason);
    }
    expect(runs.get('hangs')!.error!.stderrTail).toMatch(/misbehaving_build\[hang-tick\]/);
    expectStrictJunit(out);
  });
});
