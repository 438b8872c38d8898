// The five reference builds through the public ControllerFactory interface: they load, write
// finite actions in every mode, reject bad options with a message naming option and value, and
// report the governor's target and applied reference as telemetry. (Allocation: allocation.test.ts.)

import { describe, expect, it } from 'vitest';
import { createAction, STANCE, type Controller } from '../../../harness/builds/interface.js';
import { referenceBuilds } from '../../../harness/builds/reference/index.js';
import { STANDARD_GRAVITY_mps2 } from '../../../harness/plant/defaults.js';
import { standingObservation } from '../../support/observations.js';
import { testRobot } from '../../support/robots.js';

const robot = testRobot();

function setup(options: Record<string, unknown> = {}) {
  return { robot, controlRate_Hz: 1000, physicsStep_s: 0.0005, gravity_mps2: [0, 0, -STANDARD_GRAVITY_mps2] as [number, number, number], options };
}


async function make(id: string, options: Record<string, unknown> = {}): Promise<Controller> {
  return await referenceBuilds[id](setup(options));
}

describe('reference builds', () => {
  it('registers nominal, governed, clamped, qp and overtrusting', () => {
    expect(Object.keys(referenceBuilds).sort()).toEqual(['clamped', 'governed', 'nominal', 'overtrusting', 'qp']);
  });

  for (const id of Object.keys(referenceBuilds)) {
    it(`${id}: writes finite actions for a standing start into a trot, over several gait periods`, async () => {
      const c = await make(id);
      const obs = standingObservation(robot, 50);
      const action = createAction(4, c.telemetryNames.length);
      let swings = 0;
      let nonFinite = 0;
      let stanceWithImpedance = 0;
      let swingWithForce = 0;
      for (let k = 0; k < 1200; k++) {
        obs.time_s = k / 1000;
        c.tick(obs, action);
        for (const field of [action.groundForce_N, action.footTarget_m, action.footTargetVelocity_mps, action.stiffness_N_per_m, action.damping_Ns_per_m, action.telemetry]) {
          for (const x of field) if (!Number.isFinite(x)) nonFinite++;
        }
        for (let i = 0; i < 4; i++) {
          if (action.mode[i] === STANCE) {
            if (action.stiffness_N_per_m[i] !== 0) stanceWithImpedance++;
          } else {
            swings++;
            if (action.groundForce_N[3 * i + 2] !== 0 || !(action.stiffness_N_per_m[i] > 0)) swingWithForce++;
          }
        }
      }
      expect(nonFinite).toBe(0);
      expect(stanceWithImpedance).toBe(0);
      expect(swingWithForce).toBe(0);
      // Duty factor 0.6: 40 % of leg-ticks in swing once trotting.
      expect(swings / (4 * 1200)).toBeGreaterThan(0.3);
    });
  }

  it('governed: the applied reference starts at rest and moves toward the target', async () => {
    const c = await make('governed');
    const obs = standingObservation(robot, 50);
    const action = createAction(4, c.telemetryNames.length);
    const index = (name: string) => c.telemetryNames.indexOf(name);
    c.tick(obs, action);
    expect(action.telemetry[index('governor.target.vx')]).toBe(0.4);
    const first = action.telemetry[index('governor.applied.vx')];
    expect(first).toBeGreaterThanOrEqual(0);
    expect(first).toBeLessThan(0.4);
    for (let k = 0; k < 50; k++) c.tick(obs, action);
    expect(action.telemetry[index('governor.applied.vx')]).toBeGreaterThan(first);
  });

  it('rejects unknown options and bad values, naming the build, option and value', async () => {
    await expect(async () => make('nominal', { swingStifness: 3 })).rejects.toThrow(/ref:nominal: unknown option 'swingStifness'/);
    await expect(async () => make('governed', { governorGain: 'fast' })).rejects.toThrow(/'governorGain' = "fast", expected a finite number/);
    await expect(async () => make('qp', { frictionMargin: 2 })).rejects.toThrow(/'frictionMargin' = 2, expected a number in \[0, 0.99\]/);
    await expect(async () => make('governed', { governorMargin: 0.2, governorInfluence: 0.1 })).rejects.toThrow(/governorMargin/);
    await expect(async () => referenceBuilds.nominal({ ...setup(), robot: { ...robot, hips_m: robot.hips_m.slice(0, 3) } })).rejects.toThrow(/3 entries, expected 4/);
  });

  it('accepts numeric options given as strings (as a command line passes them)', async () => {
    const c = (await make('nominal', { swingStiffness_N_per_m: '900' })) as unknown as { options: { swingStiffness_N_per_m: number } };
    expect(c.options.swingStiffness_N_per_m).toBe(900);
  });

  it('overtrusting: believes 1.6 × the friction estimate', async () => {
    const c = (await make('overtrusting')) as unknown as { options: { frictionTrust: number } };
    expect(c.options.frictionTrust).toBe(1.6);
  });
});
