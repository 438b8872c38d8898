// Threads started ahead of the work (run/pool.ts warmRunThreads, bench/suiteLoopTime.ts
// warmLoopTimeThread) must change nothing but when their start-up is paid: a pool takes the
// parked threads, the runs they serve score bit for bit as runs in this thread do, and the
// loop time measured in its own thread (warm or not) gives every candidate its record.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { measureSuiteLoopTimesInThread, warmLoopTimeThread } from '../../harness/bench/suiteLoopTime.js';
import { parseBuildSpec } from '../../harness/builds/spec.js';
import { runSuite } from '../../harness/commands/run.js';
import { parkedRunThreads, warmRunThreads } from '../../harness/run/pool.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';
import { deterministicPart } from '../support/deterministicRun.js';

const MINI = 'test/run/fixtures/mini';
const ROOT = new URL('../../', import.meta.url).pathname;
const fresh = (name: string) => mkdtempSync(path.join(tmpdir(), `footing-warm-${name}-`));

describe('threads started ahead', () => {
  it('a pool takes the parked run threads, and their runs score as runs in this thread do', async () => {
    const before = parkedRunThreads();
    warmRunThreads(before + 2);
    expect(parkedRunThreads()).toBe(before + 2);
    const options = { paths: [`${MINI}/short-stand.yaml`, `${MINI}/short-slick.yaml`], builds: ['ref:nominal', 'ref:governed'], quiet: true };
    const threaded = await runSuite({ ...options, outDir: fresh('threads'), jobs: 2 });
    // Both slots were served by parked threads (the warm-up found enough parked and started none).
    expect(parkedRunThreads()).toBe(before);
    const here = await runSuite({ ...options, outDir: fresh('here'), jobs: 1 });
    expect(threaded.results!.runs.map(deterministicPart)).toEqual(here.results!.runs.map(deterministicPart));
    expect(threaded.results!.runs.every((r) => r.status !== 'error')).toBe(true);
  });

  it('the loop time measured in a thread of its own, warm or cold, has a record per timeable candidate and says why one is missing', async () => {
    const loaded = await loadScenarioFile(path.join(ROOT, `${MINI}/short-stand.yaml`));
    if (!loaded.ok) throw new Error('short-stand does not load');
    const baseline = parseBuildSpec('ref:governed', ROOT);
    const twin = parseBuildSpec('twin=ref:nominal', ROOT);
    const missing = parseBuildSpec('missing=test/run/fixtures/no-such-build.mjs', ROOT);
    const input = { scenarios: loaded.scenarios, baseline, candidates: [twin, missing], observed: new Map() };
    for (const warm of [true, false]) {
      if (warm) warmLoopTimeThread();
      const lines: string[] = [];
      const records = await measureSuiteLoopTimesInThread(input, (line) => lines.push(line));
      expect(records.map((r) => [r.baselineBuild, r.candidateBuild])).toEqual([['governed', 'twin']]);
      expect(records[0].rounds).toBeGreaterThan(0);
      expect(records[0].ratio.median).toBeGreaterThan(0);
      expect(lines.some((line) => /loop time: 2 builds timed against governed/.test(line))).toBe(true);
      expect(lines.some((line) => /loop time: missing not timed \(.*no-such-build/.test(line))).toBe(true);
    }
  });
});
