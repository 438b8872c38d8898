// Repeated-trial checks of the loop-time verdict (run by `npm run soak`, which .ci/run calls):
// the verdict must come from the controller, not from what else the machine is doing.
import { spawn, type ChildProcess } from 'node:child_process';
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { measurePairedLoopTime, recordStreams, type RecordedStream } from '../../harness/bench/pairedLoopTime.js';
import { parseBuildSpec } from '../../harness/builds/spec.js';
import { defaultPolicy } from '../../harness/gate/defaults.js';
import { loopTimeRows } from '../../harness/gate/loopTimeRules.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';

const TRIES = 20;
const root = fileURLToPath(new URL('../../', import.meta.url));
const governed = parseBuildSpec('ref:governed', root);
const twin = parseBuildSpec('twin=ref:governed', root);
const slow = parseBuildSpec(`slow=${fileURLToPath(new URL('./fixtures/slowGoverned.ts', import.meta.url))}`, root);

/** One busy-looping process per core: the "other process keeps both cores busy" of the trial. */
function loadEveryCore(): ChildProcess[] {
  return Array.from({ length: availableParallelism() }, () =>
    spawn(process.execPath, ['-e', 'let x = 0; for (;;) { x = (x + Math.sqrt(x + 1)) % 1e9; }'], { stdio: 'ignore' }),
  );
}

describe('loop-time verdict under machine load', () => {
  let recordings: RecordedStream[];
  let load: ChildProcess[] = [];

  beforeAll(async () => {
    const scenarios = [];
    for (const id of ['dry-baseline-walk', 'wet-start-stop']) {
      const loaded = await loadScenarioFile(`${root}scenarios/${id}.yaml`);
      if (!loaded.ok) throw new Error(`${id} does not load`);
      scenarios.push(...loaded.scenarios);
    }
    recordings = await recordStreams(scenarios, governed);
    load = loadEveryCore();
  });

  afterAll(() => {
    for (const child of load) child.kill('SIGKILL');
  });

  it(`holds the same build gated against itself in ${TRIES} of ${TRIES} tries with both cores loaded`, async () => {
    const verdicts: string[] = [];
    for (let t = 0; t < TRIES; t++) {
      const timing = await measurePairedLoopTime(recordings, governed, twin);
      const rows = loopTimeRows([{ ...timing, baselineBuild: 'ref:governed', candidateBuild: 'twin' }], [['ref:governed', 'twin']], defaultPolicy().rules);
      verdicts.push(rows.some((r) => r.broken) ? `block ×${timing.ratio.median.toFixed(2)}` : 'hold');
    }
    expect(verdicts).toEqual(Array(TRIES).fill('hold'));
  });

  it(`blocks a build spending 30 µs more per tick in ${TRIES} of ${TRIES} tries, naming loop time`, async () => {
    const reasons: string[] = [];
    for (let t = 0; t < TRIES; t++) {
      const timing = await measurePairedLoopTime(recordings, governed, slow);
      const rows = loopTimeRows([{ ...timing, baselineBuild: 'ref:governed', candidateBuild: 'slow' }], [['ref:governed', 'slow']], defaultPolicy().rules);
      reasons.push(rows.find((r) => r.broken)?.reason ?? `held ×${timing.ratio.median.toFixed(2)} [${timing.ratio.lower}, ${timing.ratio.upper}]`);
    }
    for (const reason of reasons) expect(reason).toMatch(/^loop time: the candidate's tick takes/);
  });
});
