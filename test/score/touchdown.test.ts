import { quantile } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { SWING } from '../../harness/contract/tick.js';
import { createScorer } from '../../harness/score/scorer.js';
import { TOUCHDOWN_TRANSIENT_s } from '../../harness/score/thresholds.js';
import { spread } from '../../harness/score/touchdown.js';
import type { StartMode } from '../../harness/plant/types.js';
import { makeScenario, standingSample } from './fixtures.js';
import { setFoot, standingStep, STEP_s, type MutableStep } from './stepFixtures.js';
import type { TickSample } from '../../harness/score/sample.js';

// The fixture robot: loaded above 6.374 N, μs 0.5. 0.02 s of transient at a 0.5 ms step is 40 steps.
const TRANSIENT_STEPS = Math.round(TOUCHDOWN_TRANSIENT_s / STEP_s);

function score(stepCount: number, edit: (step: MutableStep, k: number, held: TickSample) => void, start: StartMode = 'settled') {
  const base = makeScenario();
  const scorer = createScorer(makeScenario({ plant: { ...base.plant, initial: { ...base.plant.initial, start } } }));
  const step = standingStep();
  const held = standingSample();
  held.dt_s = STEP_s;
  for (let k = 0; k < stepCount; k++) {
    step.time_s = (k + 1) * STEP_s;
    edit(step, k, held);
    scorer.recordStep(step, held);
    held.time_s = step.time_s;
    scorer.record(held);
  }
  return scorer.finish({ wall_s: 1 }).metrics;
}

/**
 * Foot 0 swings (no contact) until step 10, touches at step 10 with 3 N (in contact, not loaded)
 * moving (0.3, 0.4, −1.2) m/s, is loaded from step 11 with a peak of 150 N at step 12, slides on
 * the cone at 0.05 m/s over steps 11–20, then holds with |f_t| = 8 N on 32 N (margin 0.5).
 */
function landing(step: MutableStep, k: number): void {
  if (k < 10) setFoot(step, 0, [0, 0, 0], [0.3, 0.4, -1.2]);
  else if (k === 10) setFoot(step, 0, [0, 0, 3], [0.3, 0.4, -1.2]);
  else if (k <= 20) {
    const fz = k === 12 ? 150 : 100;
    setFoot(step, 0, [0.5 * fz * 0.6, 0.5 * fz * 0.8, fz], [0.03, 0.04, 0]); // |f_t| = μs·f_n: margin 0
  } else setFoot(step, 0, [8, 0, 32]);
}

describe('touchdown and stance apart', () => {
  it('measures a landing: count, slip in its transient, landing speeds and impact peak', () => {
    const m = score(200, landing);
    const foot = m.touchdown!.perFoot[0];
    expect(foot.count).toBe(1);
    // 10 loaded sliding steps at 0.05 m/s: 10 × 0.05 × 0.0005 = 2.5e-4 m.
    expect(foot.slip_m.mean).toBeCloseTo(2.5e-4, 15);
    expect(foot.landingTangentialSpeed_mps.max).toBeCloseTo(0.5, 15); // |(0.3, 0.4)|
    expect(foot.landingVerticalSpeed_mps.max).toBeCloseTo(1.2, 15); // downward positive
    expect(foot.impactPeakForce_N.max).toBe(150);
    // Feet 1–3 stood loaded from t = 0 of a settled start: they never landed.
    expect(m.touchdown!.count).toBe(1);
    expect(m.touchdown!.transient_s).toBe(TOUCHDOWN_TRANSIENT_s);
  });

  it('keeps the touchdown transient out of the stance margin, not out of the whole-run margin', () => {
    const m = score(200, landing);
    expect(m.frictionMargin.perFoot[0].min).toBe(0); // the slide on the cone
    expect(m.stanceMargin!.perFoot[0].min).toBeCloseTo(0.5, 15); // 1 − 8/(0.5·32)
    // Loaded from step 11 (189 steps), of which the first 40 are the transient.
    expect(m.frictionMargin.perFoot[0].loadedSamples).toBe(189);
    expect(m.stanceMargin!.perFoot[0].loadedSamples).toBe(189 - TRANSIENT_STEPS);
    // The transient's slip is part of the run's slip distance, which is all of it here.
    expect(m.slipDistance_m).toBeCloseTo(m.touchdown!.slip_m.mean!, 15);
  });

  it('keeps a bounce inside the transient one touchdown and counts a second landing after a swing', () => {
    const m = score(400, (step, k) => {
      landing(step, k);
      if (k === 15 || k === 16) setFoot(step, 0, [0, 0, 0], [0, 0, 0.2]); // bounce: off the ground
      if (k >= 200 && k < 300) setFoot(step, 0, [0, 0, 0], [0.1, 0, -0.5]); // swing
      if (k >= 300) setFoot(step, 0, [0, 0, 40], [0, 0, 0]); // second landing, sticks at once
    });
    expect(m.touchdown!.perFoot[0].count).toBe(2);
    expect(m.touchdown!.perFoot[0].landingVerticalSpeed_mps.max).toBeCloseTo(1.2, 15);
    expect(m.touchdown!.perFoot[0].slip_m.max).toBeCloseTo(8 * 0.05 * STEP_s, 15); // steps 11–14, 17–20
  });

  it('does not count a load that dips below the threshold while the foot stays on the ground', () => {
    const m = score(200, (step, k) => {
      if (k >= 50 && k < 60) setFoot(step, 2, [0, 0, 2]); // 2 N < 6.374 N, still in contact
    });
    expect(m.touchdown!.count).toBe(0);
  });

  it('counts a released start\'s first load as a touchdown, a settled start\'s not', () => {
    expect(score(100, () => {}, 'released').touchdown!.count).toBe(4);
    expect(score(100, () => {}, 'settled').touchdown!.count).toBe(0);
  });

  it('leaves out of stance a loaded foot the build has released to swing (its lift-off)', () => {
    const m = score(100, (step, k, held) => {
      held.mode[1] = k >= 80 ? SWING : 1;
      if (k >= 80) setFoot(step, 1, [15, 0, 32]); // lift-off: pulled along while still loaded
    });
    expect(m.frictionMargin.perFoot[1].min).toBeCloseTo(1 - 15 / 16, 12);
    expect(m.stanceMargin!.perFoot[1].min).toBe(1);
  });

  it('gives mean, p95 and max with p95 by simple-statistics\' quantile convention', () => {
    const values = [0.3, 0.1, 0.7, 0.2, 0.9, 0.4, 0.05, 0.6, 0.8, 0.35, 0.15];
    const s = spread(values);
    expect(s.p95).toBeCloseTo(quantile(values, 0.95), 15); // simple-statistics (type 7)
    expect(s.max).toBe(0.9);
    expect(s.mean).toBeCloseTo(values.reduce((a, b) => a + b, 0) / values.length, 15);
    expect(spread([])).toEqual({ mean: null, p95: null, max: null });
  });
});
