// Variations of a resolved scenario: the same scenario with every material's friction scaled, every
// push's force scaled, a push turned or moved in time, a different command speed or initial yaw.
// Each returns a new ResolvedScenario (the input is never changed) whose hash is recomputed from its
// content, so a variation is never mistaken for its source. The margin search (harness/margin) and
// scenario families (family.ts) both build on these.

import type { FrictionMap, Material, Push, Vec3 } from '../plant/types.js';
import { scenarioHash } from './canonical.js';
import { idFragment } from './matrix.js';
import type { ResolvedScenario } from './types.js';

/** A deep copy that shares nothing with the source (resolved scenarios are plain JSON data). */
export function cloneScenario(scenario: ResolvedScenario): ResolvedScenario {
  return structuredClone(scenario);
}

/** Re-identifies edited content: new id and title, hash recomputed from the content. */
export function withIdentity(content: ResolvedScenario, id: string, title: string): ResolvedScenario {
  const next: ResolvedScenario = { ...content, id, title, hash: '' };
  next.hash = scenarioHash(next);
  return next;
}

/** A factor spelt for an id: 0.5359 → x0p5359 (at most 4 decimals; ids are labels, the factor is exact in results). */
export function factorLabel(factor: number): string {
  return `x${idFragment(Number(factor.toFixed(4)))}`;
}

function scaleMaterial(m: Material, factor: number): Material {
  return { ...m, staticFriction: m.staticFriction * factor, kineticFriction: m.kineticFriction * factor };
}

/** Every material's μs and μk times `factor`: the default, every patch and every raster cell. */
export function scaleFrictionMap(map: FrictionMap, factor: number): FrictionMap {
  const scaled: FrictionMap = {
    default: scaleMaterial(map.default, factor),
    patches: map.patches.map((p) => ({ ...p, material: scaleMaterial(p.material, factor) })),
  };
  if (map.raster) {
    scaled.raster = {
      ...map.raster,
      staticFriction: map.raster.staticFriction.map((row) => row.map((mu) => mu * factor)),
      kineticFriction: map.raster.kineticFriction.map((row) => row.map((mu) => mu * factor)),
    };
  }
  return scaled;
}

/**
 * The scenario on a floor `factor` times as grippy everywhere (Stribeck speeds and viscous terms
 * unchanged). What controllers are told follows the truth for `truth` and `scale` sensing and
 * stays put for `constant` sensing — a build told a fixed μ keeps trusting it as the floor gets
 * slipperier, which is exactly the margin being measured.
 */
export function scaleFriction(scenario: ResolvedScenario, factor: number): ResolvedScenario {
  checkFactor('friction', factor);
  const content = cloneScenario(scenario);
  content.plant.ground.friction = scaleFrictionMap(scenario.plant.ground.friction, factor);
  return withIdentity(content, `${scenario.id}-friction-${factorLabel(factor)}`, `${scenario.title} (friction × ${round(factor)})`);
}

/**
 * Every helper on pushes switches over the kinds with this in the default branch, so a new kind
 * of push does not compile until each helper says what to do with it.
 */
export function unknownPushKind(p: never): never {
  throw new Error(`unknown push kind ${JSON.stringify((p as { kind?: unknown }).kind)}`);
}

function scalePush(p: Push, factor: number): Push {
  switch (p.kind) {
    case 'pulse':
      return { ...p, force_N: scaleVec(p.force_N, factor) };
    case 'series':
      return { ...p, force_N: p.force_N.map((f) => scaleVec(f, factor)) };
    default:
      return unknownPushKind(p);
  }
}

/** The scenario with every push's force times `factor` (timing and point of application unchanged). */
export function scalePushes(scenario: ResolvedScenario, factor: number): ResolvedScenario {
  checkFactor('push', factor);
  const content = cloneScenario(scenario);
  content.plant.pushes = scenario.plant.pushes.map((p) => scalePush(p, factor));
  return withIdentity(content, `${scenario.id}-push-${factorLabel(factor)}`, `${scenario.title} (push × ${round(factor)})`);
}

/** Lowest static friction of any material on the map (default, patches, raster cells). */
export function lowestStaticFriction(map: FrictionMap): number {
  let lowest = map.default.staticFriction;
  for (const p of map.patches) lowest = Math.min(lowest, p.material.staticFriction);
  if (map.raster) for (const row of map.raster.staticFriction) for (const mu of row) lowest = Math.min(lowest, mu);
  return lowest;
}

/** Peak force magnitude of one push, N. */
export function pushPeak_N(p: Push): number {
  switch (p.kind) {
    case 'pulse':
      return norm(p.force_N);
    case 'series': {
      let peak = 0;
      for (const f of p.force_N) peak = Math.max(peak, norm(f));
      return peak;
    }
    default:
      return unknownPushKind(p);
  }
}

/** Largest peak force magnitude over the scenario's pushes, N (0 with no pushes). */
export function peakPushForce_N(scenario: ResolvedScenario): number {
  let peak = 0;
  for (const p of scenario.plant.pushes) peak = Math.max(peak, pushPeak_N(p));
  return peak;
}

/** Start time of a push, s. */
export function pushStart_s(p: Push): number {
  switch (p.kind) {
    case 'pulse':
      return p.at_s;
    case 'series':
      return p.t_s[0];
    default:
      return unknownPushKind(p);
  }
}

/** Every push moved in time by `shift_s` (a series keeps its shape). */
export function shiftPushes(pushes: Push[], shift_s: number): Push[] {
  return pushes.map((p): Push => {
    switch (p.kind) {
      case 'pulse':
        return { ...p, at_s: p.at_s + shift_s };
      case 'series':
        return { ...p, t_s: p.t_s.map((t) => t + shift_s) };
      default:
        return unknownPushKind(p);
    }
  });
}

/** Every push's force turned about the vertical by `angle_rad` (x toward y). */
export function turnPushes(pushes: Push[], angle_rad: number): Push[] {
  const c = Math.cos(angle_rad);
  const s = Math.sin(angle_rad);
  const turn = (f: Vec3): Vec3 => [c * f[0] - s * f[1], s * f[0] + c * f[1], f[2]];
  return pushes.map((p): Push => {
    switch (p.kind) {
      case 'pulse':
        return { ...p, force_N: turn(p.force_N) };
      case 'series':
        return { ...p, force_N: p.force_N.map(turn) };
      default:
        return unknownPushKind(p);
    }
  });
}

/** Every push's force times `factor`. */
export function scalePushList(pushes: Push[], factor: number): Push[] {
  return pushes.map((p) => scalePush(p, factor));
}

function checkFactor(what: string, factor: number): void {
  if (!Number.isFinite(factor) || factor < 0) throw new RangeError(`${what} scale ${factor} is not a finite factor ≥ 0`);
}

function scaleVec(v: Vec3, factor: number): Vec3 {
  return [v[0] * factor, v[1] * factor, v[2] * factor];
}

function norm(v: Vec3): number {
  return Math.hypot(v[0], v[1], v[2]);
}

function round(x: number): string {
  return String(Number(x.toFixed(4)));
}
