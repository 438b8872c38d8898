import { describe, expect, it } from 'vitest';
import { STANDARD_GRAVITY_mps2 } from '../../harness/plant/defaults.js';
import { stribeckFriction_N } from '../../harness/plant/contact.js';
import { Plant } from '../../harness/plant/plant.js';
import { centreOfMass, holdPosture, limpAction, linearMomentum, material, plantConfig, runFor, testRobot } from '../support/robots.js';

const g = STANDARD_GRAVITY_mps2;
const deg = Math.PI / 180;

describe('Hunt–Crossley impact', () => {
  // One foot, limp leg with no end-stop in reach: a lone point mass hitting the floor.
  const oneFoot = testRobot({
    hips_m: [[0, 0, 0]],
    leg: { minLength_m: 0, maxLength_m: 100, maxForce_N: 400, endStopStiffness_N_per_m: 0, endStopDamping_Ns_per_m: 0 },
  });

  function restitution(speed_mps: number, damping_s_per_m: number): number {
    const plant = new Plant(
      plantConfig({
        robot: oneFoot,
        position_m: [0, 0, 5],
        velocity_mps: [0, 0, -speed_mps],
        feet: [[0, 0, 0.0005]],
        contact: { stiffness_N_per_m: 1e7, exponent: 1.5, damping_s_per_m },
        step_s: 1e-6,
      }),
    );
    plant.applyAction(limpAction(plant));
    let vIn = NaN;
    for (let k = 0; k < 200_000; k++) {
      const before = plant.footVelocity_mps[2];
      plant.step();
      if (Number.isNaN(vIn) && plant.footInContact[0]) {
        vIn = -before;
      } else if (!Number.isNaN(vIn) && !plant.footInContact[0]) {
        // Speeds at the contact boundary (δ = 0): gravity is conservative, so only the contact's
        // damping removes energy between touch-down and lift-off (with c = 0 this returns 1).
        return plant.footVelocity_mps[2] / vIn;
      }
    }
    throw new Error('foot never left the ground');
  }

  it('is perfectly elastic without damping', () => {
    expect(restitution(0.5, 0)).toBeCloseTo(1, 4);
  });

  it.each([
    [1.0, 0.1],
    [0.5, 0.1],
    [2.0, 0.02],
  ])('restitution at %s m/s with c = %s s/m is 1 − c·v within ±0.02', (speed, c) => {
    // Hunt & Crossley 1975: e ≈ 1 − α·v at low impact speed, with λ = (3/2)·α·k.
    const e = restitution(speed, c);
    expect(Math.abs(e - (1 - c * speed))).toBeLessThan(0.02);
  });
});

describe('friction on an incline (block on an incline)', () => {
  // Halliday, Resnick & Walker, Fundamentals of Physics, friction chapter: a block stays when
  // tan θ < μs, else slides with a = g·(sin θ − μk·cos θ).
  it('stays put when tan θ < μs: drift < 1 mm over 2 s', () => {
    const plant = new Plant(plantConfig({ pitch_deg: 14, material: material({ staticFriction: 0.3, kineticFriction: 0.2 }) }));
    plant.applyAction(holdPosture(plant));
    runFor(plant, 1.0); // settle onto the feet
    const com0 = centreOfMass(plant, new Float64Array(3)).slice();
    const feet0 = plant.footPosition_m.slice();
    runFor(plant, 2.0);
    const com1 = centreOfMass(plant, new Float64Array(3));
    expect(Math.hypot(com1[0] - com0[0], com1[1] - com0[1])).toBeLessThan(1e-3);
    for (let i = 0; i < 4; i++) {
      expect(Math.hypot(plant.footPosition_m[3 * i] - feet0[3 * i], plant.footPosition_m[3 * i + 1] - feet0[3 * i + 1])).toBeLessThan(1e-3);
    }
  });

  it('slides with a = g·(sin θ − μk·cos θ) within 2 % when tan θ > μs', () => {
    const theta = 20;
    const plant = new Plant(plantConfig({ pitch_deg: theta, material: material({ staticFriction: 0.3, kineticFriction: 0.2 }) }));
    plant.applyAction(holdPosture(plant));
    const momentum = new Float64Array(3);
    runFor(plant, 0.5); // past the Stribeck decay: speed ≫ v_s = 0.02 m/s
    const v0 = linearMomentum(plant, momentum)[0] / plant.totalMass_kg;
    const t0 = plant.time_s;
    runFor(plant, 1.0);
    const v1 = linearMomentum(plant, momentum)[0] / plant.totalMass_kg;
    const measured = -(v1 - v0) / (plant.time_s - t0); // downhill is −x
    const expected = g * (Math.sin(theta * deg) - 0.2 * Math.cos(theta * deg));
    expect(Math.abs(measured - expected) / expected).toBeLessThan(0.02);
  });
});

describe('Stribeck steady sliding', () => {
  // With viscous friction the robot reaches a terminal slip speed s on a ramp where
  // M·g·sin θ = μ(s)·N_total + n_feet·b·s, μ(s) from Armstrong-Hélouvry, Dupont & Canudas de Wit
  // (Automatica 30(7), 1994). Solved here by bisection, independently of the plant.
  const floor = material({ staticFriction: 0.3, kineticFriction: 0.2, stribeckVelocity_mps: 0.1, stribeckExponent: 2, viscous_Ns_per_m: 40 });

  it.each([17.5, 19, 22])('on a %s° ramp the friction force equals the Stribeck curve within 1 %', (theta) => {
    const plant = new Plant(plantConfig({ pitch_deg: theta, material: floor }));
    plant.applyAction(holdPosture(plant));
    runFor(plant, 3.0);
    const momentum = new Float64Array(3);
    let speedSum = 0;
    let frictionSum = 0;
    let normalSum = 0;
    let samples = 0;
    runFor(plant, 1.0, () => {
      speedSum += -linearMomentum(plant, momentum)[0] / plant.totalMass_kg;
      for (let i = 0; i < 4; i++) {
        frictionSum += Math.hypot(plant.footGroundForce_N[3 * i], plant.footGroundForce_N[3 * i + 1]);
        normalSum += plant.footGroundForce_N[3 * i + 2];
      }
      samples++;
    });
    const speed = speedSum / samples;
    const friction = frictionSum / samples;
    const normal = normalSum / samples;
    const curve = stribeckFriction_N(0.3, 0.2, 0.1, 2, 0, speed, normal) + 4 * 40 * speed;
    expect(Math.abs(friction - curve) / curve).toBeLessThan(0.01);

    const M = plant.totalMass_kg;
    const balance = (s: number) => M * g * Math.sin(theta * deg) - (stribeckFriction_N(0.3, 0.2, 0.1, 2, 0, s, M * g * Math.cos(theta * deg)) + 4 * 40 * s);
    let lo = 0;
    let hi = 10;
    for (let k = 0; k < 100; k++) {
      const mid = 0.5 * (lo + hi);
      if (balance(mid) > 0) lo = mid;
      else hi = mid;
    }
    expect(Math.abs(speed - lo) / lo).toBeLessThan(0.01);
  });
});

describe('impulse and statics', () => {
  it('a horizontal push of impulse J changes total momentum by J within 0.5 % on a frictionless floor', () => {
    // Impulse–momentum theorem (Newton's second law integrated over the pulse).
    const force: [number, number, number] = [120, -40, 0];
    const duration_s = 0.1;
    const plant = new Plant(
      plantConfig({
        material: material({ staticFriction: 0, kineticFriction: 0 }),
        pushes: [{ kind: 'pulse', shape: 'halfSine', at_s: 0.5, duration_s, force_N: force, point_m: [0.1, 0.05, 0.02] }],
      }),
    );
    plant.applyAction(holdPosture(plant));
    runFor(plant, 0.4);
    const before = linearMomentum(plant, new Float64Array(3)).slice();
    runFor(plant, 0.4);
    const after = linearMomentum(plant, new Float64Array(3));
    for (const a of [0, 1]) {
      const J = (2 / Math.PI) * force[a] * duration_s; // ∫ F·sin(πt/T) dt = 2FT/π
      expect(Math.abs(after[a] - before[a] - J) / Math.abs(J)).toBeLessThan(0.005);
    }
  });

  it('standing still, Σ f_z over the feet = total mass · g within 0.5 % once settled', () => {
    // Static equilibrium of the whole robot (Newton's first law).
    const plant = new Plant(plantConfig());
    plant.applyAction(holdPosture(plant));
    runFor(plant, 2.0);
    let sum = 0;
    for (let i = 0; i < 4; i++) sum += plant.footGroundForce_N[3 * i + 2];
    expect(Math.abs(sum - plant.totalMass_kg * g) / (plant.totalMass_kg * g)).toBeLessThan(0.005);
  });
});
