// Contact laws from material data, checked against closed-form impact mechanics:
// - Hertz: a sphere of mass m hitting a flat at speed v stays in contact for
//   t_c = 2.87·(m²/(R·E*²·v))^(1/5) (Johnson, Contact Mechanics, 1985, §11.4), which holds only
//   if the stiffness is (4/3)·E*·√R with exponent 3/2;
// - Hunt–Crossley: the damping derived from a restitution e at a reference speed gives back e at
//   that speed, and the exact relation (contactLaw.ts) at other speeds.

import { describe, expect, it } from 'vitest';
import {
  dampingForRestitution_s_per_m,
  effectiveModulus_Pa,
  HERTZ_EXPONENT,
  hertzStiffness_N_per_m1p5,
  restitutionAt,
} from '../../harness/plant/contactLaw.js';
import { Plant } from '../../harness/plant/plant.js';
import type { ContactLaw } from '../../harness/plant/types.js';
import { limpAction, plantConfig, testRobot } from '../support/robots.js';

// One limp foot with no end-stop in reach: a lone point mass hitting the floor.
const footMass_kg = 0.25;
const oneFoot = testRobot({
  hips_m: [[0, 0, 0]],
  foot: { mass_kg: footMass_kg },
  leg: { minLength_m: 0, maxLength_m: 100, maxForce_N: 400, endStopStiffness_N_per_m: 0, endStopDamping_Ns_per_m: 0 },
});

/** Drops the foot at `speed_mps`; returns the restitution and the contact duration. */
function impact(contact: ContactLaw, speed_mps: number, step_s = 1e-6): { restitution: number; duration_s: number } {
  const plant = new Plant(
    plantConfig({ robot: oneFoot, position_m: [0, 0, 5], velocity_mps: [0, 0, -speed_mps], feet: [[0, 0, 1e-5]], contact, step_s }),
  );
  plant.applyAction(limpAction(plant));
  let vIn = NaN;
  let t0 = NaN;
  for (let k = 0; k < 2_000_000; k++) {
    const before = plant.footVelocity_mps[2];
    const tBefore = plant.time_s;
    plant.step();
    if (Number.isNaN(vIn) && plant.footInContact[0]) {
      vIn = -before;
      t0 = tBefore;
    } else if (!Number.isNaN(vIn) && !plant.footInContact[0]) {
      return { restitution: plant.footVelocity_mps[2] / vIn, duration_s: plant.time_s - t0 };
    }
  }
  throw new Error('foot never left the ground');
}

// Handbook values for structural steel, E = 200 GPa and ν = 0.30 (any materials handbook); a steel
// foot on a rigid floor makes the impact short (~0.1 ms), so gravity barely acts during it.
const steel = { elasticModulus_Pa: 200e9, poissonRatio: 0.3 };
const radius_m = 0.02;

describe('Hertz stiffness from the foot material', () => {
  it('gives the Hertz impact duration 2.87·(m²/(R·E*²·v))^(1/5) within 1 %', () => {
    const Estar = effectiveModulus_Pa(steel);
    const contact = { stiffness_N_per_m: hertzStiffness_N_per_m1p5(Estar, radius_m), exponent: HERTZ_EXPONENT, damping_s_per_m: 0 };
    for (const v of [0.5, 2]) {
      const { duration_s } = impact(contact, v, 1e-7);
      const hertz = 2.87 * ((footMass_kg ** 2) / (radius_m * Estar ** 2 * v)) ** 0.2;
      expect(Math.abs(duration_s - hertz) / hertz).toBeLessThan(0.01);
    }
  });

  it('combines a foot and an elastic floor as 1/E* = (1 − ν₁²)/E₁ + (1 − ν₂²)/E₂', () => {
    // Two equal bodies: E* = E / (2·(1 − ν²)) (Johnson 1985, §4.2).
    expect(effectiveModulus_Pa(steel, steel)).toBeCloseTo(200e9 / (2 * (1 - 0.09)), -3);
  });
});

describe('Hunt–Crossley damping from a restitution at a reference speed', () => {
  const Estar = effectiveModulus_Pa(steel);
  const stiffness = hertzStiffness_N_per_m1p5(Estar, radius_m);

  it.each([
    [0.5, 1.0],
    [0.8, 0.5],
    [0.3, 2.0],
  ])('a drop at the reference speed returns e = %s at %s m/s within 0.01', (e, speed) => {
    const contact = { stiffness_N_per_m: stiffness, exponent: HERTZ_EXPONENT, damping_s_per_m: dampingForRestitution_s_per_m(e, speed) };
    expect(Math.abs(impact(contact, speed).restitution - e)).toBeLessThan(0.01);
  });

  it('follows the exact relation at other speeds, where the rule e ≈ 1 − c·v is off by > 0.1', () => {
    const c = dampingForRestitution_s_per_m(0.5, 1.0);
    for (const speed of [0.5, 1.8]) {
      const measured = impact({ stiffness_N_per_m: stiffness, exponent: HERTZ_EXPONENT, damping_s_per_m: c }, speed).restitution;
      expect(Math.abs(measured - restitutionAt(c, speed))).toBeLessThan(0.01);
      expect(Math.abs(measured - (1 - c * speed))).toBeGreaterThan(0.1);
    }
  });

  it('does not depend on the stiffness (the relation holds for any k)', () => {
    const c = dampingForRestitution_s_per_m(0.6, 1.0);
    const soft = impact({ stiffness_N_per_m: stiffness / 1000, exponent: HERTZ_EXPONENT, damping_s_per_m: c }, 1.0).restitution;
    const hard = impact({ stiffness_N_per_m: stiffness, exponent: HERTZ_EXPONENT, damping_s_per_m: c }, 1.0).restitution;
    expect(Math.abs(soft - 0.6)).toBeLessThan(0.02); // the softer impact lasts longer: gravity acts more
    expect(Math.abs(hard - 0.6)).toBeLessThan(0.01);
  });
});
