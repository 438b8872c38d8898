import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseBuildSpec } from '../../harness/builds/spec.js';
import { runOne } from '../../harness/run/runOne.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';

// The headline claim of the reference governor, measured on the bundled scenario (not tuned for
// the claim): an abrupt 0.6 m/s command onto a floor of μs = 0.2 — a slippery floor for legged
// walking (common practice).
describe('slick-patch-abrupt: the reference governor against the unconstrained core', () => {
  it('nominal slips while governed walks with zero commanded violations and at least 5× less slip', async () => {
    const loaded = await loadScenarioFile('scenarios/slick-patch-abrupt.yaml');
    if (!loaded.ok) throw new Error(JSON.stringify(loaded.errors));
    const [scenario] = loaded.scenarios;
    const outDir = mkdtempSync(path.join(tmpdir(), 'footing-headline-'));
    const run = (spec: string) => runOne({ scenario, build: parseBuildSpec(spec, process.cwd()), outDir, trace: false });
    const nominal = await run('ref:nominal');
    const governed = await run('ref:governed');
    expect(nominal.status).toBe('fail');
    expect(governed.status).toBe('pass');
    const slipNominal = nominal.metrics!.slipDistance_m;
    const slipGoverned = governed.metrics!.slipDistance_m;
    expect(nominal.metrics!.fell || slipNominal > 0.5).toBe(true);
    expect(governed.metrics!.fell).toBe(false);
    expect(governed.metrics!.violations.commanded).toBe(0);
    expect(slipNominal / slipGoverned).toBeGreaterThanOrEqual(5);
  });
});
