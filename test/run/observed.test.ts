import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { observationRequest, recordStreams } from '../../harness/bench/pairedLoopTime.js';
import { parseBuildSpec } from '../../harness/builds/spec.js';
import { unpackObservations } from '../../harness/contract/packed.js';
import { observationsOf } from '../../harness/run/observed.js';
import { runOne } from '../../harness/run/runOne.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';

const ROOT = new URL('../../', import.meta.url).pathname;

describe('loop-time observations kept by the suite run', () => {
  const out = mkdtempSync(path.join(tmpdir(), 'footing-observed-'));
  afterAll(() => rmSync(out, { recursive: true, force: true }));

  // Two bundled scenarios: a walk with a push and the raster floor.
  it.each(['scenarios/dry-baseline-walk.yaml', 'scenarios/checkerboard-tiles.yaml'])('%s: the full run keeps the observations a separate recording run makes', async (file) => {
    const loaded = await loadScenarioFile(path.join(ROOT, file));
    if (!loaded.ok) throw new Error(`${file} does not load`);
    const scenario = loaded.scenarios[0];
    const governed = parseBuildSpec('ref:governed', ROOT);
    const request = observationRequest(scenario);
    const result = await runOne({ scenario, build: governed, outDir: out, trace: false, observe: request });
    const packed = observationsOf(result);
    expect(packed).toBeDefined();
    const kept = unpackObservations(packed!);
    const [recorded] = await recordStreams([scenario], governed);
    expect(kept.length).toBe(recorded.observations.length);
    expect(kept.length).toBeGreaterThan(100);
    // Packed in the run and unpacked here, they equal a recording run's objects, bit for bit.
    expect(kept).toEqual(recorded.observations);
    // The result itself carries none (results.json does not hold them).
    expect(JSON.stringify(result)).not.toContain('frictionEstimate');
  });
});
