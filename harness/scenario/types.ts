// The resolved scenario: what the loader hands to the runner after validation, migration,
// defaults and inlining of referenced files. Everything the plant needs is a PlantConfig.

import type { GaitName } from '../contract/tick.js';
import type { PlantConfig, Vec3 } from '../plant/types.js';

export interface CommandStep {
  at_s: number;
  gait: GaitName;
  velocity_mps: Vec3;
  yawRate_radps: number;
}

export type FrictionSensing =
  | { kind: 'truth' }
  | { kind: 'constant'; value: number }
  | { kind: 'scale'; factor: number };

export interface Sensing {
  frictionEstimate: FrictionSensing;
  /** Standard deviation of Gaussian noise on each measured foot-force component. */
  forceNoise_N: number;
}

export interface Acceptance {
  mustNotFall: boolean;
  minFrictionMargin: number | null;
  maxSlipDistance_m: number | null;
  maxCommandedViolations: number | null;
  /** Fraction of the commanded travel achieved (null: not checked). */
  minProgress: number | null;
}

export interface ControlParams {
  rate_Hz: number;
  loopBudget_us: number;
}

/**
 * Where a scenario came from when it is one sample of a seeded family (`family:` in the file,
 * harness/scenario/family.ts). Part of the content, so it enters the hash.
 */
export interface FamilyMembership {
  /** The family's id: the id written in the file (after matrix substitution). */
  id: string;
  /** 1-based sample number. */
  sample: number;
  /** Number of samples in the family. */
  samples: number;
  /** The drawn parameter values, by parameter name (docs/margin.md). */
  params: Record<string, number>;
}

export interface ResolvedScenario {
  id: string;
  revision: number;
  title: string;
  /** Path of the source file, relative to the suite root (for messages and results). */
  file: string;
  /** sha256 of the canonical JSON of this object without `hash` and `file`. */
  hash: string;
  duration_s: number;
  seed: number;
  plant: PlantConfig;
  control: ControlParams;
  commands: CommandStep[];
  sensing: Sensing;
  acceptance: Acceptance;
  tags: string[];
  /** Present only on the samples of a seeded family. */
  family?: FamilyMembership;
  /** Present only on scenarios imported from a log: the recorded trajectory, as written in the file. */
  recorded?: { trajectory: string; sha256: string };
}
