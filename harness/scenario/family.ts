// `family:` expansion. A scenario with a family block stands for N scenarios whose friction level,
// push time/direction/magnitude, command speed and initial yaw are drawn from distributions, seeded
// by the scenario's seed — so the same file always gives the same N resolved scenarios and hashes.
//
//   family:
//     samples: 20
//     frictionScale: { uniform: [0.6, 1.0] }                 # × every material's μs and μk
//     pushAt_s: { uniform: [1.0, 2.0] }                      # start of the earliest push
//     pushDirection_deg: { uniform: [0, 360] }               # heading of the strongest push
//     pushMagnitude_N: { normal: { mean: 80, sd: 15, min: 20, max: 140 } }   # its peak force
//     commandSpeed_mps: { normal: { mean: 0.5, sd: 0.1, min: 0.1 } }        # fastest command
//     initialYaw_deg: { uniform: [-30, 30] }
//
// Pushes and commands move together: every push is shifted, turned and scaled by the same amount
// as the one the parameter names, every command's velocity by the same factor, so their relative
// timing and directions stay as written. Expansion runs on the resolved scenario (after defaults),
// so it works the same with or without a matrix block (each matrix case becomes a family).

import { SeededRandom } from '../plant/random.js';
import type { Push } from '../plant/types.js';
import type { Finding } from '../files/issue.js';
import type { FamilyMembership, ResolvedScenario } from './types.js';
import {
  cloneScenario,
  peakPushForce_N,
  pushPeak_N,
  pushStart_s,
  scaleFrictionMap,
  scalePushList,
  shiftPushes,
  turnPushes,
  unknownPushKind,
  withIdentity,
} from './variation.js';

export type Distribution = { uniform: [number, number] } | { normal: { mean: number; sd: number; min?: number; max?: number } };

/** The parameters a family may vary, in the fixed order their random streams are numbered. */
export const FAMILY_PARAMETERS = ['frictionScale', 'pushAt_s', 'pushDirection_deg', 'pushMagnitude_N', 'commandSpeed_mps', 'initialYaw_deg'] as const;
export type FamilyParameter = (typeof FAMILY_PARAMETERS)[number];

export type FamilyFile = { samples: number } & Partial<Record<FamilyParameter, Distribution>>;

export type FamilyOutcome = { ok: true; scenarios: ResolvedScenario[] } | { ok: false; errors: Finding[] };

/**
 * Seed of parameter k's random stream: the scenario seed mixed with the parameter's number
 * (golden-ratio increment, as in SplitMix). One stream per parameter means a sample's friction
 * does not change when a push parameter is added, and sample k does not depend on N.
 */
function streamSeed(seed: number, parameterIndex: number): number {
  return (seed + Math.imul(parameterIndex + 1, 0x9e3779b9)) >>> 0;
}

/** Seed of sample k's run (sensor noise): different per sample, fixed by the scenario seed. */
export function sampleSeed(seed: number, sample: number): number {
  return (Math.imul(seed ^ 0x5bd1e995, 0x01000193) + Math.imul(sample, 0x9e3779b9)) >>> 0;
}

function draw(d: Distribution, random: SeededRandom): number {
  if ('uniform' in d) return d.uniform[0] + (d.uniform[1] - d.uniform[0]) * random.uniform();
  const value = d.normal.mean + d.normal.sd * random.normal();
  // Clipped, not truncated: values beyond a bound sit on the bound (what `min`/`max` promise).
  return Math.min(d.normal.max ?? Infinity, Math.max(d.normal.min ?? -Infinity, value));
}

/** Checks that need the resolved scenario (the schema has checked the shapes). */
function checkApplicable(base: ResolvedScenario, family: FamilyFile): Finding[] {
  const errors: Finding[] = [];
  for (const name of FAMILY_PARAMETERS) {
    const d = family[name];
    if (d && 'uniform' in d && d.uniform[1] < d.uniform[0]) {
      errors.push({ path: `/family/${name}/uniform`, message: `uniform range [${d.uniform[0]}, ${d.uniform[1]}] runs backwards (expected [low, high] with low ≤ high)` });
    }
    if (d && 'normal' in d && d.normal.min !== undefined && d.normal.max !== undefined && d.normal.max < d.normal.min) {
      errors.push({ path: `/family/${name}/normal`, message: `min ${d.normal.min} is above max ${d.normal.max} (expected min ≤ max)` });
    }
  }
  const pushes = base.plant.pushes;
  for (const name of ['pushAt_s', 'pushDirection_deg', 'pushMagnitude_N'] as const) {
    if (family[name] && pushes.length === 0) errors.push({ path: `/family/${name}`, message: `the scenario has no pushes, so ${name} has nothing to vary (expected a pushes: list)` });
  }
  if (family.pushDirection_deg && pushes.length > 0 && horizontalPeak(strongest(pushes)) === 0) {
    errors.push({ path: '/family/pushDirection_deg', message: 'the strongest push has no horizontal force, so it has no direction to vary' });
  }
  if (family.pushMagnitude_N && pushes.length > 0 && peakPushForce_N(base) === 0) {
    errors.push({ path: '/family/pushMagnitude_N', message: 'every push has zero force, so there is no magnitude to scale' });
  }
  if (family.commandSpeed_mps && fastestCommandSpeed(base) === 0) {
    errors.push({ path: '/family/commandSpeed_mps', message: 'no command asks for travel, so there is no speed to vary (expected a command with a velocity_mps)' });
  }
  for (const name of ['frictionScale', 'pushMagnitude_N', 'commandSpeed_mps'] as const) {
    const d = family[name];
    const low = d === undefined ? 0 : 'uniform' in d ? d.uniform[0] : d.normal.min;
    if (d && (low === undefined || low < 0)) {
      errors.push({ path: `/family/${name}`, message: `${name} could be drawn below 0 (expected a uniform range from 0 up, or a normal with min ≥ 0)` });
    }
  }
  return errors;
}

function strongest(pushes: Push[]): Push {
  let best = pushes[0];
  for (const p of pushes) if (pushPeak_N(p) > pushPeak_N(best)) best = p;
  return best;
}

/** Horizontal force of a push at its peak sample, N, and its heading. */
function horizontalAtPeak(p: Push): [number, number] {
  switch (p.kind) {
    case 'pulse':
      return [p.force_N[0], p.force_N[1]];
    case 'series': {
      let best = p.force_N[0];
      for (const f of p.force_N) if (Math.hypot(f[0], f[1], f[2]) > Math.hypot(best[0], best[1], best[2])) best = f;
      return [best[0], best[1]];
    }
    default:
      return unknownPushKind(p);
  }
}

function horizontalPeak(p: Push): number {
  const [x, y] = horizontalAtPeak(p);
  return Math.hypot(x, y);
}

function fastestCommandSpeed(s: ResolvedScenario): number {
  let fastest = 0;
  for (const c of s.commands) fastest = Math.max(fastest, Math.hypot(c.velocity_mps[0], c.velocity_mps[1]));
  return fastest;
}

function apply(base: ResolvedScenario, params: Partial<Record<FamilyParameter, number>>): ResolvedScenario {
  const s = cloneScenario(base);
  if (params.frictionScale !== undefined) s.plant.ground.friction = scaleFrictionMap(base.plant.ground.friction, params.frictionScale);
  let pushes = s.plant.pushes;
  if (params.pushAt_s !== undefined) {
    const earliest = Math.min(...pushes.map(pushStart_s));
    pushes = shiftPushes(pushes, params.pushAt_s - earliest);
  }
  if (params.pushDirection_deg !== undefined) {
    const [x, y] = horizontalAtPeak(strongest(pushes));
    pushes = turnPushes(pushes, (params.pushDirection_deg * Math.PI) / 180 - Math.atan2(y, x));
  }
  if (params.pushMagnitude_N !== undefined) {
    pushes = scalePushList(pushes, params.pushMagnitude_N / pushPeak_N(strongest(pushes)));
  }
  s.plant.pushes = pushes;
  if (params.commandSpeed_mps !== undefined) {
    const factor = params.commandSpeed_mps / fastestCommandSpeed(base);
    s.commands = s.commands.map((c) => ({ ...c, velocity_mps: [c.velocity_mps[0] * factor, c.velocity_mps[1] * factor, c.velocity_mps[2] * factor] }));
  }
  if (params.initialYaw_deg !== undefined) {
    const rpy = s.plant.initial.rpy_deg;
    const turn_rad = ((params.initialYaw_deg - rpy[2]) * Math.PI) / 180;
    s.plant.initial.rpy_deg = [rpy[0], rpy[1], params.initialYaw_deg];
    // Explicit foot positions turn with the trunk about its starting point; `standing` feet are
    // placed under the (turned) hips by the plant.
    const feet = s.plant.initial.feet;
    if (feet !== 'standing') {
      const [px, py] = s.plant.initial.position_m;
      const c = Math.cos(turn_rad);
      const n = Math.sin(turn_rad);
      s.plant.initial.feet = feet.map((f) => [px + c * (f[0] - px) - n * (f[1] - py), py + n * (f[0] - px) + c * (f[1] - py), f[2]]);
    }
  }
  return s;
}

/** The N samples of a family, in sample order. Never throws on a schema-valid family block. */
export function expandFamily(base: ResolvedScenario, family: FamilyFile): FamilyOutcome {
  const errors = checkApplicable(base, family);
  if (errors.length) return { ok: false, errors };
  const present = FAMILY_PARAMETERS.filter((name) => family[name] !== undefined);
  const streams = new Map(present.map((name) => [name, new SeededRandom(streamSeed(base.seed, FAMILY_PARAMETERS.indexOf(name)))]));
  const width = String(family.samples).length;
  const scenarios: ResolvedScenario[] = [];
  for (let k = 1; k <= family.samples; k++) {
    const params: Partial<Record<FamilyParameter, number>> = {};
    for (const name of present) params[name] = draw(family[name]!, streams.get(name)!);
    const varied = apply(base, params);
    varied.seed = sampleSeed(base.seed, k);
    const membership: FamilyMembership = { id: base.id, sample: k, samples: family.samples, params: params as Record<string, number> };
    varied.family = membership;
    scenarios.push(withIdentity(varied, `${base.id}-s${String(k).padStart(width, '0')}`, `${base.title} (family sample ${k} of ${family.samples})`));
  }
  return { ok: true, scenarios };
}
