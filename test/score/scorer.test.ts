import { describe, expect, it } from 'vitest';
import { frictionMargin } from '../../harness/score/frictionMargin.js';
import { createScorer } from '../../harness/score/scorer.js';
import { loadedThreshold_N, MARGIN_BIN_WIDTH } from '../../harness/score/thresholds.js';
import { CONTROL_PERIOD_s, drive, FOOT_COUNT, makeScenario, standingSample } from './fixtures.js';

const WALL = { wall_s: 0.5 };

describe('friction margin', () => {
  it('is 1 − |f_t|/(μs·f_n) for a known force', () => {
    // f = (3, 4, 50) N on μs = 0.5: |f_t| = 5 N (3-4-5 triangle), capacity 25 N → 1 − 5/25 = 0.8.
    expect(frictionMargin(3, 4, 50, 0.5)).toBeCloseTo(0.8, 15);
    expect(frictionMargin(0, 0, 50, 0.5)).toBe(1);
    expect(frictionMargin(25, 0, 50, 0.5)).toBe(0); // on the cone
    expect(frictionMargin(5, 0, 10, 0)).toBe(-1); // frictionless patch: clamped to the floor
  });

  it('takes min and p05 over loaded feet only, per foot too', () => {
    const scorer = createScorer(makeScenario());
    const sample = standingSample();
    drive((s) => scorer.record(s), sample, 1000, (s, k) => {
      s.footForce_N.set([3, 4, 50], 0); // foot 0: margin 0.8 throughout
      s.footForce_N.set(k < 100 ? [12, 0, 40] : [0, 0, 40], 3); // foot 1: 0.4 for 10 % of ticks, else 1
      s.footForce_N.set([30, 0, 1], 6); // foot 2: far outside the cone but unloaded (1 N < 6.37 N)
    });
    const { metrics } = scorer.finish(WALL);
    expect(metrics.frictionMargin.min).toBeCloseTo(0.4, 12);
    expect(metrics.frictionMargin.perFoot[0].min).toBeCloseTo(0.8, 12);
    expect(metrics.frictionMargin.perFoot[0].p05).toBeCloseTo(0.8, 12);
    expect(metrics.frictionMargin.perFoot[2].min).toBeNull();
    expect(metrics.frictionMargin.perFoot[2].loadedSamples).toBe(0);
    // Foot 1: 100 of 1000 samples at 0.4, so its 5th percentile is 0.4 (within half a bin).
    expect(Math.abs(metrics.frictionMargin.perFoot[1].p05! - 0.4)).toBeLessThanOrEqual(MARGIN_BIN_WIDTH / 2);
    // All loaded samples: 3000 (feet 0, 1, 3); 100 at 0.4 (3.3 %) and 1000 at 0.8 → p05 = 0.8.
    expect(metrics.frictionMargin.loadedSamples).toBe(3000);
    expect(Math.abs(metrics.frictionMargin.p05! - 0.8)).toBeLessThanOrEqual(MARGIN_BIN_WIDTH / 2);
  });

  it('uses 5 % of the robot weight as the loaded threshold', () => {
    // 13 kg × 9.80665 m/s² × 0.05 = 6.3743 N.
    expect(loadedThreshold_N(makeScenario().plant.robot)).toBeCloseTo(6.3743225, 6);
    const scorer = createScorer(makeScenario());
    const sample = standingSample();
    drive((s) => scorer.record(s), sample, 10, (s) => {
      for (let i = 0; i < FOOT_COUNT; i++) s.footForce_N.set([1, 0, i < 2 ? 6.37 : 6.38], 3 * i);
    });
    expect(scorer.finish(WALL).metrics.frictionMargin.loadedSamples).toBe(20);
  });
});

describe('slip', () => {
  it('integrates the distance of a loaded foot moving at constant speed', () => {
    const scorer = createScorer(makeScenario());
    const sample = standingSample();
    drive((s) => scorer.record(s), sample, 1000, (s) => {
      s.footVelocity_mps.set([0.06, 0.08, 0.5], 0); // tangential 0.1 m/s (z is ignored)
      s.footVelocity_mps.set([0.01, 0, 0], 3); // below the slip speed: distance, no slip interval
      s.footVelocity_mps.set([1, 0, 0], 6);
      s.footForce_N.set([0, 0, 2], 6); // unloaded: neither
    });
    const { metrics } = scorer.finish(WALL);
    // 0.1 m/s × 1000 × 1 ms = 0.1 m; 0.01 m/s × 1 s = 0.01 m.
    expect(metrics.slipDistancePerFoot_m[0]).toBeCloseTo(0.1, 12);
    expect(metrics.slipDistancePerFoot_m[1]).toBeCloseTo(0.01, 12);
    expect(metrics.slipDistancePerFoot_m[2]).toBe(0);
    expect(metrics.slipDistance_m).toBeCloseTo(0.11, 12);
    expect(metrics.violations.slip).toBe(1);
    expect(metrics.violations.slipTime_s).toBeCloseTo(1, 12);
    expect(metrics.violations.perFoot[1].slip).toBe(0);
  });
});

describe('violation intervals', () => {
  const outside = [20, 0, 32]; // |w_t| = 20 N > μs·w_z = 16 N
  const ticks = 10;

  function commanded(edit: (s: ReturnType<typeof standingSample>, k: number) => void) {
    const scorer = createScorer(makeScenario());
    drive((s) => scorer.record(s), standingSample(), ticks, edit);
    return scorer.finish(WALL).metrics.violations;
  }

  it('counts one interval from the first to the last tick', () => {
    const v = commanded((s) => s.wantedForce_N.set(outside, 0));
    expect(v.commanded).toBe(1);
    expect(v.commandedTime_s).toBeCloseTo(ticks * CONTROL_PERIOD_s, 15);
  });

  it('counts an interval that starts at the first tick and one that ends at the last', () => {
    const v = commanded((s, k) => s.wantedForce_N.set(k < 3 || k >= 8 ? outside : [0, 0, 32], 0));
    expect(v.commanded).toBe(2);
    expect(v.commandedTime_s).toBeCloseTo(5 * CONTROL_PERIOD_s, 15);
  });

  it('merges intervals of different feet that touch into one (union over feet)', () => {
    const v = commanded((s, k) => {
      s.wantedForce_N.set(k < 5 ? outside : [0, 0, 32], 0);
      s.wantedForce_N.set(k >= 5 ? outside : [0, 0, 32], 3);
    });
    expect(v.commanded).toBe(1);
    expect(v.perFoot[0].commanded).toBe(1);
    expect(v.perFoot[1].commanded).toBe(1);
    expect(v.commandedTime_s).toBeCloseTo(ticks * CONTROL_PERIOD_s, 15);
  });

  it('separates intervals with one clear tick between them', () => {
    const v = commanded((s, k) => s.wantedForce_N.set(k === 4 ? [0, 0, 32] : outside, 0));
    expect(v.commanded).toBe(2);
  });

  it('flags a stance foot pulling on the ground, not a swing foot or a force on the cone', () => {
    expect(commanded((s) => s.wantedForce_N.set([0, 0, -1], 0)).commanded).toBe(1);
    expect(
      commanded((s) => {
        s.wantedForce_N.set(outside, 0);
        s.mode[0] = 0;
      }).commanded,
    ).toBe(0);
    // 0.3·80 = 24 N, exactly on the cone of μs = 0.3 at w_z = 80 N (rounding may land either side).
    expect(commanded((s) => {
      s.footStaticFriction[0] = 0.3;
      s.wantedForce_N.set([24, 0, 80], 0);
    }).commanded).toBe(0);
  });
});

describe('falls', () => {
  function fall(edit: (s: ReturnType<typeof standingSample>, k: number) => void) {
    const scorer = createScorer(makeScenario());
    drive((s) => scorer.record(s), standingSample(), 10, edit);
    return scorer.finish(WALL).metrics;
  }
  const tilt = (s: ReturnType<typeof standingSample>, deg: number) => {
    const half = (deg * Math.PI) / 360;
    s.trunkQuaternion.set([Math.cos(half), Math.sin(half), 0, 0]); // roll about x
  };

  it('does not fall standing', () => {
    const m = fall(() => {});
    expect(m.fell).toBe(false);
    expect(m.fellAt_s).toBeNull();
  });

  it('falls when the trunk centre goes below 40 % of standing height (0.12 m)', () => {
    expect(fall((s) => (s.trunkPosition_m[2] = 0.1201)).fell).toBe(false);
    const m = fall((s, k) => (s.trunkPosition_m[2] = k >= 6 ? 0.1199 : 0.3));
    expect(m.fell).toBe(true);
    expect(m.fellAt_s).toBeCloseTo(0.007, 15); // tick 6 ends at 7 ms
    expect(m.fallReason).toBe('trunkLow');
  });

  it('falls when tilted beyond 60° from the ground normal', () => {
    expect(fall((s) => tilt(s, 59.9)).fell).toBe(false);
    const m = fall((s) => tilt(s, 60.1));
    expect(m.fell).toBe(true);
    expect(m.fallReason).toBe('trunkTilted');
    expect(m.fellAt_s).toBeCloseTo(0.001, 15);
  });

  it('falls when the trunk touches the ground, and stays fallen', () => {
    const m = fall((s, k) => (s.trunkGroundForce_N = k === 2 ? 0.5 : 0));
    expect(m.fell).toBe(true);
    expect(m.fallReason).toBe('trunkContact');
    expect(m.fellAt_s).toBeCloseTo(0.003, 15);
  });
});

describe('tracking and progress', () => {
  it('gives the RMS of the horizontal distance to the reference', () => {
    const scorer = createScorer(makeScenario());
    drive((s) => scorer.record(s), standingSample(), 100, (s, k) => {
      // Half the ticks 0.03 m off in y, half 0.04 m off in x and 9 m off in z (ignored).
      s.referencePosition_m.set(k % 2 === 0 ? [0, 0.03, 0.3] : [0.04, 0, 9.3]);
    });
    // √((0.03² + 0.04²) / 2) = √(0.00125) = 0.035355…
    expect(scorer.finish(WALL).metrics.trackingRms_m).toBeCloseTo(Math.sqrt(0.00125), 12);
  });

  it('measures progress along the commanded travel of the whole scenario', () => {
    // 0.5 m/s in x from 2 s to 10 s: commanded travel 4 m, whatever the run's own length.
    const scenario = makeScenario({
      duration_s: 10,
      commands: [
        { at_s: 0, gait: 'stand', velocity_mps: [0, 0, 0], yawRate_radps: 0 },
        { at_s: 2, gait: 'trot', velocity_mps: [0.5, 0, 0], yawRate_radps: 0 },
      ],
    });
    const scorer = createScorer(scenario);
    // The trunk walks 3 m in x and 1 m sideways (ignored by the projection), then stops (fell).
    drive((s) => scorer.record(s), standingSample(), 1001, (s, k) => s.trunkPosition_m.set([0.003 * k, 0.001 * k, 0.3]));
    const { metrics } = scorer.finish(WALL);
    expect(metrics.commandedTravel_m).toBeCloseTo(4, 12);
    expect(metrics.progress).toBeCloseTo(0.75, 12);
  });

  it('reports null progress when nothing is commanded', () => {
    const scorer = createScorer(makeScenario());
    drive((s) => scorer.record(s), standingSample(), 10);
    expect(scorer.finish(WALL).metrics.progress).toBeNull();
  });
});

describe('loop time and sim', () => {
  it('counts overruns, keeps the exact max and reports the budget', () => {
    const scorer = createScorer(makeScenario());
    drive((s) => scorer.record(s), standingSample(), 1000, (s, k) => (s.loopTime_us = k % 100 === 0 ? 1500 + k : 200));
    const { metrics, sim } = scorer.finish({ wall_s: 0.25 });
    expect(metrics.loopTime_us.overruns).toBe(10);
    expect(metrics.loopTime_us.max).toBe(2400);
    expect(metrics.loopTime_us.budget).toBe(1000);
    expect(metrics.loopTime_us.p50! / 200).toBeCloseTo(1, 2); // within the 0.5 % resolution
    expect(sim.duration_s).toBeCloseTo(1, 12);
    expect(sim.realTimeFactor).toBeCloseTo(4, 12);
    expect(sim.totalMass_kg).toBe(13);
    expect(sim.physicsStep_s).toBe(0.0005);
    expect(sim.controlRate_Hz).toBe(1000);
  });

  it('produces plain JSON with no NaN or infinities for an empty run', () => {
    const scored = createScorer(makeScenario()).finish({ wall_s: 0 });
    expect(JSON.parse(JSON.stringify(scored))).toEqual(scored);
    expect(scored.metrics.frictionMargin.min).toBeNull();
    expect(scored.metrics.loopTime_us.p99).toBeNull();
    expect(scored.sim.realTimeFactor).toBeNull();
  });
});
