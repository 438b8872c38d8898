// The shape of a version-1 file once it has passed scenario.schema.json / robot.schema.json.
// Optional fields are optional here exactly as in the schema; defaults.ts fills them.

import type { GaitName } from '../contract/tick.js';
import type { Elastic } from '../plant/contactLaw.js';
import type { RobotParams, StartMode, Vec3 } from '../plant/types.js';

export const SCENARIO_FORMAT = 'footing-scenario';
export const ROBOT_FORMAT = 'footing-robot';

export type Vec2 = [number, number];

/** A robot file is the plant's RobotParams plus the file's own header fields. */
export interface RobotFile extends RobotParams {
  $schema?: string;
  format?: typeof ROBOT_FORMAT;
  formatVersion?: 1;
  description?: string;
}

export interface MaterialFile {
  name?: string;
  staticFriction?: number;
  kineticFriction?: number;
  stribeckVelocity_mps?: number;
  stribeckExponent?: number;
  viscous_Ns_per_m?: number;
  /** Elastic data of the floor (only on the ground's own material): enters Hertz's law. */
  elastic?: Elastic;
}

export interface PatchFile {
  name?: string;
  rect?: { min_m: Vec2; max_m: Vec2 };
  circle?: { center_m: Vec2; radius_m: number };
  polygon_m?: Vec2[];
  material: MaterialFile;
}

export interface RasterFile {
  origin_m: Vec2;
  cell_m: number;
  staticFriction?: number[][];
  kineticFriction?: number[][];
  file?: string;
}

export interface CommandFile {
  at_s: number;
  gait: GaitName;
  velocity_mps?: Vec3;
  yawRate_radps?: number;
}

export interface PulsePushFile {
  at_s: number;
  duration_s: number;
  force_N: Vec3;
  point_m?: Vec3;
  shape?: 'rect' | 'halfSine';
}

export interface SeriesPushFile {
  series: string;
  at_s?: number;
  point_m?: Vec3;
}

export type FrictionEstimateFile = 'truth' | { constant: number } | { scale: number };

export interface ScenarioFile {
  $schema?: string;
  format: typeof SCENARIO_FORMAT;
  formatVersion: 1;
  id: string;
  revision: number;
  title: string;
  description?: string;
  tags?: string[];
  robot: string | RobotFile;
  duration_s: number;
  seed?: number;
  physics?: { step_s?: number };
  control?: { rate_Hz?: number; loopBudget_us?: number };
  initial?: {
    position_m?: Vec3;
    rpy_deg?: Vec3;
    velocity_mps?: Vec3;
    angularVelocity_radps?: Vec3;
    feet?: 'standing' | Vec3[];
    start?: StartMode;
  };
  ground?: {
    incline_deg?: { pitch?: number; roll?: number };
    contact?: { stiffness_N_per_m?: number; exponent?: number; damping_s_per_m?: number };
    material?: MaterialFile;
    patches?: PatchFile[];
    raster?: RasterFile;
  };
  commands: CommandFile[];
  pushes?: (PulsePushFile | SeriesPushFile)[];
  sensing?: { frictionEstimate?: FrictionEstimateFile; forceNoise_N?: number };
  acceptance?: {
    mustNotFall?: boolean;
    minFrictionMargin?: number | null;
    maxSlipDistance_m?: number | null;
    maxCommandedViolations?: number | null;
    minProgress?: number | null;
  };
  recorded?: RecordedReference;
}

/** The recorded trajectory an imported scenario came from (harness/recorded/, docs/recorded.md). */
export interface RecordedReference {
  trajectory: string;
  sha256: string;
}
