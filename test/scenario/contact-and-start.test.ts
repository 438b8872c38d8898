// The scenario side of contact laws from material data and of the start mode: what a file resolves
// to, what check refuses, and the step a contact needs (harness/plant/contactLaw.ts).

import { describe, expect, it } from 'vitest';
import {
  dampingForRestitution_s_per_m,
  effectiveModulus_Pa,
  hertzStiffness_N_per_m1p5,
} from '../../harness/plant/contactLaw.js';
import { DEFAULT_CONTACT } from '../../harness/plant/defaults.js';
import { BASE_YAML, ROBOT_TEXT, edit, errorsOf, load } from './helpers.js';

const messages = async (text: string, files?: Record<string, string>) => (await errorsOf(text, files)).map((e) => `${e.path}: ${e.message}`);

async function resolved(text: string, files?: Record<string, string>) {
  const r = await load(text, files);
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('\n'));
  return r.scenarios[0];
}

// The bundled quad-24kg foot: polyurethane (invented), R = 2 cm, E = 10 MPa, ν = 0.48, e = 0.5 at 1 m/s.
const foot = { elasticModulus_Pa: 1e7, poissonRatio: 0.48 };

describe('contact law from the robot file', () => {
  it('follows Hertz (k = (4/3)·E*·√R, n = 3/2) and the restitution of the foot material', async () => {
    const s = await resolved(BASE_YAML);
    expect(s.plant.robot.foot.radius_m).toBe(0.02);
    const contact = s.plant.ground.contact;
    expect(contact.exponent).toBe(1.5);
    expect(contact.stiffness_N_per_m).toBeCloseTo(hertzStiffness_N_per_m1p5(effectiveModulus_Pa(foot), 0.02), 6);
    expect(contact.damping_s_per_m).toBeCloseTo(dampingForRestitution_s_per_m(0.5, 1), 9);
    // (4/3)·(1e7/(1 − 0.48²))·√0.02 = 2.450e6 N/m^1.5, by hand.
    expect(contact.stiffness_N_per_m / 2.450e6).toBeCloseTo(1, 3);
  });

  it('softens with an elastic floor (E* of the pair) and keeps explicit fields as overrides', async () => {
    const floor = edit([['  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n', '  material: { staticFriction: 0.9, kineticFriction: 0.7, elastic: { elasticModulus_Pa: 1.0e7, poissonRatio: 0.48 } }\n']]);
    const soft = await resolved(floor);
    expect(soft.plant.ground.contact.stiffness_N_per_m).toBeCloseTo(hertzStiffness_N_per_m1p5(effectiveModulus_Pa(foot, foot), 0.02), 6);
    const given = edit([['  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n', '  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n  contact: { damping_s_per_m: 0.1 }\n']]);
    const overridden = await resolved(given);
    expect(overridden.plant.ground.contact.damping_s_per_m).toBe(0.1);
    expect(overridden.plant.ground.contact.stiffness_N_per_m).toBeCloseTo(hertzStiffness_N_per_m1p5(effectiveModulus_Pa(foot), 0.02), 6);
  });

  it('falls back to the plant default for a robot without foot material', async () => {
    const bare = ROBOT_TEXT.replace(/  radius_m:[\s\S]*?restitutionSpeed_mps: 1\.0\n/, '');
    expect(bare).not.toMatch(/radius_m/);
    const s = await resolved(BASE_YAML, { '/suite/robots/quad-24kg.yaml': bare });
    expect(s.plant.ground.contact).toEqual({ ...DEFAULT_CONTACT });
  });

  it('refuses elastic data on a patch (one contact law per ground)', async () => {
    const patch = edit([['  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n', '  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n  patches:\n    - { rect: { min_m: [1, -1], max_m: [2, 1] }, material: { elastic: { elasticModulus_Pa: 1.0e9, poissonRatio: 0.3 } } }\n']]);
    expect(await messages(patch)).toEqual([
      '/ground/patches/0/material/elastic: a patch cannot carry elastic data: one contact law holds for the whole ground (expected elastic under ground.material only)',
    ]);
  });
});

describe('the step a contact needs', () => {
  it('refuses a contact the physics step cannot resolve, naming the step it needs', async () => {
    // k = 2e7 N/m^1.5 under the whole 24 kg robot on one 0.25 kg foot: contact period
    // 2π·√(m/(1.5·k·δ^½)) with k·δ^1.5 = 235 N, i.e. 3.80 ms, so ≤ 0.380 ms at 10 steps per period.
    const stiff = edit([['  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n', '  material: { staticFriction: 0.9, kineticFriction: 0.7 }\n  contact: { stiffness_N_per_m: 2.0e7 }\n']]);
    expect(await messages(stiff)).toEqual([
      "/ground/contact: the physics step 0.5 ms cannot resolve the foot contact (k = 2.000e+7 N/m^1.5, contact period 3.8 ms at the robot's weight on one foot); it needs a step ≤ 0.38 ms (10 steps per contact period)",
    ]);
    const fine = edit([['duration_s: 8\n', 'duration_s: 8\nphysics: { step_s: 0.00025 }\ncontrol: { rate_Hz: 1000 }\n']], stiff);
    expect((await load(fine)).ok).toBe(true);
  });

  it('accepts every bundled robot at the default step (polyurethane feet need ≤ 0.77 ms)', async () => {
    const s = await resolved(BASE_YAML);
    expect(s.plant.physics.step_s).toBe(0.0005);
  });
});

describe('start mode', () => {
  it('is settled for standing feet at rest, released otherwise, and carried by the resolved scenario', async () => {
    expect((await resolved(BASE_YAML)).plant.initial.start).toBe('settled');
    const moving = edit([['duration_s: 8\n', 'duration_s: 8\ninitial: { velocity_mps: [0.2, 0, 0] }\n']]);
    expect((await resolved(moving)).plant.initial.start).toBe('released');
    const drop = edit([['duration_s: 8\n', 'duration_s: 8\ninitial: { feet: standing, start: released }\n']]);
    expect((await resolved(drop)).plant.initial.start).toBe('released');
  });

  it('refuses a settled start with explicit feet or a moving trunk', async () => {
    const feet = edit([['duration_s: 8\n', 'duration_s: 8\ninitial: { start: settled, feet: [[0.25, 0.12, 0], [0.25, -0.12, 0], [-0.25, 0.12, 0], [-0.25, -0.12, 0]] }\n']]);
    expect(await messages(feet)).toEqual([
      '/initial/start: a settled start places the feet itself, under the hips (expected feet: standing, or start: released with explicit foot positions)',
    ]);
    const spin = edit([['duration_s: 8\n', 'duration_s: 8\ninitial: { start: settled, angularVelocity_radps: [0, 0, 1] }\n']]);
    expect(await messages(spin)).toEqual([
      '/initial/angularVelocity_radps: a settled start is at rest, but angularVelocity_radps is [0, 0, 1] (expected zero, or start: released for a moving start)',
    ]);
  });
});
