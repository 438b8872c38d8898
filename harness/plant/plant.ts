// The contact plant: a 6-DoF rigid trunk and N point-mass feet on massless leg actuators, on a
// Hunt–Crossley / Stribeck ground. One step() allocates nothing: all state lives in Float64Arrays
// made in the constructor, and the math is written out component by component.
//
// Integration (fixed step h, deterministic):
// - translation of trunk and feet: leapfrog (kick–drift with half-step velocities; Verlet 1967).
//   It is symplectic like semi-implicit Euler, so stiff contact springs stay stable for ω·h < 2,
//   and with the half kick on the first step it is exact for constant forces (free fall, pulses).
//   Velocities in the state are therefore the mid-step velocities v(t − h/2).
// - trunk rotation: the same kick–drift splitting on the Lie group (Dullweber, Leimkuhler &
//   McLachlan, "Symplectic splitting methods for rigid body molecular dynamics", J. Chem. Phys.
//   107, 1997; Touma & Wisdom, Astron. J. 107, 1994): the body angular momentum takes a kick from
//   the torque of the configuration the forces were computed at, then the torque-free rotor flows
//   for the step (RK4, accurate to ~1e-14 per step, so in effect the exact free flow). Position
//   and orientation are thus updated from the same configuration with the same staggered momenta,
//   which is what keeps energy bounded with contact springs acting through the rotation (holding
//   the torque over an RK4 step instead is explicit Euler in the coupling and gains energy).
//   Angular velocities in the state are mid-step like the linear ones.
// - friction: the per-foot implicit stick/slide solve of contact.ts.
// - landings: a step in which a foot may touch down is taken first as a trial; if a foot went from
//   above the ground to below it (or its contact force more than doubled, it lifted off, or
//   friction stopped or sharply slowed its slide), the step is undone and taken again as K
//   substeps of step/K, K from the impact duration (landing.ts). The leapfrog's kick at a change of step is the mean of
//   the two steps (½(h_prev + h)), its usual variable-step form, so the scheme stays second order.
//   An observer passed to step() sees every substep (an object: its method is one call target for every run) (the scorer weights each by its share).
// - damping and Stribeck read the foot velocity at the step's start, v(t) = v(t − h/2) +
//   (h_prev/2)·a(t), second order (the mid-step velocity alone lags by half a step): the normal
//   damping with this step's own a(t), in closed form (contact.ts), the Stribeck slip speed with
//   the last step's (friction's own force is not known before the stick/slide solve).

import type { RobotState } from '../contract/state.js';
import type { Action } from '../contract/tick.js';
import { footFriction, huntCrossleyNormal_N, huntCrossleyNormalAtStart_N } from './contact.js';
import { PlantDivergedError } from './errors.js';
import { FrictionField } from './frictionMap.js';
import { gravityOnIncline } from './gravity.js';
import {
  impactDuration_s,
  impactDurationFactor,
  LANDING_FORCE_RATIO,
  MAX_LANDING_SUBSTEPS,
  SLIDE_CHANGE_FRACTION,
  STOP_SPEED_mps,
  SUBSTEPS_PER_IMPACT,
} from './landing.js';
import { PushSchedule } from './pushes.js';
import { restingDepth_m, staticSupportForces } from './settle.js';
import { invertSymmetric3, matrixFromQuaternion, quaternionFromRollPitchYaw } from './rotation.js';
import type { ContactLaw, PlantConfig, RobotParams, SubstepObserver } from './types.js';
import { validatePlantConfig } from './validate.js';

/** Saved values per foot before a trial step (position, velocity, acceleration, leg force z). */
const SAVED_PER_FOOT = 10;

/** Regularisation speed of the trunk-on-ground friction (a fallen robot only; common practice). */
const TRUNK_FRICTION_SPEED_mps = 0.05;

export class Plant {
  readonly robot: RobotParams;
  readonly footCount: number;
  readonly step_s: number;
  readonly totalMass_kg: number;
  readonly gravity_mps2 = new Float64Array(3);
  readonly friction: FrictionField;
  /** The resolved Hunt–Crossley law of the ground (one for feet and trunk). */
  readonly contactLaw: Readonly<ContactLaw>;

  time_s = 0;
  readonly trunkPosition_m = new Float64Array(3);
  readonly trunkQuaternion = new Float64Array(4);
  readonly trunkVelocity_mps = new Float64Array(3);
  /** Body frame. */
  readonly trunkAngularVelocity_radps = new Float64Array(3);
  readonly footPosition_m: Float64Array;
  readonly footVelocity_mps: Float64Array;

  /** Ground force on each foot during the last step, world frame. */
  readonly footGroundForce_N: Float64Array;
  readonly footInContact: Uint8Array;
  /** Material index under each foot (into friction.materials) and its static friction. */
  readonly footMaterial: Int32Array;
  readonly footStaticFriction: Float64Array;
  /** Leg actuator + end-stop force on each foot during the last step, world frame. */
  readonly legForce_N: Float64Array;
  /** Normal force of the ground on the trunk's collision box during the last step. */
  trunkGroundForce_N = 0;
  /** Length of the last (sub)step, s: step_s, or step_s/K inside a landing step. */
  lastStep_s = 0;
  /** The last (sub)step's share of a physics step (1, or 1/K inside a landing step). */
  stepWeight = 1;
  /** Substeps of the last physics step (1 without a landing). */
  substeps = 1;
  /** Integrations done so far, trials undone included (the cost of landing substeps). */
  integrations = 0;

  // Held action (zero-order hold between control ticks).
  private readonly heldGroundForce: Float64Array;
  private readonly heldTarget: Float64Array;
  private readonly heldTargetVelocity: Float64Array;
  private readonly heldStiffness: Float64Array;
  private readonly heldDamping: Float64Array;

  // Constants.
  private readonly hips: Float64Array;
  private readonly trunkMass: number;
  private readonly footMass: number;
  private readonly inertia = new Float64Array(9);
  private readonly inertiaInverse = new Float64Array(9);
  private readonly halfExtents = new Float64Array(3);
  private readonly pushes: PushSchedule;
  /** No patches and no raster: every foot always stands on the default material. */
  private readonly uniformGround: boolean;
  private readonly contactStiffness: number;
  private readonly contactExponent: number;
  private readonly contactDamping: number;
  /** The impact duration of this contact law and foot, t_c = scale·v^exponent (landing.ts). */
  private readonly impactDurationScale: number;
  private readonly impactDurationExponent: number;
  /** Bound on a swing foot's vertical acceleration (leg force limit and gravity), m/s². */
  private readonly footAccelerationBound_mps2: number;

  // Scratch.
  private readonly rotation = new Float64Array(9);
  private readonly friction2 = new Float64Array(2);
  private readonly pushWrench = new Float64Array(6);
  private readonly clock = new Float64Array(1);
  /** (x, y) of each foot at its last material lookup; NaN (never equal) before the first. */
  private readonly lookedUpAt_m: Float64Array;
  /** Length of the previous integration (0 before the first: its kick is then half a step). */
  private previousStep_s = 0;
  /** An action arrived since the last integration (its first step reads the old leg force). */
  private actionIsNew = false;
  private stepCount = 0;
  /** Each foot's acceleration in the last integration (for the start-of-step velocity). */
  private readonly footAcceleration_mps2: Float64Array;
  /** Per foot, in the last integration: friction held it (1) or not, and its start slip speed. */
  private readonly footSticking: Uint8Array;
  private readonly footStartSlip_mps: Float64Array;
  /**
   * State before a trial landing step: trunk p, q, v, ω (13), then per foot p, v, a and the leg's
   * vertical force of the last step (10 per foot).
   */
  private readonly saved: Float64Array;
  private savedPreviousStep_s = 0;
  private savedActionIsNew = false;

  constructor(config: PlantConfig) {
    validatePlantConfig(config);
    const { robot, ground, physics, initial } = config;
    this.robot = robot;
    this.footCount = robot.hips_m.length;
    const n = this.footCount;
    this.step_s = physics.step_s;
    this.trunkMass = robot.trunk.mass_kg;
    this.footMass = robot.foot.mass_kg;
    this.totalMass_kg = this.trunkMass + n * this.footMass;
    gravityOnIncline(this.gravity_mps2, ground.incline_deg.pitch, ground.incline_deg.roll);
    this.friction = new FrictionField(ground.friction);
    this.uniformGround = ground.friction.patches.length === 0 && ground.friction.raster === undefined;
    this.pushes = new PushSchedule(config.pushes);
    this.contactLaw = Object.freeze({ ...ground.contact });
    this.contactStiffness = ground.contact.stiffness_N_per_m;
    this.contactExponent = ground.contact.exponent;
    this.contactDamping = ground.contact.damping_s_per_m;
    // t_c = factor·δmax/v with δmax = ((n+1)·m·v²/(2k))^(1/(n+1)): scale·v^(2/(n+1) − 1).
    this.impactDurationScale = impactDuration_s(this.contactStiffness, this.contactExponent, impactDurationFactor(this.contactExponent), this.footMass, 1);
    this.impactDurationExponent = 2 / (this.contactExponent + 1) - 1;
    const g = this.gravity_mps2;
    this.footAccelerationBound_mps2 = robot.leg.maxForce_N / this.footMass + Math.sqrt(g[0] * g[0] + g[1] * g[1] + g[2] * g[2]);

    this.inertia.set(robot.trunk.inertia_kgm2.flat());
    invertSymmetric3(this.inertiaInverse, this.inertia);
    this.halfExtents.set(robot.trunk.halfExtents_m);
    this.hips = Float64Array.from(robot.hips_m.flat());

    this.footPosition_m = new Float64Array(3 * n);
    this.footVelocity_mps = new Float64Array(3 * n);
    this.footGroundForce_N = new Float64Array(3 * n);
    this.footInContact = new Uint8Array(n);
    this.footMaterial = new Int32Array(n);
    this.footStaticFriction = new Float64Array(n);
    this.lookedUpAt_m = new Float64Array(2 * n).fill(Number.NaN);
    this.legForce_N = new Float64Array(3 * n);
    this.heldGroundForce = new Float64Array(3 * n);
    this.heldTarget = new Float64Array(3 * n);
    this.heldTargetVelocity = new Float64Array(3 * n);
    this.heldStiffness = new Float64Array(n);
    this.heldDamping = new Float64Array(n);
    this.footAcceleration_mps2 = new Float64Array(3 * n);
    this.footSticking = new Uint8Array(n);
    this.footStartSlip_mps = new Float64Array(n);
    this.saved = new Float64Array(13 + SAVED_PER_FOOT * n);

    this.trunkPosition_m.set(initial.position_m);
    const deg = Math.PI / 180;
    quaternionFromRollPitchYaw(this.trunkQuaternion, initial.rpy_deg[0] * deg, initial.rpy_deg[1] * deg, initial.rpy_deg[2] * deg);
    this.trunkVelocity_mps.set(initial.velocity_mps);
    this.trunkAngularVelocity_radps.set(initial.angularVelocity_radps);
    this.placeFeet(initial.feet);
    if (initial.start === 'settled') this.settle();
    this.updateFootMaterials();
  }

  /**
   * The settled start: feet pressed into the ground to the depth whose resting Hunt–Crossley force
   * is their share of the static ground load (the trunk lowered with them), and that load
   * (tangential part included) reported as the last step's ground force, so the first observation
   * already sees loaded, sticking feet.
   */
  private settle(): void {
    // Statics in the plant's own mechanics: the legs act on the trunk at the hips, so the trunk's
    // weight is shared by forces uᵢ at the hips balancing force and moment about its centre; each
    // foot then carries uᵢ plus its own weight. (Moments taken at the feet instead would shift
    // load between feet on a ramp that the plant's trunk never feels.)
    const n = this.footCount;
    const R = matrixFromQuaternion(this.rotation, this.trunkQuaternion);
    const p = this.trunkPosition_m;
    const hips = new Float64Array(3 * n);
    for (let i = 0; i < n; i++) {
      const a = 3 * i;
      const rx = this.hips[a], ry = this.hips[a + 1], rz = this.hips[a + 2];
      for (let r = 0; r < 3; r++) hips[a + r] = p[r] + R[3 * r] * rx + R[3 * r + 1] * ry + R[3 * r + 2] * rz;
    }
    const g = this.gravity_mps2;
    const mt = this.trunkMass;
    const forces = staticSupportForces(hips, p, [mt * g[0], mt * g[1], mt * g[2]]);
    for (let j = 0; j < 3 * n; j++) forces[j] -= this.footMass * g[j % 3];
    // The robot sinks into its contacts with its legs at the length the scenario set: every foot by
    // its own resting depth, the trunk by their mean (a fraction of a millimetre of tilt at most).
    let sunk = 0;
    let loaded = 0;
    for (let i = 0; i < n; i++) {
      const a = 3 * i;
      const normal = forces[a + 2];
      if (!(normal > 0)) continue; // statics would lift this foot: leave it touching, unloaded
      const depth = restingDepth_m(this.contactStiffness, this.contactExponent, normal);
      sunk += depth;
      loaded++;
      this.footPosition_m[a + 2] = -depth;
      this.footGroundForce_N[a] = forces[a];
      this.footGroundForce_N[a + 1] = forces[a + 1];
      this.footGroundForce_N[a + 2] = normal;
      this.footInContact[i] = 1;
    }
    if (loaded > 0) this.trunkPosition_m[2] -= sunk / loaded;
  }

  /** Holds the build's action until the next call. */
  applyAction(action: Action): void {
    // Arrays of one length copied in one loop: per-array loops cost more than the copying itself
    // for a dozen values (measured, docs/bench.md).
    const force = this.heldGroundForce;
    const target = this.heldTarget;
    const targetVelocity = this.heldTargetVelocity;
    const fromForce = action.groundForce_N;
    const fromTarget = action.footTarget_m;
    const fromTargetVelocity = action.footTargetVelocity_mps;
    for (let k = 0; k < force.length; k++) {
      force[k] = fromForce[k];
      target[k] = fromTarget[k];
      targetVelocity[k] = fromTargetVelocity[k];
    }
    const stiffness = this.heldStiffness;
    const damping = this.heldDamping;
    const fromStiffness = action.stiffness_N_per_m;
    const fromDamping = action.damping_Ns_per_m;
    for (let i = 0; i < stiffness.length; i++) {
      stiffness[i] = fromStiffness[i];
      damping[i] = fromDamping[i];
    }
    this.actionIsNew = true;
  }

  /**
   * Advances by one physics step (cut into substeps when a foot lands in it). `observer`, when
   * given, has afterSubstep() called after every substep with the plant's state at its end (lastStep_s and
   * stepWeight say its length and share); a step without a landing calls it once. Throws
   * PlantDivergedError on a non-finite state.
   */
  step(observer?: SubstepObserver): void {
    const h = this.step_s;
    const start_s = this.time_s;
    const mayLand = this.mayChangeContact();
    if (mayLand) this.saveState();
    this.substeps = 1;
    this.lastStep_s = h;
    this.stepWeight = 1;
    this.advance();
    const k = mayLand ? this.landingSubstepsOfTrial() : 1;
    if (k > 1) {
      this.restoreState();
      const hk = h / k;
      this.substeps = k;
      this.lastStep_s = hk;
      this.stepWeight = 1 / k;
      for (let j = 0; j < k; j++) {
        this.time_s = start_s + (j / k) * h;
        this.advance();
        if (j < k - 1) {
          this.time_s = start_s + ((j + 1) / k) * h;
          if (observer !== undefined) observer.afterSubstep();
        }
      }
    }
    // Time from the step count, so that long runs do not accumulate rounding (8 s, not 7.99999…).
    this.stepCount++;
    this.time_s = this.stepCount * h;
    if (observer !== undefined) observer.afterSubstep();
  }

  /**
   * Whether a foot can cross the ground plane within a step of h (it is within the reach of its
   * velocity and the largest acceleration its leg and gravity give it), or is sliding and may be
   * stopped. Only then is the state saved for a trial (a foot sticking in stance or high in swing
   * costs nothing).
   */
  private mayChangeContact(): boolean {
    const h = this.step_s;
    const fp = this.footPosition_m;
    const fv = this.footVelocity_mps;
    const reach = h * h * this.footAccelerationBound_mps2;
    for (let i = 0; i < this.footCount; i++) {
      const z = fp[3 * i + 2];
      const next = z + h * fv[3 * i + 2];
      if (z >= 0 ? next - reach < 0 : next + reach >= 0) return true;
      if (z < 0 && fv[3 * i] * fv[3 * i] + fv[3 * i + 1] * fv[3 * i + 1] > STOP_SPEED_mps * STOP_SPEED_mps) return true;
    }
    return false;
  }

  /**
   * After a trial step of h: K for its contact events (1 when there were none). A foot that went
   * from z ≥ 0 to z < 0 lands, one that went the other way lifts off: K from the impact duration
   * at its normal speed (landing.ts). A foot sliding faster than STOP_SPEED_mps that friction
   * stopped in the trial is retaken at the finest substep: where in the step it stops sets how
   * far it slid, which the whole step would put at its start (no slide at all).
   */
  private landingSubstepsOfTrial(): number {
    const h = this.step_s;
    const saved = this.saved;
    const fp = this.footPosition_m;
    const fv = this.footVelocity_mps;
    let k = 1;
    for (let i = 0; i < this.footCount; i++) {
      const before = saved[13 + SAVED_PER_FOOT * i + 2];
      const after = fp[3 * i + 2];
      // A landing is the step of touch-down and the steps after it in which the contact's elastic
      // force more than doubles (a Hertz impact's first ≈ 1.7 steps: the force at the step's start
      // is held over the step, so a landing late in its step meets the rise in the next one).
      const lands = after < 0 && (before >= 0 || (after < before && Math.pow(after / before, this.contactExponent) > LANDING_FORCE_RATIO));
      if (!lands && !(before < 0 && after >= 0)) {
        if (this.footInContact[i] === 1 && this.slideChangedFast(i)) k = MAX_LANDING_SUBSTEPS;
        continue;
      }
      // Landing: the trial's kick saw no ground force on this foot (it was above the ground), so
      // its velocity is the approach velocity. Lift-off: the speed it leaves with.
      // landing.ts's rule written out (no double crosses a call, which would box it): t_c =
      // factor·δmax/v = durationScale·v^durationExponent, then the smallest power of two K with
      // h/K ≤ t_c/SUBSTEPS_PER_IMPACT, at most MAX_LANDING_SUBSTEPS (also when v ≤ 0).
      const speed_mps = lands ? -fv[3 * i + 2] : fv[3 * i + 2];
      const limit_s = speed_mps > 0 ? (this.impactDurationScale * Math.pow(speed_mps, this.impactDurationExponent)) / SUBSTEPS_PER_IMPACT : 0;
      let footK = 1;
      while (footK < MAX_LANDING_SUBSTEPS && !(h / footK <= limit_s)) footK *= 2;
      if (footK > k) k = footK;
    }
    return k;
  }

  /**
   * Whether foot i, sliding faster than STOP_SPEED_mps at the trial's start, was stopped by friction
   * or changed its slip speed by more than SLIDE_CHANGE_FRACTION in the trial: the step after a
   * landing, in which the normal force jumps from a few newtons to hundreds and friction takes
   * most of the foot's tangential speed, is such a step.
   */
  private slideChangedFast(i: number): boolean {
    const start_mps = this.footStartSlip_mps[i];
    if (!(start_mps > STOP_SPEED_mps)) return false;
    if (this.footSticking[i] === 1) return true;
    const vx = this.footVelocity_mps[3 * i];
    const vy = this.footVelocity_mps[3 * i + 1];
    return Math.abs(Math.sqrt(vx * vx + vy * vy) - start_mps) > SLIDE_CHANGE_FRACTION * start_mps;
  }

  private saveState(): void {
    const s = this.saved;
    s.set(this.trunkPosition_m, 0);
    s.set(this.trunkQuaternion, 3);
    s.set(this.trunkVelocity_mps, 7);
    s.set(this.trunkAngularVelocity_radps, 10);
    for (let i = 0; i < this.footCount; i++) {
      const b = 13 + SAVED_PER_FOOT * i;
      for (let c = 0; c < 3; c++) {
        s[b + c] = this.footPosition_m[3 * i + c];
        s[b + 3 + c] = this.footVelocity_mps[3 * i + c];
        s[b + 6 + c] = this.footAcceleration_mps2[3 * i + c];
      }
      s[b + 9] = this.legForce_N[3 * i + 2];
    }
    this.savedPreviousStep_s = this.previousStep_s;
    this.savedActionIsNew = this.actionIsNew;
  }

  private restoreState(): void {
    const s = this.saved;
    for (let c = 0; c < 3; c++) {
      this.trunkPosition_m[c] = s[c];
      this.trunkVelocity_mps[c] = s[7 + c];
      this.trunkAngularVelocity_radps[c] = s[10 + c];
    }
    for (let c = 0; c < 4; c++) this.trunkQuaternion[c] = s[3 + c];
    for (let i = 0; i < this.footCount; i++) {
      const b = 13 + SAVED_PER_FOOT * i;
      for (let c = 0; c < 3; c++) {
        this.footPosition_m[3 * i + c] = s[b + c];
        this.footVelocity_mps[3 * i + c] = s[b + 3 + c];
        this.footAcceleration_mps2[3 * i + c] = s[b + 6 + c];
      }
      this.legForce_N[3 * i + 2] = s[b + 9];
    }
    this.previousStep_s = this.savedPreviousStep_s;
    this.actionIsNew = this.savedActionIsNew;
    this.updateFootMaterials();
  }

  /**
   * One integration of length lastStep_s from the current state (time_s is its start). No
   * argument: a double passed to a call V8 does not inline is boxed (DEVELOPERS.md, the plant).
   */
  private advance(): void {
    const h = this.lastStep_s;
    const kick = 0.5 * (this.previousStep_s + h);
    const R = matrixFromQuaternion(this.rotation, this.trunkQuaternion);
    const p = this.trunkPosition_m;
    const v = this.trunkVelocity_mps;
    const w = this.trunkAngularVelocity_radps;
    const g = this.gravity_mps2;
    const gx = g[0];
    const gy = g[1];
    const gz = g[2];
    const leg = this.robot.leg;
    const maxForce = leg.maxForce_N;
    const footMass = this.footMass;
    const materials = this.friction.materials;

    let trunkFx = this.trunkMass * gx;
    let trunkFy = this.trunkMass * gy;
    let trunkFz = this.trunkMass * gz;
    let torqueX = 0;
    let torqueY = 0;
    let torqueZ = 0;

    const fp = this.footPosition_m;
    const fv = this.footVelocity_mps;
    const acc = this.footAcceleration_mps2;
    const halfPrevious = 0.5 * this.previousStep_s;
    for (let i = 0; i < this.footCount; i++) {
      const a = 3 * i;
      // Hip in world: ph = p + R·r; hip velocity: v + R·(ω × r) (ω in body frame).
      const rx = this.hips[a];
      const ry = this.hips[a + 1];
      const rz = this.hips[a + 2];
      const rwx = R[0] * rx + R[1] * ry + R[2] * rz;
      const rwy = R[3] * rx + R[4] * ry + R[5] * rz;
      const rwz = R[6] * rx + R[7] * ry + R[8] * rz;
      const cbx = w[1] * rz - w[2] * ry;
      const cby = w[2] * rx - w[0] * rz;
      const cbz = w[0] * ry - w[1] * rx;
      const relX = fp[a] - (p[0] + rwx);
      const relY = fp[a + 1] - (p[1] + rwy);
      const relZ = fp[a + 2] - (p[2] + rwz);
      const vrelX = fv[a] - (v[0] + R[0] * cbx + R[1] * cby + R[2] * cbz);
      const vrelY = fv[a + 1] - (v[1] + R[3] * cbx + R[4] * cby + R[5] * cbz);
      const vrelZ = fv[a + 2] - (v[2] + R[6] * cbx + R[7] * cby + R[8] * cbz);

      // Impedance toward the target, in the trunk frame (Rᵀ·rel).
      const kp = this.heldStiffness[i];
      const kd = this.heldDamping[i];
      let legX = -this.heldGroundForce[a];
      let legY = -this.heldGroundForce[a + 1];
      let legZ = -this.heldGroundForce[a + 2];
      if (kp !== 0 || kd !== 0) {
        const bx = kp * (this.heldTarget[a] - (R[0] * relX + R[3] * relY + R[6] * relZ)) +
          kd * (this.heldTargetVelocity[a] - (R[0] * vrelX + R[3] * vrelY + R[6] * vrelZ));
        const by = kp * (this.heldTarget[a + 1] - (R[1] * relX + R[4] * relY + R[7] * relZ)) +
          kd * (this.heldTargetVelocity[a + 1] - (R[1] * vrelX + R[4] * vrelY + R[7] * vrelZ));
        const bz = kp * (this.heldTarget[a + 2] - (R[2] * relX + R[5] * relY + R[8] * relZ)) +
          kd * (this.heldTargetVelocity[a + 2] - (R[2] * vrelX + R[5] * vrelY + R[8] * vrelZ));
        legX += R[0] * bx + R[1] * by + R[2] * bz;
        legY += R[3] * bx + R[4] * by + R[5] * bz;
        legZ += R[6] * bx + R[7] * by + R[8] * bz;
      }
      const legMagnitude = Math.sqrt(legX * legX + legY * legY + legZ * legZ);
      if (legMagnitude > maxForce) {
        const s = maxForce / legMagnitude;
        legX *= s;
        legY *= s;
        legZ *= s;
      }
      // Mechanical end-stop along the leg, one-sided (it pushes back, never pulls).
      const length = Math.sqrt(relX * relX + relY * relY + relZ * relZ);
      if (length > 1e-9 && (length > leg.maxLength_m || length < leg.minLength_m)) {
        const ux = relX / length;
        const uy = relY / length;
        const uz = relZ / length;
        const lengthRate = ux * vrelX + uy * vrelY + uz * vrelZ;
        let along = 0;
        if (length > leg.maxLength_m) {
          along = -(leg.endStopStiffness_N_per_m * (length - leg.maxLength_m) + leg.endStopDamping_Ns_per_m * lengthRate);
          if (along > 0) along = 0;
        } else {
          along = leg.endStopStiffness_N_per_m * (leg.minLength_m - length) - leg.endStopDamping_Ns_per_m * lengthRate;
          if (along < 0) along = 0;
        }
        legX += along * ux;
        legY += along * uy;
        legZ += along * uz;
      }
      // The leg's vertical force the contact reads the foot's acceleration with: this step's, but
      // the last step's on the first step of a new action (a change of the held action at this
      // tick acts from now on, not half a step back).
      const contactLegZ = this.actionIsNew ? this.legForce_N[a + 2] : legZ;
      this.legForce_N[a] = legX;
      this.legForce_N[a + 1] = legY;
      this.legForce_N[a + 2] = legZ;

      // The leg pushes the trunk back at the hip.
      trunkFx -= legX;
      trunkFy -= legY;
      trunkFz -= legZ;
      torqueX -= rwy * legZ - rwz * legY;
      torqueY -= rwz * legX - rwx * legZ;
      torqueZ -= rwx * legY - rwy * legX;

      // Ground, read at the start-of-step foot velocity (second order, see the header): the
      // normal damping solved with this step's own acceleration, the slip speed extrapolated.
      const nowX = fv[a] + halfPrevious * acc[a];
      const nowY = fv[a + 1] + halfPrevious * acc[a + 1];
      const normal = huntCrossleyNormalAtStart_N(
        this.contactStiffness,
        this.contactExponent,
        this.contactDamping,
        -fp[a + 2],
        fv[a + 2],
        contactLegZ + footMass * gz,
        footMass,
        halfPrevious,
      );
      let groundX = 0;
      let groundY = 0;
      if (normal > 0) {
        const m = this.footMaterial[i];
        this.footInContact[i] = 1;
        const slip_mps = Math.sqrt(nowX * nowX + nowY * nowY);
        this.footStartSlip_mps[i] = slip_mps;
        this.footSticking[i] = footFriction(
          this.friction2,
          footMass,
          kick,
          fv[a],
          fv[a + 1],
          legX + footMass * gx,
          legY + footMass * gy,
          normal,
          materials.staticFriction[m],
          materials.kineticFriction[m],
          materials.stribeckVelocity_mps[m],
          materials.stribeckExponent[m],
          materials.viscous_Ns_per_m[m],
          slip_mps,
        );
        groundX = this.friction2[0];
        groundY = this.friction2[1];
      } else {
        this.footInContact[i] = 0;
        this.footSticking[i] = 0;
      }
      this.footGroundForce_N[a] = groundX;
      this.footGroundForce_N[a + 1] = groundY;
      this.footGroundForce_N[a + 2] = normal;

      acc[a] = (legX + groundX) / footMass + gx;
      acc[a + 1] = (legY + groundY) / footMass + gy;
      acc[a + 2] = (legZ + normal) / footMass + gz;
      fv[a] += kick * acc[a];
      fv[a + 1] += kick * acc[a + 1];
      fv[a + 2] += kick * acc[a + 2];
      fp[a] += h * fv[a];
      fp[a + 1] += h * fv[a + 1];
      fp[a + 2] += h * fv[a + 2];
    }

    // Pushes at points fixed in the trunk frame.
    if (this.pushes.size > 0) {
      const wrench = this.pushWrench;
      this.clock[0] = this.time_s;
      this.pushes.wrenchAt(wrench, this.clock, R);
      trunkFx += wrench[0];
      trunkFy += wrench[1];
      trunkFz += wrench[2];
      torqueX += wrench[3];
      torqueY += wrench[4];
      torqueZ += wrench[5];
    }

    // Trunk box on the ground (a fall): corners only, and only when the lowest corner is below the
    // ground — its height is the centre's minus the box's support along world z (exact, 3 products).
    this.trunkGroundForce_N = 0;
    const he0 = this.halfExtents[0];
    const he1 = this.halfExtents[1];
    const he2 = this.halfExtents[2];
    const lowestCorner_m = p[2] - (Math.abs(R[6]) * he0 + Math.abs(R[7]) * he1 + Math.abs(R[8]) * he2);
    if (lowestCorner_m < 0) {
      const he = this.halfExtents;
      for (let c = 0; c < 8; c++) {
        const bx = c & 1 ? he[0] : -he[0];
        const by = c & 2 ? he[1] : -he[1];
        const bz = c & 4 ? he[2] : -he[2];
        const ax = R[0] * bx + R[1] * by + R[2] * bz;
        const ay = R[3] * bx + R[4] * by + R[5] * bz;
        const az = R[6] * bx + R[7] * by + R[8] * bz;
        const z = p[2] + az;
        if (z >= 0) continue;
        const wbx = w[1] * bz - w[2] * by;
        const wby = w[2] * bx - w[0] * bz;
        const wbz = w[0] * by - w[1] * bx;
        const cvx = v[0] + R[0] * wbx + R[1] * wby + R[2] * wbz;
        const cvy = v[1] + R[3] * wbx + R[4] * wby + R[5] * wbz;
        const cvz = v[2] + R[6] * wbx + R[7] * wby + R[8] * wbz;
        const normal = huntCrossleyNormal_N(this.contactStiffness, this.contactExponent, this.contactDamping, -z, -cvz);
        if (normal <= 0) continue;
        const m = this.friction.lookup(p[0] + ax, p[1] + ay);
        const speed = Math.sqrt(cvx * cvx + cvy * cvy + TRUNK_FRICTION_SPEED_mps * TRUNK_FRICTION_SPEED_mps);
        const scale = (-materials.kineticFriction[m] * normal) / speed;
        const fx = scale * cvx;
        const fy = scale * cvy;
        trunkFx += fx;
        trunkFy += fy;
        trunkFz += normal;
        torqueX += ay * normal - az * fy;
        torqueY += az * fx - ax * normal;
        torqueZ += ax * fy - ay * fx;
        this.trunkGroundForce_N += normal;
      }
    }

    // Trunk translation (leapfrog).
    const kickPerTrunkMass = kick / this.trunkMass;
    v[0] += kickPerTrunkMass * trunkFx;
    v[1] += kickPerTrunkMass * trunkFy;
    v[2] += kickPerTrunkMass * trunkFz;
    p[0] += h * v[0];
    p[1] += h * v[1];
    p[2] += h * v[2];

    // Trunk rotation, split like the translation: a kick of the body angular momentum by the
    // torque of this configuration, then the torque-free rotor over the whole step.
    const I = this.inertia;
    const Ii = this.inertiaInverse;
    const tbx = kick * (R[0] * torqueX + R[3] * torqueY + R[6] * torqueZ);
    const tby = kick * (R[1] * torqueX + R[4] * torqueY + R[7] * torqueZ);
    const tbz = kick * (R[2] * torqueX + R[5] * torqueY + R[8] * torqueZ);
    const Lx = I[0] * w[0] + I[1] * w[1] + I[2] * w[2] + tbx;
    const Ly = I[3] * w[0] + I[4] * w[1] + I[5] * w[2] + tby;
    const Lz = I[6] * w[0] + I[7] * w[1] + I[8] * w[2] + tbz;
    w[0] = Ii[0] * Lx + Ii[1] * Ly + Ii[2] * Lz;
    w[1] = Ii[3] * Lx + Ii[4] * Ly + Ii[5] * Lz;
    w[2] = Ii[6] * Lx + Ii[7] * Ly + Ii[8] * Lz;
    this.integrateFreeRotation();

    this.previousStep_s = h;
    this.actionIsNew = false;
    this.integrations++;
    this.updateFootMaterials();
    this.checkFinite();
  }

  /** Copies the plant's truth into an observation (the run layer adds noise and estimates). */
  fillObservation(obs: RobotState): void {
    obs.time_s = this.time_s;
    // Arrays of one length in one loop (applyAction).
    const position = obs.trunkPosition_m;
    const velocity = obs.trunkVelocity_mps;
    const angular = obs.trunkAngularVelocity_radps;
    const fromPosition = this.trunkPosition_m;
    const fromVelocity = this.trunkVelocity_mps;
    const fromAngular = this.trunkAngularVelocity_radps;
    for (let c = 0; c < 3; c++) {
      position[c] = fromPosition[c];
      velocity[c] = fromVelocity[c];
      angular[c] = fromAngular[c];
    }
    const quaternion = obs.trunkQuaternion;
    const fromQuaternion = this.trunkQuaternion;
    for (let c = 0; c < 4; c++) quaternion[c] = fromQuaternion[c];
    const footPosition = obs.footPosition_m;
    const footVelocity = obs.footVelocity_mps;
    const footForce = obs.footForce_N;
    const fromFootPosition = this.footPosition_m;
    const fromFootVelocity = this.footVelocity_mps;
    const fromFootForce = this.footGroundForce_N;
    for (let k = 0; k < footPosition.length; k++) {
      footPosition[k] = fromFootPosition[k];
      footVelocity[k] = fromFootVelocity[k];
      footForce[k] = fromFootForce[k];
    }
    const contact = obs.footContact;
    const fromContact = this.footInContact;
    for (let i = 0; i < contact.length; i++) contact[i] = fromContact[i];
  }

  /**
   * The torque-free rotor over one step of h: classical RK4 on Euler's equations I·ω̇ = −ω × Iω and the
   * quaternion kinematics q̇ = ½·q ⊗ (0, ω), then renormalised. Its error per step is O((|ω|h)⁵),
   * ~1e-14 at the default step, so the kick–rotor splitting keeps the symplectic character of an
   * exact free flow. The four stage evaluations are written out with every value in a local
   * variable: no stage arrays, and no double crosses a call boundary (which would box it).
   */
  private integrateFreeRotation(): void {
    const h = this.lastStep_s;
    const half = 0.5 * h;
    const q = this.trunkQuaternion;
    const w = this.trunkAngularVelocity_radps;
    const I = this.inertia;
    const Ii = this.inertiaInverse;
    const I0 = I[0], I1 = I[1], I2 = I[2], I3 = I[3], I4 = I[4], I5 = I[5], I6 = I[6], I7 = I[7], I8 = I[8];
    const J0 = Ii[0], J1 = Ii[1], J2 = Ii[2], J3 = Ii[3], J4 = Ii[4], J5 = Ii[5], J6 = Ii[6], J7 = Ii[7], J8 = Ii[8];
    const q0 = q[0], q1 = q[1], q2 = q[2], q3 = q[3], w0 = w[0], w1 = w[1], w2 = w[2];

    // Stage 1 at (q, ω).
    let lx = I0 * w0 + I1 * w1 + I2 * w2, ly = I3 * w0 + I4 * w1 + I5 * w2, lz = I6 * w0 + I7 * w1 + I8 * w2;
    let ex = -(w1 * lz - w2 * ly), ey = -(w2 * lx - w0 * lz), ez = -(w0 * ly - w1 * lx);
    const a0 = -0.5 * (q1 * w0 + q2 * w1 + q3 * w2), a1 = 0.5 * (q0 * w0 + q2 * w2 - q3 * w1);
    const a2 = 0.5 * (q0 * w1 + q3 * w0 - q1 * w2), a3 = 0.5 * (q0 * w2 + q1 * w1 - q2 * w0);
    const a4 = J0 * ex + J1 * ey + J2 * ez, a5 = J3 * ex + J4 * ey + J5 * ez, a6 = J6 * ex + J7 * ey + J8 * ez;

    // Stage 2 at the half step along stage 1.
    let pw = q0 + half * a0, px = q1 + half * a1, py = q2 + half * a2, pz = q3 + half * a3;
    let vx = w0 + half * a4, vy = w1 + half * a5, vz = w2 + half * a6;
    lx = I0 * vx + I1 * vy + I2 * vz; ly = I3 * vx + I4 * vy + I5 * vz; lz = I6 * vx + I7 * vy + I8 * vz;
    ex = -(vy * lz - vz * ly); ey = -(vz * lx - vx * lz); ez = -(vx * ly - vy * lx);
    const b0 = -0.5 * (px * vx + py * vy + pz * vz), b1 = 0.5 * (pw * vx + py * vz - pz * vy);
    const b2 = 0.5 * (pw * vy + pz * vx - px * vz), b3 = 0.5 * (pw * vz + px * vy - py * vx);
    const b4 = J0 * ex + J1 * ey + J2 * ez, b5 = J3 * ex + J4 * ey + J5 * ez, b6 = J6 * ex + J7 * ey + J8 * ez;

    // Stage 3 at the half step along stage 2.
    pw = q0 + half * b0; px = q1 + half * b1; py = q2 + half * b2; pz = q3 + half * b3;
    vx = w0 + half * b4; vy = w1 + half * b5; vz = w2 + half * b6;
    lx = I0 * vx + I1 * vy + I2 * vz; ly = I3 * vx + I4 * vy + I5 * vz; lz = I6 * vx + I7 * vy + I8 * vz;
    ex = -(vy * lz - vz * ly); ey = -(vz * lx - vx * lz); ez = -(vx * ly - vy * lx);
    const c0 = -0.5 * (px * vx + py * vy + pz * vz), c1 = 0.5 * (pw * vx + py * vz - pz * vy);
    const c2 = 0.5 * (pw * vy + pz * vx - px * vz), c3 = 0.5 * (pw * vz + px * vy - py * vx);
    const c4 = J0 * ex + J1 * ey + J2 * ez, c5 = J3 * ex + J4 * ey + J5 * ez, c6 = J6 * ex + J7 * ey + J8 * ez;

    // Stage 4 at the full step along stage 3.
    pw = q0 + h * c0; px = q1 + h * c1; py = q2 + h * c2; pz = q3 + h * c3;
    vx = w0 + h * c4; vy = w1 + h * c5; vz = w2 + h * c6;
    lx = I0 * vx + I1 * vy + I2 * vz; ly = I3 * vx + I4 * vy + I5 * vz; lz = I6 * vx + I7 * vy + I8 * vz;
    ex = -(vy * lz - vz * ly); ey = -(vz * lx - vx * lz); ez = -(vx * ly - vy * lx);
    const d0 = -0.5 * (px * vx + py * vy + pz * vz), d1 = 0.5 * (pw * vx + py * vz - pz * vy);
    const d2 = 0.5 * (pw * vy + pz * vx - px * vz), d3 = 0.5 * (pw * vz + px * vy - py * vx);
    const d4 = J0 * ex + J1 * ey + J2 * ez, d5 = J3 * ex + J4 * ey + J5 * ez, d6 = J6 * ex + J7 * ey + J8 * ez;

    const sixth = h / 6;
    const nw = q0 + sixth * (a0 + 2 * b0 + 2 * c0 + d0);
    const nx = q1 + sixth * (a1 + 2 * b1 + 2 * c1 + d1);
    const ny = q2 + sixth * (a2 + 2 * b2 + 2 * c2 + d2);
    const nz = q3 + sixth * (a3 + 2 * b3 + 2 * c3 + d3);
    w[0] = w0 + sixth * (a4 + 2 * b4 + 2 * c4 + d4);
    w[1] = w1 + sixth * (a5 + 2 * b5 + 2 * c5 + d5);
    w[2] = w2 + sixth * (a6 + 2 * b6 + 2 * c6 + d6);
    const norm = Math.sqrt(nw * nw + nx * nx + ny * ny + nz * nz);
    q[0] = nw / norm;
    q[1] = nx / norm;
    q[2] = ny / norm;
    q[3] = nz / norm;
  }

  private placeFeet(feet: PlantConfig['initial']['feet']): void {
    const R = matrixFromQuaternion(this.rotation, this.trunkQuaternion);
    const p = this.trunkPosition_m;
    const v = this.trunkVelocity_mps;
    const w = this.trunkAngularVelocity_radps;
    for (let i = 0; i < this.footCount; i++) {
      const a = 3 * i;
      const rx = this.hips[a];
      const ry = this.hips[a + 1];
      const rz = this.hips[a + 2];
      if (feet === 'standing') {
        this.footPosition_m[a] = p[0] + R[0] * rx + R[1] * ry + R[2] * rz;
        this.footPosition_m[a + 1] = p[1] + R[3] * rx + R[4] * ry + R[5] * rz;
        this.footPosition_m[a + 2] = 0;
      } else {
        this.footPosition_m.set(feet[i], a);
      }
      const cbx = w[1] * rz - w[2] * ry;
      const cby = w[2] * rx - w[0] * rz;
      const cbz = w[0] * ry - w[1] * rx;
      this.footVelocity_mps[a] = v[0] + R[0] * cbx + R[1] * cby + R[2] * cbz;
      this.footVelocity_mps[a + 1] = v[1] + R[3] * cbx + R[4] * cby + R[5] * cbz;
      this.footVelocity_mps[a + 2] = v[2] + R[6] * cbx + R[7] * cby + R[8] * cbz;
    }
  }

  /**
   * The material under each foot. A foot whose (x, y) is exactly where it was at its last lookup
   * (a sticking foot, a foot held still) stands on the same material: the lookup is skipped.
   */
  private updateFootMaterials(): void {
    if (this.uniformGround && this.stepCount > 0) return; // one material everywhere: nothing moves
    const mus = this.friction.materials.staticFriction;
    const fp = this.footPosition_m;
    const seen = this.lookedUpAt_m;
    for (let i = 0; i < this.footCount; i++) {
      const a = 3 * i;
      if (fp[a] === seen[2 * i] && fp[a + 1] === seen[2 * i + 1]) continue;
      seen[2 * i] = fp[a];
      seen[2 * i + 1] = fp[a + 1];
      const m = this.friction.lookupAt(fp, a);
      this.footMaterial[i] = m;
      this.footStaticFriction[i] = mus[m];
    }
  }

  /** Called at the end of an integration: the error reports that time (its start + its length). */
  private checkFinite(): void {
    const p = this.trunkPosition_m;
    const v = this.trunkVelocity_mps;
    const w = this.trunkAngularVelocity_radps;
    const q = this.trunkQuaternion;
    let sum = p[0] + p[1] + p[2] + v[0] + v[1] + v[2] + w[0] + w[1] + w[2] + q[0] + q[1] + q[2] + q[3];
    for (let j = 0; j < this.footPosition_m.length; j++) sum += this.footPosition_m[j] + this.footVelocity_mps[j];
    if (Number.isFinite(sum)) return;
    throw new PlantDivergedError(this.time_s + this.lastStep_s, this.firstNonFinite());
  }

  private firstNonFinite(): string {
    const named: [string, Float64Array][] = [
      ['trunk position', this.trunkPosition_m],
      ['trunk orientation', this.trunkQuaternion],
      ['trunk velocity', this.trunkVelocity_mps],
      ['trunk angular velocity', this.trunkAngularVelocity_radps],
      ['foot position', this.footPosition_m],
      ['foot velocity', this.footVelocity_mps],
    ];
    for (const [name, values] of named) {
      const j = values.findIndex((x) => !Number.isFinite(x));
      if (j >= 0) return values.length > 4 ? `${name} of foot ${Math.floor(j / 3)} (component ${'xyz'[j % 3]})` : `${name} (component ${j})`;
    }
    return 'state';
  }
}
