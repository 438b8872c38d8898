// First divergence between two builds' traces: none for identical builds on identical inputs; for
// the governed build against the over-trusting one on the slippery demo floor, a time before the
// over-trusting build's first slip (the governor's friction limit binds before a foot gives way).

import { readFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { parseBuildSpec } from '../../harness/builds/spec.js';
import { describeDivergence, firstDivergence } from '../../harness/results/divergence.js';
import { runOne } from '../../harness/run/runOne.js';
import { runSuite } from '../../harness/commands/run.js';
import { runGate } from '../../harness/commands/gate.js';
import { loadScenarioFile } from '../../harness/scenario/index.js';
import type { ResolvedScenario } from '../../harness/scenario/types.js';
import { DEMO_DIR, REPO, tempDir } from './support.js';

async function trace(scenario: ResolvedScenario, build: string): Promise<string> {
  const outDir = tempDir('trace');
  const result = await runOne({ scenario, build: parseBuildSpec(build, REPO), outDir, trace: true });
  return readFileSync(path.join(outDir, result.trace!), 'utf8');
}

/** First time a loaded foot moves faster than 2 cm/s over two rows in a row (fidelity.ts's slip rule). */
function firstSlip_s(text: string): number {
  const rows = text.trim().split('\n');
  const header = rows[0].split(',');
  const feet = header.filter((h) => /^foot\d+_loaded$/.test(h)).length;
  let run = new Array(feet).fill(0);
  for (const row of rows.slice(1)) {
    const cells = row.split(',').map(Number);
    for (let f = 0; f < feet; f++) {
      const at = (name: string) => cells[header.indexOf(`foot${f}_${name}`)];
      const slipping = at('loaded') === 1 && Math.hypot(at('vx_mps'), at('vy_mps')) > 0.02;
      run[f] = slipping ? run[f] + 1 : 0;
      if (run[f] >= 2) return cells[0];
    }
  }
  return Number.POSITIVE_INFINITY;
}

describe('first divergence of two builds', () => {
  let scenario: ResolvedScenario;
  beforeAll(async () => {
    const loaded = await loadScenarioFile(path.join(DEMO_DIR, 'demo-truth.yaml'), { suiteRoot: REPO });
    if (!loaded.ok) throw new Error('demo truth does not load');
    scenario = loaded.scenarios[0];
  });

  it('is none for two runs of the same build', async () => {
    const a = await trace(scenario, 'ref:governed');
    const b = await trace(scenario, 'ref:governed');
    expect(firstDivergence(a, b)).toBeNull();
    expect(describeDivergence({ scenario: 'x', baselineBuild: 'a', candidateBuild: 'b', divergence: null })).toBe('none (traces identical)');
  });

  it('names a time before the first slip for governed vs over-trusting on the slippery demo', async () => {
    const governed = await trace(scenario, 'ref:governed');
    const overtrusting = await trace(scenario, 'ref:overtrusting');
    const d = firstDivergence(governed, overtrusting);
    expect(d).not.toBeNull();
    const slip = Math.min(firstSlip_s(governed), firstSlip_s(overtrusting));
    expect(d!.time_s).toBeLessThan(slip);
    expect(describeDivergence({ scenario: 'x', baselineBuild: 'a', candidateBuild: 'b', divergence: d })).toMatch(/^first differs at \d+\.\d{3} s: /);
  });
});

describe('first divergence in gate.md and the report', () => {
  it('names the first difference of governed vs over-trusting on the slick-patch scenario', async () => {
    const outDir = tempDir('gate-divergence');
    const scenario = path.join(REPO, 'scenarios', 'slick-patch-abrupt.yaml');
    const run = await runSuite({ paths: [scenario], builds: ['ref:governed', 'ref:overtrusting'], outDir, trace: true, baseline: 'governed', jobs: 1, quiet: true, cwd: REPO });
    expect(run.exitCode).toBeLessThan(2);
    const gateMd = readFileSync(path.join(outDir, 'gate.md'), 'utf8');
    expect(gateMd).toMatch(/\*\*First divergence\*\*[\s\S]*`slick-patch-abrupt` \(`governed` → `overtrusting`\): first differs at \d+\.\d{3} s: /);
    expect(readFileSync(path.join(outDir, 'report.html'), 'utf8')).toMatch(/First divergence \(traces\): governed → overtrusting: first differs at/);
    // footing gate between the folder and itself, pairing the builds, says the same.
    const gate = await runGate({ baseline: outDir, candidate: outDir, pairs: ['governed=overtrusting'] });
    expect(gate.lines.join('\n')).toMatch(/first divergence: slick-patch-abrupt \(governed → overtrusting\): first differs at/);
    const same = await runGate({ baseline: outDir, candidate: outDir, pairs: ['governed=governed'] });
    expect(same.lines.join('\n')).toMatch(/first divergence: slick-patch-abrupt \(governed → governed\): none \(traces identical\)/);
  });
});
