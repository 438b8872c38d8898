// The derivable case: standing on an incline with every stance force parallel to gravity. Each
// foot needs a friction ratio of tan θ (block on an incline, any mechanics text), so the ramp
// holds down to a friction scale of tan θ / μs. Runs on the worker pool, like footing margin.

import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runGate } from '../../harness/commands/gate.js';
import { runMarginCommand, runMargins } from '../../harness/commands/margin.js';
import { validateResults } from '../../harness/results/validate.js';
import type { ResultsFile } from '../../harness/results/types.js';

const INCLINE = 'test/margin/fixtures/scenarios/incline-stand.yaml';
const STAND = 'stand=test/margin/fixtures/stand-parallel.ts';
/** The same build with the feet squeezing along x by 5 % of their share (needs more grip). */
const SQUEEZE = 'squeeze=test/margin/fixtures/stand-parallel.ts?squeezeFraction=0.05';
const fresh = (name: string) => mkdtempSync(path.join(tmpdir(), `footing-margin-${name}-`));

// The fixture's ramp: pitch 15°, μs 0.5; the robot: 23 kg trunk in four shares, 0.25 kg feet.
const theta = (15 * Math.PI) / 180;
const mu_s = 0.5;
const share_kg = 23 / 4;
const foot_kg = 0.25;

describe('critical friction of a stand on an incline', () => {
  it('equals tan θ / μs within 0.03, for a build whose stance forces are parallel to gravity; the gate blocks a build that needs more grip though both pass', async () => {
    const outA = fresh('stand');
    const outB = fresh('squeeze');
    const [a, b] = await Promise.all([
      runMargins({ paths: [INCLINE], builds: [STAND], outDir: outA, jobs: 1 }),
      runMargins({ paths: [INCLINE], builds: [SQUEEZE], outDir: outB, jobs: 1 }),
    ]);
    expect(a.exitCode, a.lines.join('\n')).toBe(0);
    expect(b.exitCode, b.lines.join('\n')).toBe(0);

    const stand = a.results!.runs[0];
    expect(stand.status).toBe('pass');
    const friction = stand.margin!.friction!;
    expect(friction.outcome).toBe('found');
    expect(friction.monotone).toBe(true);
    // Block on an incline: sticks while tan θ ≤ μ.
    expect(Math.abs(friction.criticalScale! - Math.tan(theta) / mu_s)).toBeLessThan(0.03);
    expect(friction.criticalStaticFriction!).toBeCloseTo(friction.criticalScale! * mu_s, 12);
    // ⌈log₂(0.95/0.01)⌉ = 7 bisection runs + nominal, far end and 2 checks.
    expect(friction.runs).toBe(11);
    expect(stand.margin!.push).toBeNull();
    expect(stand.margin!.notes.join(' ')).toMatch(/no pushes/);

    // The squeeze q adds q·share/((share + foot)·cos θ) to the hind feet's ratio (force balance on
    // a foot: its own weight and the leg's push, resolved along and across the ramp). That is an
    // upper bound on the critical scale: hind feet that creep a millimetre hand part of the squeeze
    // to the stiff leg impedance, within the 0.01 m slip the scenario allows.
    const q = 0.05;
    const squeezed = b.results!.runs[0].margin!.friction!;
    const hindFeetBound = (Math.tan(theta) + (q * share_kg) / ((share_kg + foot_kg) * Math.cos(theta))) / mu_s;
    expect(squeezed.criticalScale!).toBeGreaterThan(friction.criticalScale! + 0.03);
    expect(squeezed.criticalScale!).toBeLessThanOrEqual(hindFeetBound + squeezed.tolerance);
    expect(b.results!.runs[0].status).toBe('pass');

    for (const out of [outA, outB]) {
      const written = JSON.parse(readFileSync(path.join(out, 'results.json'), 'utf8')) as ResultsFile;
      expect(written.formatVersion).toBe(2);
      expect(validateResults(written).ok).toBe(true);
      expect(readFileSync(path.join(out, 'margin.md'), 'utf8')).toMatch(/incline-stand/);
    }

    // Both pass as written. With the per-run margin and loop-time rules switched off, the gate
    // still blocks — on the critical friction scale alone.
    const policyFile = path.join(outA, 'only-margin.yaml');
    writeFileSync(policyFile, 'frictionMarginMinLoss: 1\nfrictionMarginP05Loss: 1\nloopTimeP99GrowthFraction: 1000\nallowLoopTimeOverBudget: true\n');
    const gate = await runGate({ baseline: outA, candidate: outB, policyFile });
    expect(gate.exitCode, gate.lines.join('\n')).toBe(1);
    expect(gate.lines.join('\n')).toMatch(/critical friction scale rose by 0\.\d{3} \(0\.5\d\d → 0\.6\d\d\), more than the 0\.03 allowed/);
    expect(gate.lines.filter((line) => line.startsWith('  blocking:')), gate.lines.join('\n')).toHaveLength(1);
    const same = await runGate({ baseline: outA, candidate: outA });
    expect(same.exitCode).toBe(0);
  }, 60_000);

  it('refuses bad input with exit 2 and runs nothing', async () => {
    const out = fresh('bad');
    const tolerance = await runMarginCommand({ paths: [INCLINE], build: [STAND], out, tolerance: 0 });
    expect(tolerance.exitCode).toBe(2);
    expect(tolerance.lines.join('\n')).toMatch(/--tolerance 0 must be a number above 0/);
    const build = await runMarginCommand({ paths: [INCLINE], build: ['ref:nosuch'], out });
    expect(build.exitCode).toBe(2);
    expect(build.lines.join('\n')).toMatch(/nosuch/);
    const missing = await runMarginCommand({ paths: ['test/margin/fixtures/does-not-exist'], build: [STAND], out });
    expect(missing.exitCode).toBe(2);
  });
});
