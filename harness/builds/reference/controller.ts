// The reference controller: the shared gait and posture core plus the build's constraint
// handling. One tick:
//   1. trunk state (rotation, world inertia, hip arms) and gait phases;
//   2. PD errors against the reference and the affine wrench split w = w0 + B·u;
//   3. distribution of w0 and of each column of B over the stance feet: f = f0 + G·u;
//   4. governed builds: the reference governor moves the applied velocity/yaw-rate reference;
//   5. u from the applied reference, forces f0 + G·u, then the build's post-processing
//      (clamped: pyramid clip; qp: constrained re-solve);
//   6. swing-foot targets, action, telemetry; the reference integrates for the next tick.

import {
  STANCE,
  SWING,
  type Action,
  type Controller,
  type GaitName,
  type ControllerSetup,
  type Observation,
} from '../interface.js';
import type { RobotParams } from '../../plant/types.js';
import { ForceDistributor } from './distribution.js';
import { GaitScheduler } from './gait.js';
import { TrunkGovernor, GOVERNED_AXES } from './governor.js';
import { rotateTransposed } from './linalg.js';
import { resolveOptions, stepReach_m, type ReferenceOptions } from './options.js';
import { clampIntoPyramid, innerPyramidCoefficients } from './pyramid.js';
import { QuadraticDistributor } from './qp.js';
import { SwingPlanner } from './swing.js';
import { TrunkPD, TrunkReference, TrunkState } from './trunk.js';

export type ForcePost = 'none' | 'clamp' | 'qp';

export interface Variant {
  id: string;
  governed: boolean;
  post: ForcePost;
  /** Option defaults this build changes (e.g. frictionTrust for the over-trusting build). */
  defaults?: Partial<ReferenceOptions>;
}

/**
 * Below these the applied reference counts as stopped and a governed build may plant its feet
 * (common practice: a few centimetres per second, a few degrees per second).
 */
const STOP_SPEED_mps = 0.03;
const STOP_YAW_RATE_radps = 0.05;

const CORE_TELEMETRY = [
  'reference.vx',
  'reference.vy',
  'reference.yawRate',
  'gait.phase',
  'stance.count',
  'force.maxFrictionUse',
] as const;

const GOVERNOR_TELEMETRY = [
  'governor.target.vx',
  'governor.applied.vx',
  'governor.target.vy',
  'governor.applied.vy',
  'governor.target.yawRate',
  'governor.applied.yawRate',
  'governor.delta',
  'governor.lyapunov',
  'governor.threshold',
] as const;

/** Mean horizontal distance of the hips from the centre: scales yaw into metres. */
export function yawLength_m(robot: RobotParams): number {
  let sum = 0;
  for (const hip of robot.hips_m) sum += Math.hypot(hip[0], hip[1]);
  return Math.max(1e-3, sum / robot.hips_m.length);
}

function validateSetup(id: string, setup: ControllerSetup): void {
  const robot = setup.robot;
  const legs = robot?.hips_m?.length ?? 0;
  if (legs !== 4) throw new Error(`build ref:${id}: robot.hips_m has ${legs} entries, expected 4 (FL, FR, HL, HR)`);
  if (!(setup.controlRate_Hz > 0) || !Number.isFinite(setup.controlRate_Hz)) {
    throw new Error(`build ref:${id}: controlRate_Hz = ${setup.controlRate_Hz}, expected a positive number`);
  }
  const g = setup.gravity_mps2;
  if (!Array.isArray(g) || g.length !== 3 || !g.every(Number.isFinite)) {
    throw new Error(`build ref:${id}: gravity_mps2 = ${JSON.stringify(g)}, expected three finite numbers`);
  }
}

export class ReferenceController implements Controller {
  readonly telemetryNames: readonly string[];
  readonly options: ReferenceOptions;
  readonly variant: Variant;
  readonly robot: RobotParams;
  readonly period_s: number;
  readonly scheduler: GaitScheduler;
  readonly trunk: TrunkState;
  readonly reference: TrunkReference;
  readonly pd: TrunkPD;
  readonly distributor: ForceDistributor;
  readonly governor: TrunkGovernor | null;
  readonly qp: QuadraticDistributor | null;
  readonly swing: SwingPlanner;
  /** f0 (3 per leg), G (3 columns of 3 per leg), final forces, pyramid μ' per leg. */
  /** f0 then G (views of linearForces). */
  private readonly linearForces: Float64Array;
  readonly baseForces: Float64Array;
  readonly inputForces: Float64Array;
  readonly forces: Float64Array;
  readonly pyramid: Float64Array;
  private readonly legCount: number;
  private readonly hipsBody: Float64Array;
  private readonly column = new Float64Array(6);
  private readonly velocityTarget = new Float64Array(GOVERNED_AXES);
  /** (trust, margin, f_min, f_max): passed as an array so no double is boxed per call. */
  private readonly band: Float64Array;
  /** (stiffness, damping) of swing legs; see TrunkPD.postureGains for why not read from options. */
  private readonly swingGains: Float64Array;

  constructor(setup: ControllerSetup, variant: Variant) {
    validateSetup(variant.id, setup);
    const robot = setup.robot;
    const g = setup.gravity_mps2;
    const gravityMagnitude = Math.hypot(g[0], g[1], g[2]);
    this.variant = variant;
    this.robot = robot;
    this.options = resolveOptions(variant.id, robot, gravityMagnitude, setup.options ?? {}, variant.defaults);
    const o = this.options;
    this.legCount = robot.hips_m.length;
    this.period_s = 1 / setup.controlRate_Hz;
    this.hipsBody = new Float64Array(robot.hips_m.flat());
    this.scheduler = new GaitScheduler(this.legCount, robot.gait.period_s, robot.gait.dutyFactor, this.period_s);
    this.trunk = new TrunkState(robot);
    this.reference = new TrunkReference(this.period_s, o.maxPositionError_m, o.maxYawError_rad);
    this.pd = new TrunkPD(robot, g, o);
    this.distributor = new ForceDistributor(this.legCount, o.forceRegularisation, o.momentRegularisation_m2, o.refinementSteps);
    this.swing = new SwingPlanner(this.legCount, {
      stance_s: this.scheduler.stance_s,
      swing_s: this.scheduler.swing_s,
      apex_m: robot.gait.swingApex_m,
      raibertGain_s: o.raibertGain_s,
      reach_m: stepReach_m(robot, o.stepReachFraction),
    });
    this.linearForces = new Float64Array(3 * this.legCount * (1 + GOVERNED_AXES));
    this.baseForces = this.linearForces.subarray(0, 3 * this.legCount);
    this.inputForces = this.linearForces.subarray(3 * this.legCount);
    this.forces = new Float64Array(3 * this.legCount);
    this.pyramid = new Float64Array(this.legCount);
    this.swingGains = new Float64Array([o.swingStiffness_N_per_m, o.swingDamping_Ns_per_m]);
    this.band = new Float64Array([o.frictionTrust, o.frictionMargin, o.minNormalForce_N, o.maxNormalForce_N]);
    const yawLength = yawLength_m(robot);
    this.governor = variant.governed
      ? new TrunkGovernor({
          legCount: this.legCount,
          stiffness: this.pd.stiffness,
          damping: this.pd.damping,
          period_s: this.period_s,
          gain: o.governorGain,
          smoothing: o.governorSmoothing,
          influence: o.governorInfluence,
          margin: o.governorMargin,
          yawLength_m: yawLength,
          maxSpeed_mps: o.maxSpeed_mps,
          maxYawRate_radps: o.maxYawRate_radps,
        })
      : null;
    this.qp = variant.post === 'qp' ? new QuadraticDistributor(this.legCount, yawLength) : null;
    this.telemetryNames = variant.governed ? [...CORE_TELEMETRY, ...GOVERNOR_TELEMETRY] : [...CORE_TELEMETRY];
    if (this.governor !== null) this.governorUpdate = (obs) => this.updateGovernorAlone(obs);
  }

  tick(obs: Observation, action: Action): void {
    const legs = this.legCount, sched = this.scheduler, trunk = this.trunk, pd = this.pd;
    const reference = this.reference;
    if (!reference.initialised) reference.reset(obs, this.robot.standingHeight_m);

    trunk.update(obs, this.hipsBody);
    sched.update(this.gaitFor(obs));
    for (let i = 0; i < legs; i++) {
      if (sched.liftOff[i] !== 0) this.swing.captureLiftOff(i, obs.footPosition_m);
    }
    innerPyramidCoefficients(this.pyramid, obs.frictionEstimate, this.band);

    pd.evaluate(obs, trunk, reference);
    this.linearise();

    const target = this.velocityTarget;
    target[0] = obs.command.velocity_mps[0];
    target[1] = obs.command.velocity_mps[1];
    target[2] = obs.command.yawRate_radps;
    if (this.governor !== null) {
      const gov = this.governor;
      gov.target[0] = target[0];
      gov.target[1] = target[1];
      gov.target[2] = target[2];
      gov.linearise(sched.mode, this.baseForces, this.inputForces, this.pyramid, this.band);
      gov.update(pd.error);
      reference.velocity_mps[0] = gov.applied[0];
      reference.velocity_mps[1] = gov.applied[1];
      reference.yawRate_radps = gov.applied[2];
    } else {
      reference.velocity_mps[0] = target[0];
      reference.velocity_mps[1] = target[1];
      reference.yawRate_radps = target[2];
    }
    pd.setVelocityReference(reference);
    this.composeForces();

    this.writeLegs(obs, action);
    this.writeTelemetry(action);
    reference.advance(obs);
  }

  /**
   * The gait to step. A governed build keeps trotting after a stop command while its applied
   * reference (last tick's) still moves: the governor brings the reference down only as fast as the
   * friction allows, and standing on planted feet under a still-moving trunk drags them. The other
   * builds apply the command at once, so for them this is the command's gait.
   */
  private gaitFor(obs: Observation): GaitName {
    const gait = obs.command.gait;
    if (gait !== 'stand' || this.governor === null || !this.reference.initialised) return gait;
    const v = this.reference.velocity_mps;
    const moving = v[0] * v[0] + v[1] * v[1] > STOP_SPEED_mps * STOP_SPEED_mps || Math.abs(this.reference.yawRate_radps) > STOP_YAW_RATE_radps;
    return moving ? 'trot' : gait;
  }

  /**
   * One governor update alone, for the bench (Controller.governorUpdate). Only governed builds
   * have it, so a bench does not time an empty call for the others.
   */
  readonly governorUpdate?: (obs: Observation) => void;

  private updateGovernorAlone(obs: Observation): void {
    if (this.governor === null) return;
    const reference = this.reference;
    if (!reference.initialised) reference.reset(obs, this.robot.standingHeight_m);
    this.trunk.updateRotation(obs);
    this.pd.evaluateError(obs, this.trunk.angularVelocityWorld, reference);
    this.governor.update(this.pd.error);
    reference.velocity_mps[0] = this.governor.applied[0];
    reference.velocity_mps[1] = this.governor.applied[1];
    reference.yawRate_radps = this.governor.applied[2];
  }

  /** f0 = D·w0 and G_j = D·B_j for the current stance set (the distribution is linear). */
  private linearise(): void {
    const d = this.distributor, pd = this.pd;
    d.prepare(this.scheduler.mode, this.trunk.hipArms);
    // w0 then B's columns, packed 6 apiece (pd.wrenches), give f0 then G's columns, packed 3N
    // apiece (this.linearForces): one call solves all four in place.
    d.solveMany(this.linearForces, pd.wrenches, 1 + GOVERNED_AXES);
  }

  private composeForces(): void {
    const f = this.forces, u = this.pd.input, stride = 3 * this.legCount;
    const base = this.baseForces, input = this.inputForces, u0 = u[0], u1 = u[1], u2 = u[2];
    for (let k = 0; k < stride; k++) {
      f[k] = base[k] + input[k] * u0 + input[stride + k] * u1 + input[2 * stride + k] * u2;
    }
    const mode = this.scheduler.mode;
    if (this.variant.post === 'clamp') {
      for (let i = 0; i < this.legCount; i++) {
        if (mode[i] === STANCE) clampIntoPyramid(f, i, this.pyramid, this.band);
      }
    } else if (this.qp !== null) {
      const solved = this.qp.solve(f, mode, this.trunk.hipArms, this.pyramid, this.band);
      if (!solved) {
        for (let i = 0; i < this.legCount; i++) {
          if (mode[i] === STANCE) clampIntoPyramid(f, i, this.pyramid, this.band);
        }
      }
    }
  }

  private writeLegs(obs: Observation, action: Action): void {
    const sched = this.scheduler, trunk = this.trunk, legs = this.legCount;
    const p = obs.trunkPosition_m, arms = trunk.hipArms;
    for (let i = 0; i < legs; i++) {
      const k = 3 * i;
      if (sched.mode[i] === STANCE) {
        action.mode[i] = STANCE;
        action.groundForce_N[k] = this.forces[k];
        action.groundForce_N[k + 1] = this.forces[k + 1];
        action.groundForce_N[k + 2] = this.forces[k + 2];
        // Force-controlled stance: no impedance, the target is where the foot is.
        const rel = this.column;
        rel[0] = obs.footPosition_m[k] - (p[0] + arms[k]);
        rel[1] = obs.footPosition_m[k + 1] - (p[1] + arms[k + 1]);
        rel[2] = obs.footPosition_m[k + 2] - (p[2] + arms[k + 2]);
        rotateTransposed(action.footTarget_m, k, trunk.rotation, rel, 0);
        action.footTargetVelocity_mps[k] = 0;
        action.footTargetVelocity_mps[k + 1] = 0;
        action.footTargetVelocity_mps[k + 2] = 0;
        action.stiffness_N_per_m[i] = 0;
        action.damping_Ns_per_m[i] = 0;
      } else {
        action.mode[i] = SWING;
        action.groundForce_N[k] = 0;
        action.groundForce_N[k + 1] = 0;
        action.groundForce_N[k + 2] = 0;
        this.swing.planTouchdown(i, p, arms, obs.trunkVelocity_mps, this.referenceVector(), sched.swingRemaining_s);
        this.swing.evaluate(
          i, sched.swingProgress, trunk.rotation, p, obs.trunkVelocity_mps, trunk.angularVelocityWorld, arms,
          action.footTarget_m, action.footTargetVelocity_mps,
        );
        action.stiffness_N_per_m[i] = this.swingGains[0];
        action.damping_Ns_per_m[i] = this.swingGains[1];
      }
    }
  }

  private referenceVector(): Float64Array {
    const v = this.velocityTarget;
    v[0] = this.reference.velocity_mps[0];
    v[1] = this.reference.velocity_mps[1];
    v[2] = this.reference.yawRate_radps;
    return v;
  }

  private writeTelemetry(action: Action): void {
    const t = action.telemetry, sched = this.scheduler;
    let use = 0;
    for (let i = 0; i < this.legCount; i++) {
      if (sched.mode[i] !== STANCE) continue;
      const f = this.forces, k = 3 * i;
      const tangential = Math.sqrt(f[k] * f[k] + f[k + 1] * f[k + 1]);
      const u = f[k + 2] > 0 ? tangential / f[k + 2] : tangential > 0 ? 1e9 : 0;
      if (u > use) use = u;
    }
    t[0] = this.reference.velocity_mps[0];
    t[1] = this.reference.velocity_mps[1];
    t[2] = this.reference.yawRate_radps;
    t[3] = sched.trotting ? sched.phase : 0;
    t[4] = sched.stanceCount();
    t[5] = use;
    const gov = this.governor;
    if (gov !== null) {
      t[6] = gov.target[0];
      t[7] = gov.applied[0];
      t[8] = gov.target[1];
      t[9] = gov.applied[1];
      t[10] = gov.target[2];
      t[11] = gov.applied[2];
      t[12] = gov.erg.delta;
      t[13] = gov.erg.lyapunovValue;
      t[14] = Math.min(gov.erg.threshold, 1e12);
    }
  }
}
