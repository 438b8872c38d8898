// The landing substep rule (harness/plant/landing.ts) against its formula, and the plant applying
// it: K is the smallest power of two with step/K ≤ t_c/512, at most 64, t_c = factor·δmax/v the
// duration of the impact (Johnson, Contact Mechanics, 1985, §11.4: 2.94·δmax/v for Hertz).

import { describe, expect, it } from 'vitest';
import { DEFAULT_CONTACT } from '../../harness/plant/defaults.js';
import {
  impactDuration_s,
  impactDurationFactor,
  landingSubsteps,
  MAX_LANDING_SUBSTEPS,
  maxCompression_m,
  SUBSTEPS_PER_IMPACT,
} from '../../harness/plant/landing.js';
import { Plant } from '../../harness/plant/plant.js';
import { measureSteadyAllocation } from '../support/allocation.js';
import { holdPosture, limpAction, plantConfig, testRobot } from '../support/robots.js';

describe('impact duration', () => {
  it('has the factor 2.94 for Hertz (Johnson §11.4) and π for a linear spring (half its period)', () => {
    // Hertz: 2·∫₀¹(1 − x^2.5)^(−1/2) dx = (2/2.5)·B(0.4, 0.5) = 2.9432 (Beta function, tabulated
    // value); Johnson rounds it to 2.94. Linear: 2·∫₀¹(1 − x²)^(−1/2) dx = π exactly.
    expect(impactDurationFactor(1.5)).toBeCloseTo(2.9432, 3);
    expect(Math.abs(impactDurationFactor(1) - Math.PI)).toBeLessThan(1e-6);
  });

  it('takes δmax from the energy balance ½·m·v² = k·δmax^(n+1)/(n+1)', () => {
    const k = 2.45e6;
    const m = 0.25;
    const v = 1.8;
    const depth = maxCompression_m(k, 1.5, m, v);
    expect((k * depth ** 2.5) / 2.5).toBeCloseTo(0.5 * m * v * v, 9);
  });

  it('matches the contact time of an undamped Hertz impact integrated at a 1e-8 s step within 0.1 %', () => {
    // Independent check: a mass on k·δ^1.5 from first touch at v until it leaves (leapfrog at a
    // step ~1e-6 of the duration, so its own error is far below the tolerance).
    const k = DEFAULT_CONTACT.stiffness_N_per_m;
    const m = 0.3;
    const v = 1.2;
    const h = 1e-8;
    let x = 0; // penetration
    let u = v; // penetration rate
    let t = 0;
    do {
      x += h * u;
      t += h;
      const force = x > 0 ? k * x * Math.sqrt(x) : 0;
      u -= (h * force) / m;
    } while (x > 0);
    const factor = impactDurationFactor(1.5);
    expect(Math.abs(impactDuration_s(k, 1.5, factor, m, v) - t) / t).toBeLessThan(1e-3);
  });
});

describe('K, the substeps of a landing step', () => {
  it('is the smallest power of two with step/K ≤ t_c/512', () => {
    const step_s = 0.0005;
    for (const duration_s of [0.3, 0.2, 0.1, 0.05, 0.02, 0.01]) {
      const k = landingSubsteps(step_s, duration_s);
      expect(Math.log2(k) % 1).toBe(0);
      expect(step_s / k).toBeLessThanOrEqual(duration_s / SUBSTEPS_PER_IMPACT);
      if (k > 1) expect(step_s / (k / 2)).toBeGreaterThan(duration_s / SUBSTEPS_PER_IMPACT);
    }
    expect(landingSubsteps(step_s, 0.3)).toBe(1); // 0.5 ms ≤ 0.3 s / 512 = 0.59 ms
    expect(landingSubsteps(step_s, 0.1)).toBe(4); // 0.195 ms: 0.125 ms
  });

  it('is capped at 64 for short impacts (and for a duration that cannot be computed)', () => {
    expect(MAX_LANDING_SUBSTEPS).toBe(64);
    expect(landingSubsteps(0.0005, 0.001)).toBe(64); // would need 512
    expect(landingSubsteps(0.0005, 0)).toBe(64);
    expect(landingSubsteps(0.0005, Number.NaN)).toBe(64);
    expect(landingSubsteps(0.0005, 0.015)).toBe(32); // 29.3 µs ≥ 15.6 µs: 32, not the cap
  });
});

describe('the plant cuts a landing step into K substeps', () => {
  // One foot dropped onto a soft linear contact slow enough that K stays below the cap, so the
  // count the plant takes is the formula's and not the cap.
  const soft = { stiffness_N_per_m: 2e3, exponent: 1, damping_s_per_m: 0 };
  const free = testRobot({ leg: { minLength_m: 0, maxLength_m: 100, maxForce_N: 400, endStopStiffness_N_per_m: 0, endStopDamping_Ns_per_m: 0 } });

  it('takes K = landingSubsteps(step, t_c(v)) at touch-down, one step otherwise, and shows every substep', () => {
    const plant = new Plant(
      plantConfig({
        robot: free, contact: soft, position_m: [0, 0, 1.0],
        feet: [[0.25, 0.12, 0.05], [0.25, -0.12, 0.3], [-0.25, 0.12, 0.3], [-0.25, -0.12, 0.3]],
      }),
    );
    plant.applyAction(limpAction(plant));
    const seen: { time_s: number; lastStep_s: number; weight: number }[] = [];
    const observe = (): void => {
      seen.push({ time_s: plant.time_s, lastStep_s: plant.lastStep_s, weight: plant.stepWeight });
    };
    let landed = false;
    for (let s = 0; s < 400 && !landed; s++) {
      const above = plant.footPosition_m[2] >= 0;
      seen.length = 0;
      plant.step({ afterSubstep: observe });
      if (above && plant.footPosition_m[2] < 0) {
        landed = true;
        // The approach speed of a free fall from 0.05 m (for a linear spring t_c = π·√(m/k) does
        // not depend on it, so the step's exact crossing speed does not matter).
        const speed_mps = Math.sqrt(2 * 9.80665 * 0.05);
        const factor = impactDurationFactor(1);
        const expected = landingSubsteps(plant.step_s, impactDuration_s(soft.stiffness_N_per_m, 1, factor, free.foot.mass_kg, speed_mps));
        expect(expected).toBeGreaterThan(1);
        expect(expected).toBeLessThan(MAX_LANDING_SUBSTEPS);
        expect(plant.substeps).toBe(expected);
        expect(seen.length).toBe(expected);
        const total = seen.reduce((sum, x) => sum + x.weight, 0);
        expect(total).toBeCloseTo(1, 12);
        for (const x of seen) expect(x.lastStep_s).toBeCloseTo(plant.step_s / expected, 15);
        expect(seen[seen.length - 1].time_s).toBeCloseTo(plant.time_s, 15);
      } else {
        expect(plant.substeps).toBe(1);
        expect(seen).toHaveLength(1);
        expect(seen[0].weight).toBe(1);
      }
    }
    expect(landed).toBe(true);
  });
});

describe('landing substeps allocate nothing', () => {
  it('a standing robot lifting and landing a foot every 50 ms runs 200 000 steps with no garbage collection', async () => {
    // Two held actions alternate every 100 steps: all four feet held, or foot 0's target 3 cm up,
    // so foot 0 lifts off and lands again and again (trial, undo, K substeps each time).
    const plant = new Plant(plantConfig());
    const hold = holdPosture(plant);
    const lift = holdPosture(plant);
    lift.footTarget_m[2] += 0.03;
    lift.groundForce_N.fill(0, 0, 3);
    plant.applyAction(hold);
    let substeps = 0;
    const observer = {
      afterSubstep(): void {
        substeps++;
      },
    };
    let k = 0;
    const body = (): void => {
      if (++k % 100 === 0) plant.applyAction((k / 100) % 2 === 1 ? lift : hold);
      plant.step(observer);
    };
    const integrationsBefore = plant.integrations;
    const result = await measureSteadyAllocation(200_000, body, (r) => r.collections === 0 && r.bytesPerCall < 1);
    // Landings did happen: more substeps than steps, and more integrations than substeps (trials).
    expect(substeps).toBeGreaterThan(k + 100);
    expect(plant.integrations - integrationsBefore).toBeGreaterThan(substeps);
    // As in test/plant/convergence.test.ts: any allocation would be a ≥ 12-byte heap number per
    // landing or per substep, and with a landing every 100 steps would show as scavenges.
    expect(result.collections).toBe(0);
    expect(result.bytesPerCall).toBeLessThan(1);
  });
});
