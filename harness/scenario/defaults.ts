// Scenario defaults: the one place optional fields of a scenario file get their values. Plant
// numbers (step, contact law, control rate) come from harness/plant/defaults.ts.

import { DEFAULT_CONTROL_RATE_Hz, DEFAULT_PHYSICS_STEP_s } from '../plant/defaults.js';
import { resolveContactLaw } from './contact.js';
import type { Material, RobotParams, StartMode, Vec3 } from '../plant/types.js';
import type { MaterialFile, RobotFile, ScenarioFile } from './format.js';
import type { Acceptance, CommandStep, FrictionSensing, ResolvedScenario } from './types.js';
import type { Push, Raster, Patch } from '../plant/types.js';

/**
 * The default material when a scenario names none: a dry floor. Rubber-like feet on dry concrete
 * have μs ≈ 0.8–1.0 and μk ≈ 0.6–0.8 (common practice; handbook ranges recalled from memory). The
 * Stribeck velocity 0.02 m/s and exponent 2 (Gaussian decay, Armstrong-Hélouvry et al. 1994) are
 * typical identified values for dry contacts (from memory); no viscous term for a dry contact.
 */
export const DEFAULT_MATERIAL: Readonly<Material> = Object.freeze({
  name: 'dry floor',
  staticFriction: 0.9,
  kineticFriction: 0.7,
  stribeckVelocity_mps: 0.02,
  stribeckExponent: 2,
  viscous_Ns_per_m: 0,
});

export const DEFAULT_SEED = 0;
export const DEFAULT_FORCE_NOISE_N = 0;
export const DEFAULT_PUSH_SHAPE = 'rect' as const;
export const ZERO_VEC3: Readonly<Vec3> = Object.freeze([0, 0, 0]) as Readonly<Vec3>;

export function defaultPhysicsStep_s(): number {
  return DEFAULT_PHYSICS_STEP_s;
}

export function defaultControlRate_Hz(): number {
  return DEFAULT_CONTROL_RATE_Hz;
}

/** A controller tick may use one whole control period unless the scenario says otherwise. */
export function defaultLoopBudget_us(rate_Hz: number): number {
  return 1e6 / rate_Hz;
}

/** Fills a partial material from a base; a patch without a name is named after the patch. */
export function resolveMaterial(partial: MaterialFile | undefined, base: Readonly<Material>, fallbackName?: string): Material {
  const p = partial ?? {};
  return {
    name: p.name ?? fallbackName ?? base.name,
    staticFriction: p.staticFriction ?? base.staticFriction,
    kineticFriction: p.kineticFriction ?? base.kineticFriction,
    stribeckVelocity_mps: p.stribeckVelocity_mps ?? base.stribeckVelocity_mps,
    stribeckExponent: p.stribeckExponent ?? base.stribeckExponent,
    viscous_Ns_per_m: p.viscous_Ns_per_m ?? base.viscous_Ns_per_m,
  };
}

export function resolveRobot(file: RobotFile): RobotParams {
  const v3 = (v: Vec3): Vec3 => [v[0], v[1], v[2]];
  return {
    id: file.id,
    name: file.name,
    trunk: {
      mass_kg: file.trunk.mass_kg,
      inertia_kgm2: [v3(file.trunk.inertia_kgm2[0]), v3(file.trunk.inertia_kgm2[1]), v3(file.trunk.inertia_kgm2[2])],
      halfExtents_m: v3(file.trunk.halfExtents_m),
    },
    hips_m: file.hips_m.map(v3),
    ...(file.legNames ? { legNames: [...file.legNames] } : {}),
    foot: {
      mass_kg: file.foot.mass_kg,
      ...(file.foot.radius_m !== undefined ? { radius_m: file.foot.radius_m } : {}),
      ...(file.foot.material ? { material: { ...file.foot.material } } : {}),
    },
    leg: { ...file.leg },
    standingHeight_m: file.standingHeight_m,
    gait: { ...file.gait },
  };
}

export function resolveCommand(c: ScenarioFile['commands'][number]): CommandStep {
  return {
    at_s: c.at_s,
    gait: c.gait,
    velocity_mps: c.velocity_mps ? [c.velocity_mps[0], c.velocity_mps[1], c.velocity_mps[2]] : [0, 0, 0],
    yawRate_radps: c.yawRate_radps ?? 0,
  };
}

export function resolveFrictionSensing(f: NonNullable<ScenarioFile['sensing']>['frictionEstimate']): FrictionSensing {
  if (f === undefined || f === 'truth') return { kind: 'truth' };
  if ('constant' in f) return { kind: 'constant', value: f.constant };
  return { kind: 'scale', factor: f.scale };
}

export function resolveAcceptance(a: ScenarioFile['acceptance']): Acceptance {
  return {
    mustNotFall: a?.mustNotFall ?? true,
    minFrictionMargin: a?.minFrictionMargin ?? null,
    maxSlipDistance_m: a?.maxSlipDistance_m ?? null,
    maxCommandedViolations: a?.maxCommandedViolations ?? null,
    minProgress: a?.minProgress ?? null,
  };
}

/** Settled when the feet stand and nothing moves at t = 0; released otherwise (docs/scenarios.md). */
export function defaultStartMode(init: NonNullable<ScenarioFile['initial']>): StartMode {
  const standing = init.feet === undefined || init.feet === 'standing';
  const atRest = [...(init.velocity_mps ?? ZERO_VEC3), ...(init.angularVelocity_radps ?? ZERO_VEC3)].every((x) => x === 0);
  return standing && atRest ? 'settled' : 'released';
}

/** Data read from files the scenario references, already parsed and checked. */
export interface InlinedReferences {
  robot: RobotParams;
  /** Series pushes by push index: sample times already shifted by the push's at_s. */
  series: Map<number, { t_s: number[]; force_N: Vec3[] }>;
  /** Raster grids when the raster came from a file. */
  rasterGrids?: { staticFriction: number[][]; kineticFriction: number[][] };
}

/** A validated version-1 file plus its inlined references → the resolved scenario (no hash, no file). */
export function fillScenarioDefaults(s: ScenarioFile, refs: InlinedReferences): Omit<ResolvedScenario, 'hash' | 'file'> {
  const robot = refs.robot;
  const rate_Hz = s.control?.rate_Hz ?? defaultControlRate_Hz();
  const defaultMaterial = resolveMaterial(s.ground?.material, DEFAULT_MATERIAL);
  const patches: Patch[] = (s.ground?.patches ?? []).map((p, i) => {
    const name = p.name ?? `patch-${i}`;
    const shape: Patch['shape'] = p.rect
      ? { kind: 'rect', min_m: [p.rect.min_m[0], p.rect.min_m[1]], max_m: [p.rect.max_m[0], p.rect.max_m[1]] }
      : p.circle
        ? { kind: 'circle', center_m: [p.circle.center_m[0], p.circle.center_m[1]], radius_m: p.circle.radius_m }
        : { kind: 'polygon', vertices_m: p.polygon_m!.map((v) => [v[0], v[1]] as [number, number]) };
    return { name, shape, material: resolveMaterial(p.material, defaultMaterial, name) };
  });
  const rasterFile = s.ground?.raster;
  let raster: Raster | undefined;
  if (rasterFile) {
    const grids = refs.rasterGrids ?? { staticFriction: rasterFile.staticFriction!, kineticFriction: rasterFile.kineticFriction! };
    raster = {
      origin_m: [rasterFile.origin_m[0], rasterFile.origin_m[1]],
      cell_m: rasterFile.cell_m,
      staticFriction: grids.staticFriction.map((row) => row.slice()),
      kineticFriction: grids.kineticFriction.map((row) => row.slice()),
    };
  }
  const pushes: Push[] = (s.pushes ?? []).map((p, i) => {
    const point_m: Vec3 = p.point_m ? [p.point_m[0], p.point_m[1], p.point_m[2]] : [0, 0, 0];
    if ('series' in p) {
      const series = refs.series.get(i)!;
      return { kind: 'series', t_s: series.t_s.slice(), force_N: series.force_N.map((f) => [f[0], f[1], f[2]] as Vec3), point_m };
    }
    return {
      kind: 'pulse',
      shape: p.shape ?? DEFAULT_PUSH_SHAPE,
      at_s: p.at_s,
      duration_s: p.duration_s,
      force_N: [p.force_N[0], p.force_N[1], p.force_N[2]],
      point_m,
    };
  });
  const init = s.initial ?? {};
  const v3 = (v: Vec3 | undefined, d: Readonly<Vec3>): Vec3 => (v ? [v[0], v[1], v[2]] : [d[0], d[1], d[2]]);
  return {
    id: s.id,
    revision: s.revision,
    title: s.title,
    duration_s: s.duration_s,
    seed: s.seed ?? DEFAULT_SEED,
    plant: {
      robot,
      ground: {
        incline_deg: { pitch: s.ground?.incline_deg?.pitch ?? 0, roll: s.ground?.incline_deg?.roll ?? 0 },
        contact: resolveContactLaw(robot, s.ground?.contact, s.ground?.material?.elastic),
        friction: raster ? { default: defaultMaterial, patches, raster } : { default: defaultMaterial, patches },
      },
      pushes,
      physics: { step_s: s.physics?.step_s ?? defaultPhysicsStep_s() },
      initial: {
        position_m: v3(init.position_m, [0, 0, robot.standingHeight_m]),
        rpy_deg: v3(init.rpy_deg, ZERO_VEC3),
        velocity_mps: v3(init.velocity_mps, ZERO_VEC3),
        angularVelocity_radps: v3(init.angularVelocity_radps, ZERO_VEC3),
        feet: init.feet === undefined || init.feet === 'standing' ? 'standing' : init.feet.map((f) => [f[0], f[1], f[2]] as Vec3),
        start: init.start ?? defaultStartMode(init),
      },
    },
    control: { rate_Hz, loopBudget_us: s.control?.loopBudget_us ?? defaultLoopBudget_us(rate_Hz) },
    commands: s.commands.map(resolveCommand),
    sensing: {
      frictionEstimate: resolveFrictionSensing(s.sensing?.frictionEstimate),
      forceNoise_N: s.sensing?.forceNoise_N ?? DEFAULT_FORCE_NOISE_N,
    },
    acceptance: resolveAcceptance(s.acceptance),
    tags: [...(s.tags ?? [])],
    ...(s.recorded ? { recorded: { trajectory: s.recorded.trajectory, sha256: s.recorded.sha256 } } : {}),
  };
}
