// Done-when of the settled start: a stand build whose stance forces are parallel to gravity holds
// on a ramp down to a friction scale of tan θ / μs (block on an incline: a body at rest stays while
// tan θ ≤ μs; Halliday, Resnick & Walker, Fundamentals of Physics, friction chapter), from the
// scenario's own start, whatever the contact stiffness. Runs the margin search (harness/margin).

import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runMargins } from '../../harness/commands/margin.js';

const FIXTURES = 'test/plant/fixtures/scenarios';
// Forces in full from t = 0: the settled start already has the feet carrying the weight.
const STAND = 'stand=test/margin/fixtures/stand-parallel.ts?settle_s=0';
const theta = (15 * Math.PI) / 180;
const mu_s = 0.5;

describe('critical friction of a stand on a 15° ramp, μs 0.5 / μk 0.4, from a settled start', () => {
  it('is tan θ / μs = 0.536 within 0.02 with the plant default contact, Hertz feet and a 100× stiffer contact', async () => {
    const outDir = mkdtempSync(path.join(tmpdir(), 'footing-critical-'));
    const ids = ['ramp15-plant-default', 'ramp15-hertz', 'ramp15-stiff'];
    const outcome = await runMargins({ paths: ids.map((id) => `${FIXTURES}/${id}.yaml`), builds: [STAND], outDir, jobs: 2, tolerance: 0.005 });
    expect(outcome.exitCode, outcome.lines.join('\n')).toBe(0);
    const law = Math.tan(theta) / mu_s;
    for (const id of ids) {
      const run = outcome.results!.runs.find((r) => r.scenario.id === id)!;
      expect(run.status).toBe('pass');
      const friction = run.margin!.friction!;
      expect(friction.outcome).toBe('found');
      expect(friction.monotone).toBe(true);
      expect(Math.abs(friction.criticalScale! - law), id).toBeLessThan(0.02);
    }
  }, 120_000);
});
