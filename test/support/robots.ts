// Invented robots and ground for plant tests (not the bundled library: plant tests must not depend
// on the scenario loader).

import { createAction, type Action } from '../../harness/builds/interface.js';
import { DEFAULT_CONTACT } from '../../harness/plant/defaults.js';
import type { Plant } from '../../harness/plant/plant.js';
import type { Material, PlantConfig, RobotParams, Vec3 } from '../../harness/plant/types.js';

export function testRobot(overrides: Partial<RobotParams> = {}): RobotParams {
  return {
    id: 'test-quad',
    name: 'test quadruped',
    trunk: {
      mass_kg: 20,
      inertia_kgm2: [
        [0.18, 0.004, -0.006],
        [0.004, 0.62, 0.002],
        [-0.006, 0.002, 0.75],
      ],
      halfExtents_m: [0.3, 0.15, 0.06],
    },
    hips_m: [
      [0.25, 0.12, 0],
      [0.25, -0.12, 0],
      [-0.25, 0.12, 0],
      [-0.25, -0.12, 0],
    ],
    foot: { mass_kg: 0.25 },
    leg: {
      minLength_m: 0.12,
      maxLength_m: 0.42,
      maxForce_N: 400,
      endStopStiffness_N_per_m: 5e4,
      endStopDamping_Ns_per_m: 300,
    },
    standingHeight_m: 0.3,
    gait: { period_s: 0.4, dutyFactor: 0.6, swingApex_m: 0.06 },
    ...overrides,
  };
}

export function material(overrides: Partial<Material> = {}): Material {
  return {
    name: 'test floor',
    staticFriction: 0.9,
    kineticFriction: 0.7,
    stribeckVelocity_mps: 0.02,
    stribeckExponent: 2,
    viscous_Ns_per_m: 0,
    ...overrides,
  };
}

export function plantConfig(overrides: {
  robot?: RobotParams;
  material?: Material;
  pitch_deg?: number;
  roll_deg?: number;
  step_s?: number;
  position_m?: Vec3;
  velocity_mps?: Vec3;
  angularVelocity_radps?: Vec3;
  feet?: PlantConfig['initial']['feet'];
  /** Default: settled for standing feet at rest, else released. */
  start?: PlantConfig['initial']['start'];
  pushes?: PlantConfig['pushes'];
  contact?: PlantConfig['ground']['contact'];
} = {}): PlantConfig {
  const robot = overrides.robot ?? testRobot();
  const feet = overrides.feet ?? 'standing';
  const atRest = [...(overrides.velocity_mps ?? [0, 0, 0]), ...(overrides.angularVelocity_radps ?? [0, 0, 0])].every((x) => x === 0);
  return {
    robot,
    ground: {
      incline_deg: { pitch: overrides.pitch_deg ?? 0, roll: overrides.roll_deg ?? 0 },
      contact: overrides.contact ?? { ...DEFAULT_CONTACT },
      friction: { default: overrides.material ?? material(), patches: [] },
    },
    pushes: overrides.pushes ?? [],
    physics: { step_s: overrides.step_s ?? 0.0005 },
    initial: {
      position_m: overrides.position_m ?? [0, 0, robot.standingHeight_m],
      rpy_deg: [0, 0, 0],
      velocity_mps: overrides.velocity_mps ?? [0, 0, 0],
      angularVelocity_radps: overrides.angularVelocity_radps ?? [0, 0, 0],
      feet,
      start: overrides.start ?? (feet === 'standing' && atRest ? 'settled' : 'released'),
    },
  };
}

/**
 * A hold-posture test controller: every foot in stance, the wanted ground force is the trunk's
 * weight shared evenly and parallel to gravity, plus a stiff leg impedance toward the standing foot
 * position. Its stance forces are all parallel to gravity, so the tangential demand ratio at each
 * foot is tan θ of the ramp — the textbook block on an incline.
 */
export function holdPosture(plant: Plant, stiffness_N_per_m = 3000, damping_Ns_per_m = 60): Action {
  const n = plant.footCount;
  const action = createAction(n, 0);
  const share = plant.robot.trunk.mass_kg / n;
  for (let i = 0; i < n; i++) {
    action.mode[i] = 1;
    for (let a = 0; a < 3; a++) action.groundForce_N[3 * i + a] = -share * plant.gravity_mps2[a];
    action.footTarget_m[3 * i + 2] = -plant.robot.standingHeight_m;
    action.stiffness_N_per_m[i] = stiffness_N_per_m;
    action.damping_Ns_per_m[i] = damping_Ns_per_m;
  }
  return action;
}

/** Zero action: no leg force at all (free bodies joined only by the end-stops). */
export function limpAction(plant: Plant): Action {
  return createAction(plant.footCount, 0);
}

export function runFor(plant: Plant, duration_s: number, each?: () => void): void {
  const steps = Math.round(duration_s / plant.step_s);
  for (let k = 0; k < steps; k++) {
    plant.step();
    each?.();
  }
}

/** Centre of mass of trunk + feet, and its velocity. */
export function centreOfMass(plant: Plant, out: Float64Array): Float64Array {
  const mt = plant.robot.trunk.mass_kg;
  const mf = plant.robot.foot.mass_kg;
  for (let a = 0; a < 3; a++) {
    let s = mt * plant.trunkPosition_m[a];
    for (let i = 0; i < plant.footCount; i++) s += mf * plant.footPosition_m[3 * i + a];
    out[a] = s / plant.totalMass_kg;
  }
  return out;
}

export function linearMomentum(plant: Plant, out: Float64Array): Float64Array {
  const mt = plant.robot.trunk.mass_kg;
  const mf = plant.robot.foot.mass_kg;
  for (let a = 0; a < 3; a++) {
    let s = mt * plant.trunkVelocity_mps[a];
    for (let i = 0; i < plant.footCount; i++) s += mf * plant.footVelocity_mps[3 * i + a];
    out[a] = s;
  }
  return out;
}
