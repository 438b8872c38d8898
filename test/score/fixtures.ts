// Hand-made scenario and samples for the scorer tests. The robot: a 12 kg trunk and four 0.25 kg
// feet (13 kg, weight 13 × 9.80665 = 127.49 N, loaded above 5 % = 6.374 N), standing at 0.30 m.

import type { ResolvedScenario } from '../../harness/scenario/types.js';
import { createTickSample, type TickSample } from '../../harness/score/sample.js';

export const FOOT_COUNT = 4;
export const CONTROL_PERIOD_s = 0.001;

export function makeScenario(overrides: Partial<ResolvedScenario> = {}): ResolvedScenario {
  return {
    id: 'flat-walk-test',
    revision: 1,
    title: 'A hand-made test scenario',
    file: 'scenarios/flat-walk-test.yaml',
    hash: 'a'.repeat(64),
    duration_s: 1,
    seed: 1,
    plant: {
      robot: {
        id: 'test-quad',
        name: 'Test quadruped',
        trunk: {
          mass_kg: 12,
          inertia_kgm2: [
            [0.1, 0, 0],
            [0, 0.3, 0],
            [0, 0, 0.35],
          ],
          halfExtents_m: [0.25, 0.1, 0.05],
        },
        hips_m: [
          [0.2, 0.1, 0],
          [0.2, -0.1, 0],
          [-0.2, 0.1, 0],
          [-0.2, -0.1, 0],
        ],
        foot: { mass_kg: 0.25 },
        leg: {
          minLength_m: 0.1,
          maxLength_m: 0.4,
          maxForce_N: 300,
          endStopStiffness_N_per_m: 1e5,
          endStopDamping_Ns_per_m: 100,
        },
        standingHeight_m: 0.3,
        gait: { period_s: 0.4, dutyFactor: 0.6, swingApex_m: 0.06 },
      },
      ground: {
        incline_deg: { pitch: 0, roll: 0 },
        contact: { stiffness_N_per_m: 2e5, exponent: 1.5, damping_s_per_m: 0.5 },
        friction: {
          default: {
            name: 'test-floor',
            staticFriction: 0.5,
            kineticFriction: 0.4,
            stribeckVelocity_mps: 0.01,
            stribeckExponent: 2,
            viscous_Ns_per_m: 0,
          },
          patches: [],
        },
      },
      pushes: [],
      physics: { step_s: 0.0005 },
      initial: {
        position_m: [0, 0, 0.3],
        rpy_deg: [0, 0, 0],
        velocity_mps: [0, 0, 0],
        angularVelocity_radps: [0, 0, 0],
        feet: 'standing',
        start: 'settled',
      },
    },
    control: { rate_Hz: 1000, loopBudget_us: 1000 },
    commands: [{ at_s: 0, gait: 'stand', velocity_mps: [0, 0, 0], yawRate_radps: 0 }],
    sensing: { frictionEstimate: { kind: 'truth' }, forceNoise_N: 0 },
    acceptance: {
      mustNotFall: true,
      minFrictionMargin: null,
      maxSlipDistance_m: null,
      maxCommandedViolations: null,
      minProgress: null,
    },
    tags: [],
    ...overrides,
  };
}

/** A robot standing still at 0.30 m, each foot carrying a quarter of the weight, all in stance. */
export function standingSample(): TickSample {
  const sample = createTickSample(FOOT_COUNT);
  sample.dt_s = CONTROL_PERIOD_s;
  sample.trunkPosition_m.set([0, 0, 0.3]);
  sample.loopTime_us = 100;
  for (let i = 0; i < FOOT_COUNT; i++) {
    sample.footForce_N.set([0, 0, 32], 3 * i);
    sample.wantedForce_N.set([0, 0, 32], 3 * i);
    sample.footStaticFriction[i] = 0.5;
    sample.mode[i] = 1;
  }
  return sample;
}

/** Drives `ticks` ticks of one reused sample through `record`, after `edit` sets up tick k. */
export function drive(
  record: (sample: TickSample) => void,
  sample: TickSample,
  ticks: number,
  edit: (sample: TickSample, tick: number) => void = () => {},
): void {
  for (let k = 0; k < ticks; k++) {
    sample.time_s = (k + 1) * sample.dt_s;
    edit(sample, k);
    record(sample);
  }
}
