// Plain-data descriptions the plant is built from. These are the resolved, unit-carrying values a
// scenario loader produces; the plant validates them again when it is built (see validate.ts).

export type Vec3 = [number, number, number];

/** A robot: rigid trunk, N point-mass feet on massless leg actuators fixed at hips. */
/** Told after every physics step or landing substep (Plant.step); reads the plant in place. */
export interface SubstepObserver {
  afterSubstep(): void;
}

export interface RobotParams {
  id: string;
  name: string;
  trunk: {
    mass_kg: number;
    /** Full 3×3 inertia about the trunk's centre of mass, trunk frame, row-major. */
    inertia_kgm2: [Vec3, Vec3, Vec3];
    /** Half extents of the trunk's collision box (trunk frame); used for ground contact and falls. */
    halfExtents_m: Vec3;
  };
  /** Hip attachment points in the trunk frame, one per foot (order = foot index). */
  hips_m: Vec3[];
  /**
   * Optional label per leg, same order and count as hips_m (e.g. FL, FR, HL, HR), for the report's
   * plots. Part of the scenario hash like the robot's name (a renamed leg makes new results
   * incomparable with older ones, as a renamed robot does).
   */
  legNames?: string[];
  foot: {
    mass_kg: number;
    /** Radius of the foot's spherical tip, m; with `material`, the contact law follows Hertz. */
    radius_m?: number;
    material?: FootMaterial;
  };
  leg: {
    minLength_m: number;
    maxLength_m: number;
    /** Saturation of the actuator force |F| (feed-forward + impedance), per leg. */
    maxForce_N: number;
    /** Mechanical end-stop outside [minLength, maxLength]: a stiff spring and damper along the leg. */
    endStopStiffness_N_per_m: number;
    endStopDamping_Ns_per_m: number;
  };
  /** Nominal height of the trunk's centre above the ground when standing. */
  standingHeight_m: number;
  /** Gait timing hints for controllers. */
  gait: { period_s: number; dutyFactor: number; swingApex_m: number };
}

/** Elastic and impact data of a foot's material (harness/plant/contactLaw.ts). */
export interface FootMaterial {
  name?: string;
  elasticModulus_Pa: number;
  poissonRatio: number;
  /** Coefficient of restitution of the foot on the floor at restitutionSpeed_mps. */
  restitution: number;
  restitutionSpeed_mps: number;
}

/** One ground material: Stribeck friction parameters (Armstrong-Hélouvry et al. 1994). */
export interface Material {
  name: string;
  staticFriction: number;
  kineticFriction: number;
  stribeckVelocity_mps: number;
  stribeckExponent: number;
  viscous_Ns_per_m: number;
}

export type PatchShape =
  | { kind: 'rect'; min_m: [number, number]; max_m: [number, number] }
  | { kind: 'circle'; center_m: [number, number]; radius_m: number }
  | { kind: 'polygon'; vertices_m: [number, number][] };

export interface Patch {
  name: string;
  shape: PatchShape;
  /** Fully resolved material (unspecified fields already inherited from the default). */
  material: Material;
}

/** A grid of materials; cell (i, j) covers x ∈ origin.x + [i, i+1)·cell, y ∈ origin.y + [j, j+1)·cell. */
export interface Raster {
  origin_m: [number, number];
  cell_m: number;
  /** Indexed [i][j] = [x index][y index]. Cells inherit unspecified fields from the default. */
  staticFriction: number[][];
  kineticFriction: number[][];
}

export interface FrictionMap {
  default: Material;
  /** Later patches win where they overlap; patches win over the raster. */
  patches: Patch[];
  raster?: Raster;
}

/** Hunt–Crossley normal law f_n = k·δⁿ·(1 + (3/2)·c·δ̇) (Hunt & Crossley 1975). */
export interface ContactLaw {
  /** k, in N/mⁿ (N/m when n = 1). */
  stiffness_N_per_m: number;
  exponent: number;
  /** c, the Hunt–Crossley damping, in s/m (restitution: the exact relation in contactLaw.ts). */
  damping_s_per_m: number;
}

export interface GroundParams {
  /** The ground is the plane z = 0 of the world frame; an incline tilts gravity instead. */
  incline_deg: { pitch: number; roll: number };
  contact: ContactLaw;
  friction: FrictionMap;
}

/** An external force on the trunk, applied at a point given in the trunk frame. */
export type Push =
  | {
      kind: 'pulse';
      shape: 'rect' | 'halfSine';
      at_s: number;
      duration_s: number;
      force_N: Vec3;
      point_m: Vec3;
    }
  | {
      kind: 'series';
      /** Strictly increasing sample times; force is linear between samples, zero outside. */
      t_s: number[];
      force_N: Vec3[];
      point_m: Vec3;
    };

export interface PhysicsParams {
  step_s: number;
}

/**
 * How a run begins (docs/scenarios.md, "Start"):
 * - 'settled': at rest in static equilibrium under gravity: feet under the hips, each pressed into
 *   the ground to the depth that carries its share of the weight (harness/plant/settle.ts), the
 *   first observation already showing those loads. Needs standing feet and zero velocities.
 * - 'released': the feet as given (or touching the ground unloaded when standing), the trunk
 *   released with its initial velocities: it drops onto the contacts. For drop and impact tests.
 */
export type StartMode = 'settled' | 'released';

/** Initial state of the robot. Feet "standing" are placed under the hips on the ground. */
export interface InitialState {
  start: StartMode;
  position_m: Vec3;
  rpy_deg: Vec3;
  velocity_mps: Vec3;
  angularVelocity_radps: Vec3;
  /** 'standing' or explicit world positions, one per foot. */
  feet: 'standing' | Vec3[];
}

export interface PlantConfig {
  robot: RobotParams;
  ground: GroundParams;
  pushes: Push[];
  physics: PhysicsParams;
  initial: InitialState;
}
