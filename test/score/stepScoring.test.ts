import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { createScorer } from '../../harness/score/scorer.js';
import { runAllocationProbe } from '../support/allocationProbe.js';
import { makeScenario, standingSample } from './fixtures.js';
import { setFoot, standingStep, STEP_s, type MutableStep } from './stepFixtures.js';

/**
 * Feeds `stepCount` physics steps, grouped into ticks of `stepsPerTick`, after `edit` sets up step
 * k; the tick sample carries the held action (all feet in stance, as standingSample has it).
 */
function score(stepCount: number, stepsPerTick: number, edit: (step: MutableStep, k: number) => void) {
  const scorer = createScorer(makeScenario());
  const step = standingStep();
  const tick = standingSample();
  tick.dt_s = stepsPerTick * STEP_s;
  for (let k = 0; k < stepCount; k++) {
    step.time_s = (k + 1) * STEP_s;
    for (let i = 0; i < 4; i++) setFoot(step, i, [0, 0, 32]);
    step.trunkPosition_m[2] = 0.3;
    edit(step, k);
    scorer.recordStep(step, tick);
    if ((k + 1) % stepsPerTick === 0) {
      tick.time_s = step.time_s;
      scorer.record(tick);
    }
  }
  return scorer.finish({ wall_s: 1 }).metrics;
}

describe('scoring every physics step', () => {
  it('sees a slide that lasts one step of a two-step tick, not only the tick\'s last step', () => {
    // Step 5 (the first of tick 2): foot 0 on the cone (|f_t| = μs·f_n = 16 N, margin 0) at 0.1 m/s.
    const m = score(20, 2, (step, k) => {
      if (k === 4) setFoot(step, 0, [16, 0, 32], [0.1, 0, 0]);
    });
    expect(m.frictionMargin.min).toBe(0);
    expect(m.frictionMargin.loadedSamples).toBe(20 * 4); // every (step, foot)
    expect(m.steps).toBe(20);
    expect(m.ticks).toBe(10);
    expect(m.slipDistance_m).toBeCloseTo(0.1 * STEP_s, 15); // ∫|v_t| dt over that one step
    expect(m.violations.slip).toBe(1);
    expect(m.violations.slipTime_s).toBeCloseTo(STEP_s, 15);
  });

  it('gives the same margin, slip and slip time however the steps are grouped into ticks', () => {
    // Two slides (steps 13–15 and 61–62) and a pattern of tangential loads: the metrics must not
    // depend on whether a control tick holds 2, 4 or 8 physics steps.
    const edit = (step: MutableStep, k: number) => {
      setFoot(step, 1, [(k % 7) * 1.5, 0, 32]);
      if (k >= 13 && k <= 15) setFoot(step, 0, [16, 0, 32], [0.05, 0.02, 0]);
      if (k >= 61 && k <= 62) setFoot(step, 2, [0, 15, 30], [0, 0.2, 0]);
    };
    const [a, b, c] = [2, 4, 8].map((n) => score(96, n, edit));
    for (const other of [b, c]) {
      expect(other.frictionMargin).toEqual(a.frictionMargin);
      expect(other.stanceMargin).toEqual(a.stanceMargin);
      expect(other.slipDistance_m).toBe(a.slipDistance_m);
      expect(other.violations.slipTime_s).toBeCloseTo(a.violations.slipTime_s, 15);
      expect(other.violations.slip).toBe(2);
    }
  });

  it('scores a physics step cut into K landing substeps (weights 1/K) as the step itself', () => {
    // The plant's landing substeps (harness/plant/landing.ts): K samples of weight 1/K and length
    // step/K carry the same stance margin, slip and slip time as one whole step with those values.
    const scoreSplit = (k: number) => {
      const scorer = createScorer(makeScenario());
      const step = standingStep();
      const tick = standingSample();
      tick.dt_s = 2 * STEP_s;
      for (let s = 0; s < 96; s++) {
        const parts = s % 9 === 4 ? k : 1;
        step.lastStep_s = STEP_s / parts;
        step.stepWeight = 1 / parts;
        for (let j = 0; j < parts; j++) {
          step.time_s = (s + (j + 1) / parts) * STEP_s;
          for (let i = 0; i < 4; i++) setFoot(step, i, [0, 0, 32]);
          setFoot(step, 1, [(s % 7) * 1.5, 0, 32]);
          if (s % 9 === 4) setFoot(step, 0, [10 + (s % 5), 0, 32], [0.05, 0.02, 0]);
          scorer.recordStep(step, tick);
        }
        if (s % 2 === 1) {
          tick.time_s = step.time_s;
          scorer.record(tick);
        }
      }
      return scorer.finish({ wall_s: 1 }).metrics;
    };
    const whole = scoreSplit(1);
    for (const k of [2, 16, 64]) {
      const split = scoreSplit(k);
      expect(split.stanceMargin!.p05).toBeCloseTo(whole.stanceMargin!.p05!, 12);
      expect(split.stanceMargin!.min).toBe(whole.stanceMargin!.min);
      expect(split.frictionMargin.p05).toBeCloseTo(whole.frictionMargin.p05!, 12);
      expect(split.slipDistance_m).toBeCloseTo(whole.slipDistance_m, 15);
      expect(split.violations.slipTime_s).toBeCloseTo(whole.violations.slipTime_s, 15);
      expect(split.violations.slip).toBe(whole.violations.slip);
      expect(split.steps).toBe(whole.steps! + 11 * (k - 1)); // 11 of the 96 steps are split
    }
  });

  it('counts a slide that flickers within one tick as one interval, its time at step resolution', () => {
    // Steps 0 and 2 of a 4-step tick slide, step 1 does not: one tick in violation, 2 steps of time.
    const m = score(8, 4, (step, k) => {
      if (k === 0 || k === 2) setFoot(step, 3, [0, 0, 32], [0.3, 0, 0]);
    });
    expect(m.violations.slip).toBe(1);
    expect(m.violations.slipTime_s).toBeCloseTo(2 * STEP_s, 15);
    expect(m.violations.perFoot[3].slip).toBe(1);
  });

  it('latches a fall at the physics step it happens, not at the end of the tick', () => {
    // Trunk below 40 % of 0.30 m from step 5 (t = 3 ms), inside the 4-step tick ending at 4 ms.
    const m = score(12, 4, (step, k) => {
      if (k >= 5) step.trunkPosition_m[2] = 0.1;
    });
    expect(m.fell).toBe(true);
    expect(m.fellAt_s).toBeCloseTo(6 * STEP_s, 15);
    expect(m.fallReason).toBe('trunkLow');
  });

  it('allocates nothing per step and per tick', async () => {
    // In a fresh process (probes/stepScoringAllocation.ts; test/support/allocationProbe.ts says
    // why): after this file's other tests, 2 collections were seen in a full run.
    const result = await runAllocationProbe(fileURLToPath(new URL('./probes/stepScoringAllocation.ts', import.meta.url)));
    // As for the plant step (test/plant/convergence.test.ts): any allocation would be ≥ 12 bytes
    // per call and trigger scavenges.
    expect(result.collections).toBe(0);
    expect(result.bytesPerCall).toBeLessThan(1);
  }, 60_000);
});
