// Tunable options of the reference builds (setup.options of the build spec). One table holds the
// name, default and admissible range of each option; anything else is rejected with a message
// naming the build, the option, the value and what was expected.

import type { RobotParams } from '../../plant/types.js';

export interface ReferenceOptions {
  // Trunk PD (acceleration-level gains, so they do not depend on the robot's mass).
  positionGain_per_s2: number;
  velocityGain_per_s: number;
  heightGain_per_s2: number;
  heightDampingGain_per_s: number;
  attitudeGain_per_s2: number;
  attitudeDampingGain_per_s: number;
  /** The position reference is kept within this distance of the trunk (a leash; see trunk.ts). */
  maxPositionError_m: number;
  maxYawError_rad: number;
  // Swing.
  swingStiffness_N_per_m: number;
  swingDamping_Ns_per_m: number;
  /** Raibert's velocity-feedback gain k in p_td = hip + v·T_st/2 + k·(v − v_cmd). */
  raibertGain_s: number;
  /** Step length limit as a fraction of the leg's horizontal reach at standing height. */
  stepReachFraction: number;
  // Force distribution.
  /** Tikhonov term on the force rows of the 6×6 normal equations (dimensionless). */
  forceRegularisation: number;
  /** Tikhonov term on the moment rows (m²); larger, so a two-foot stance gives up moment first. */
  momentRegularisation_m2: number;
  /** Iterative-refinement passes on the regularised solve (0 = plain regularised solution). */
  refinementSteps: number;
  // Constraints (governed, clamped, qp).
  /** Static safety margin on μ: μ_inner = trust·μ_est·(1 − frictionMargin)/√2. */
  frictionMargin: number;
  /** Factor on the friction estimate the build believes (1 = honest; the overtrusting build 1.6). */
  frictionTrust: number;
  minNormalForce_N: number;
  maxNormalForce_N: number;
  // Explicit reference governor (governed, overtrusting).
  /** κ in Δ = κ·(Γ − V), units of reference per second per unit of V. */
  governorGain: number;
  /** η, the attraction smoothing radius (reference units: m/s; yaw rate scaled by yawLength). */
  governorSmoothing: number;
  /** ζ, the repulsion influence zone (reference units). */
  governorInfluence: number;
  /** δ, the static safety margin of the repulsion (reference units), δ < ζ. */
  governorMargin: number;
  maxSpeed_mps: number;
  maxYawRate_radps: number;
}

type Key = keyof ReferenceOptions;

interface Rule {
  min: number;
  max: number;
  integer?: boolean;
}

const RULES: Record<Key, Rule> = {
  positionGain_per_s2: { min: 0, max: 1e4 },
  velocityGain_per_s: { min: 0, max: 1e3 },
  heightGain_per_s2: { min: 0, max: 1e4 },
  heightDampingGain_per_s: { min: 0, max: 1e3 },
  attitudeGain_per_s2: { min: 0, max: 1e4 },
  attitudeDampingGain_per_s: { min: 0, max: 1e3 },
  maxPositionError_m: { min: 1e-4, max: 10 },
  maxYawError_rad: { min: 1e-4, max: 3.2 },
  swingStiffness_N_per_m: { min: 0, max: 1e5 },
  swingDamping_Ns_per_m: { min: 0, max: 250 },
  raibertGain_s: { min: 0, max: 1 },
  stepReachFraction: { min: 0, max: 1 },
  forceRegularisation: { min: 1e-15, max: 1 },
  momentRegularisation_m2: { min: 1e-15, max: 1 },
  refinementSteps: { min: 0, max: 10, integer: true },
  frictionMargin: { min: 0, max: 0.99 },
  frictionTrust: { min: 0.01, max: 100 },
  minNormalForce_N: { min: 0, max: 1e5 },
  maxNormalForce_N: { min: 0, max: 1e6 },
  governorGain: { min: 0, max: 1e9 },
  governorSmoothing: { min: 1e-9, max: 100 },
  governorInfluence: { min: 1e-9, max: 100 },
  governorMargin: { min: 0, max: 100 },
  maxSpeed_mps: { min: 0, max: 100 },
  maxYawRate_radps: { min: 0, max: 100 },
};

/** Defaults; those that depend on the robot are derived from it. */
export function defaultOptions(robot: RobotParams, gravity_mps2: number): ReferenceOptions {
  const feet = robot.hips_m.length;
  const weight_N = (robot.trunk.mass_kg + feet * robot.foot.mass_kg) * gravity_mps2;
  const stance_s = robot.gait.dutyFactor * robot.gait.period_s;
  return {
    // ωn ≈ 4.5 rad/s, ζ ≈ 1 horizontally: slow enough that a step command does not ask for
    // more than a few m/s² from the velocity term (common practice for position-controlled trunks).
    positionGain_per_s2: 20,
    velocityGain_per_s: 9,
    // ωn = 10 rad/s, ζ = 1 for height; ωn ≈ 12 rad/s, ζ ≈ 1 for attitude (common practice).
    heightGain_per_s2: 100,
    heightDampingGain_per_s: 20,
    attitudeGain_per_s2: 150,
    attitudeDampingGain_per_s: 24,
    maxPositionError_m: 0.05,
    maxYawError_rad: 0.2,
    // Foot 0.25 kg: ωn = √(800/0.25) ≈ 57 rad/s, ζ = 20/(2·√(800·0.25)) ≈ 0.7.
    swingStiffness_N_per_m: 800,
    swingDamping_Ns_per_m: 20,
    // Half of √(h/g), the inverted-pendulum time constant (Raibert 1986 uses a tuned k; common practice).
    raibertGain_s: 0.5 * Math.sqrt(robot.standingHeight_m / gravity_mps2),
    stepReachFraction: 0.8,
    forceRegularisation: 1e-9,
    momentRegularisation_m2: 1e-5,
    refinementSteps: 2,
    frictionMargin: 0.1,
    frictionTrust: 1,
    minNormalForce_N: 0.02 * weight_N,
    maxNormalForce_N: 0.8 * robot.leg.maxForce_N,
    // V of a 0.1 m/s velocity error is ≈ 1e-3 with P from Q = diag(k_p, 1); κ = 1e3 turns such a
    // margin into a reference rate of ≈ 1 m/s², near what μ = 0.2 allows (tuned in closed loop).
    governorGain: 1000,
    governorSmoothing: 0.01,
    governorInfluence: 0.05,
    governorMargin: 0.005,
    maxSpeed_mps: Math.max(0.05, (2 * stepReach_m(robot, 0.8)) / stance_s),
    maxYawRate_radps: 1.5,
  };
}

/** Horizontal reach of a leg at standing height, times a fraction (hip height from the trunk frame). */
export function stepReach_m(robot: RobotParams, fraction: number): number {
  let hipHeight = 0;
  for (const hip of robot.hips_m) hipHeight += robot.standingHeight_m + hip[2];
  hipHeight /= robot.hips_m.length;
  const length = robot.leg.maxLength_m;
  return fraction * Math.sqrt(Math.max(0, length * length - hipHeight * hipHeight));
}

/** Defaults overridden by `raw`; throws on unknown keys, non-numbers and out-of-range values. */
export function resolveOptions(
  buildId: string,
  robot: RobotParams,
  gravity_mps2: number,
  raw: Record<string, unknown>,
  overrides: Partial<ReferenceOptions> = {},
): ReferenceOptions {
  const options = { ...defaultOptions(robot, gravity_mps2), ...overrides };
  for (const [key, value] of Object.entries(raw ?? {})) {
    if (!(key in RULES)) {
      const known = Object.keys(RULES).join(', ');
      throw new Error(`build ref:${buildId}: unknown option '${key}'; known options: ${known}`);
    }
    const rule = RULES[key as Key];
    const number = typeof value === 'string' && value.trim() !== '' ? Number(value) : value;
    if (typeof number !== 'number' || !Number.isFinite(number)) {
      throw new Error(`build ref:${buildId}: option '${key}' = ${JSON.stringify(value)}, expected a finite number`);
    }
    if (number < rule.min || number > rule.max || (rule.integer && !Number.isInteger(number))) {
      const kind = rule.integer ? 'an integer' : 'a number';
      throw new Error(`build ref:${buildId}: option '${key}' = ${number}, expected ${kind} in [${rule.min}, ${rule.max}]`);
    }
    options[key as Key] = number;
  }
  if (options.governorMargin >= options.governorInfluence) {
    throw new Error(
      `build ref:${buildId}: governorMargin (${options.governorMargin}) must be smaller than governorInfluence (${options.governorInfluence})`,
    );
  }
  if (options.minNormalForce_N >= options.maxNormalForce_N) {
    throw new Error(
      `build ref:${buildId}: minNormalForce_N (${options.minNormalForce_N}) must be smaller than maxNormalForce_N (${options.maxNormalForce_N})`,
    );
  }
  return options;
}
